import { compose, type Block, type MailBody } from '~~/server/mail/templates'
import type { Language } from '#shared/wording/chance'
import { BRIEFING_TEXT } from '#shared/briefing/text'

// The decision alert e-mail, English and Spanish: which decision, by how much, and which releases.

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

const WORDS = {
  en: {
    subject: (site: string) => `New science moves a recorded decision at ${site}`,
    intro: (site: string) => `Newly published science changed the outlook behind decisions recorded for ${site}. Review them and record a review on the site's pathways page; the page flags them until you do.`,
    heading: 'Decisions to review',
    columns: ['Decision', 'Scenario, tolerance', 'Tipping year: recorded → now', 'Decide by: recorded → now', 'Why'],
    late: (lead: number, year: number) => `the measure in service now tips within the ${lead}-year lead time of the next one (deciding after ${year} is already late)`,
    moved: (margin: number) => `the tipping year moved by more than your margin of ${margin} years`,
    beyond: (h: number) => `after ${h}`,
    releases: 'Which releases changed',
    releaseColumns: ['Source', 'Before', 'Now', 'Citation'],
    caution: 'Tipping years are projections from the outlook, not predictions; they depend on the scenario and tolerance chosen. Follow local codes and standards and the advice of licensed coastal engineers.',
    link: 'Open the pathways page',
  },
  es: {
    subject: (site: string) => `Nueva ciencia modifica una decisión registrada en ${site}`,
    intro: (site: string) => `La ciencia publicada recientemente cambió la perspectiva en la que se basan decisiones registradas para ${site}. Revíselas y registre una revisión en la página de trayectorias del sitio; la página las señala hasta que lo haga.`,
    heading: 'Decisiones a revisar',
    columns: ['Decisión', 'Escenario, tolerancia', 'Año de inflexión: registrado → ahora', 'Decidir antes de: registrado → ahora', 'Motivo'],
    late: (lead: number, year: number) => `la medida en servicio llega ahora a su punto de inflexión dentro de los ${lead} años de plazo de la siguiente (decidir después de ${year} ya es tarde)`,
    moved: (margin: number) => `el año de inflexión se desplazó más que su margen de ${margin} años`,
    beyond: (h: number) => `después de ${h}`,
    releases: 'Qué versiones cambiaron',
    releaseColumns: ['Fuente', 'Antes', 'Ahora', 'Cita'],
    caution: 'Los años de inflexión son proyecciones de la perspectiva, no predicciones; dependen del escenario y la tolerancia elegidos. Siga las normas y códigos locales y el consejo de ingenieros costeros colegiados.',
    link: 'Abrir la página de trayectorias',
  },
} as const

export function decisionAlertMail(m: { language: Language, site: string, url: string, currentYear: number, decisions: AlertedDecision[] }): MailBody {
  const w = WORDS[m.language]
  const year = (value: number | null, horizon: number) => value === null ? w.beyond(horizon) : String(value)
  const components = BRIEFING_TEXT[m.language].components
  const releases = new Map<string, AlertedDecision['releases'][number] & { scenario: string }>()
  for (const d of m.decisions) for (const r of d.releases) releases.set(`${d.scenario}|${r.component}`, { ...r, scenario: d.scenario })
  const blocks: Block[] = [
    { paragraphs: [w.intro(m.site)] },
    {
      heading: w.heading,
      rows: [[...w.columns], ...m.decisions.map(d => [
        `${d.measure} (← ${d.inService})`,
        `${d.scenario}, ${Math.round(d.tolerance * 100)} %`,
        `${year(d.before.tippingYear, d.horizon)} → ${year(d.after.tippingYear, d.horizon)}`,
        `${year(d.before.decisionYear, d.horizon)} → ${year(d.after.decisionYear, d.horizon)}`,
        d.kinds.map(k => k === 'late' ? w.late(d.leadTimeYears, d.after.decisionYear ?? m.currentYear) : w.moved(d.marginYears)).join('; '),
      ])],
    },
  ]
  if (releases.size) {
    blocks.push({ heading: w.releases, rows: [[...w.releaseColumns], ...[...releases.values()].map(r => [`${components[r.component] ?? r.component} (${r.scenario})`, r.from === null ? '—' : `v${r.from}`, `v${r.to}`, r.citation])] })
  }
  blocks.push({ paragraphs: [w.caution] }, { link: { label: w.link, url: m.url } })
  return compose(m.language, w.subject(m.site), blocks)
}
