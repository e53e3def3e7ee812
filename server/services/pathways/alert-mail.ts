import { compose, type Block, type MailBody } from '~~/server/mail/templates'
import { translator, type Language } from '#shared/wording/translate'

// The decision alert e-mail in the reader's language (emails.decisionAlert): what made the outlooks be
// computed again, which decision, by how much, and which releases.

export interface AlertedDecision {
  measure: string
  inService: string
  scenario: string
  tolerance: number
  leadTimeYears: number
  before: { tippingYear: number | null, decisionYear: number | null }
  after: { tippingYear: number | null, decisionYear: number | null }
  horizon: number
  kinds: Array<'late' | 'moved'>
  marginYears: number
  releases: Array<{ component: string, from: number | null, to: number, citation: string }>
}

export function decisionAlertMail(m: {
  language: Language
  /** What made the outlooks be computed again, as a sentence (shared/wording/causes.ts). */
  cause: string
  site: string
  url: string
  currentYear: number
  decisions: AlertedDecision[]
}): MailBody {
  const t = translator(m.language)
  const year = (value: number | null, horizon: number) =>
    value === null ? t('emails.decisionAlert.beyond', { horizon }) : String(value)
  const releases = new Map<string, AlertedDecision['releases'][number] & { scenario: string }>()
  for (const d of m.decisions)
    for (const r of d.releases) releases.set(`${d.scenario}|${r.component}`, { ...r, scenario: d.scenario })
  const blocks: Block[] = [
    { paragraphs: [t('emails.decisionAlert.intro', { site: m.site, cause: m.cause })] },
    {
      heading: t('emails.decisionAlert.heading'),
      rows: [
        t.list('emails.decisionAlert.columns'),
        ...m.decisions.map(d => [
          `${d.measure} (← ${d.inService})`,
          `${d.scenario}, ${Math.round(d.tolerance * 100)} %`,
          `${year(d.before.tippingYear, d.horizon)} → ${year(d.after.tippingYear, d.horizon)}`,
          `${year(d.before.decisionYear, d.horizon)} → ${year(d.after.decisionYear, d.horizon)}`,
          d.kinds
            .map(k =>
              k === 'late'
                ? t('emails.decisionAlert.late', { lead: d.leadTimeYears, year: d.after.decisionYear ?? m.currentYear })
                : t('emails.decisionAlert.moved', { margin: d.marginYears }),
            )
            .join('; '),
        ]),
      ],
    },
  ]
  if (releases.size) {
    blocks.push({
      heading: t('emails.whatChanged.releases'),
      rows: [
        t.list('emails.whatChanged.releaseColumns'),
        ...[...releases.values()].map(r => [
          `${t(`document.components.${r.component}`)} (${r.scenario})`,
          r.from === null ? '—' : `v${r.from}`,
          `v${r.to}`,
          r.citation,
        ]),
      ],
    })
  }
  blocks.push(
    { paragraphs: [t('emails.decisionAlert.caution')] },
    { link: { label: t('emails.decisionAlert.link'), url: m.url } },
  )
  return compose(m.language, t('emails.decisionAlert.subject', { site: m.site }), blocks)
}
