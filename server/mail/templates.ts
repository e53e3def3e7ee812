import { translator, type Language } from '#shared/wording/translate'

// Every e-mail in plain text and HTML, in the reader's language, readable without images. The words
// are in locales/<language>/emails.json (emails.*); values are escaped for HTML here, once.

export interface MailBody { subject: string, text: string, html: string }

export function escapeHtml(value: string) {
  return value
    .replace(/&/g, '&amp;')
    .replace(/</g, '&lt;')
    .replace(/>/g, '&gt;')
    .replace(/"/g, '&quot;')
    .replace(/'/g, '&#39;')
}

export interface Block {
  heading?: string
  paragraphs?: string[]
  rows?: string[][]
  link?: { label: string, url: string }
}

/** Lays blocks out twice: as plain text and as simple, image-free HTML. */
export function compose(language: Language, subject: string, blocks: Block[], unsubscribe?: string): MailBody {
  const t = translator(language)
  const footer = t('emails.footer')
  const text = [
    ...blocks.flatMap(block => [
      ...(block.heading ? [block.heading, '-'.repeat(block.heading.length)] : []),
      ...(block.paragraphs ?? []),
      ...(block.rows ?? []).map(row => row.join('  |  ')),
      ...(block.link ? [`${block.link.label}: ${block.link.url}`] : []),
      '',
    ]),
    unsubscribe ? `${footer} ${t('emails.stop')}: ${unsubscribe}` : footer,
  ].join('\n')
  const html
    = `<!doctype html><html lang="${language}"><body style="font-family:'Atkinson Hyperlegible',Verdana,sans-serif;color:#0b1a23;line-height:1.5;max-width:640px">`
      + blocks
        .map(block =>
          [
            block.heading ? `<h2 style="color:#1c5a6d;font-size:18px">${escapeHtml(block.heading)}</h2>` : '',
            ...(block.paragraphs ?? []).map(p => `<p>${escapeHtml(p)}</p>`),
            block.rows?.length
              ? `<table style="border-collapse:collapse">${block.rows.map((row, i) => `<tr>${row.map(cell => `<${i === 0 ? 'th' : 'td'} style="border:1px solid #e4dcc7;padding:4px 8px;text-align:left">${escapeHtml(cell)}</${i === 0 ? 'th' : 'td'}>`).join('')}</tr>`).join('')}</table>`
              : '',
            block.link
              ? `<p><a href="${escapeHtml(block.link.url)}" style="color:#1c5a6d;font-weight:bold">${escapeHtml(block.link.label)}</a></p>`
              : '',
          ].join(''),
        )
        .join('')
        + `<hr style="border:0;border-top:1px solid #e4dcc7"><p style="font-size:12px;color:#5d5036">${escapeHtml(footer)}${unsubscribe ? ` <a href="${escapeHtml(unsubscribe)}">${escapeHtml(t('emails.stop'))}</a>` : ''}</p></body></html>`
  return { subject, text, html }
}

export function watchConfirmMail(
  language: Language,
  site: string,
  confirmUrl: string,
  unsubscribeUrl: string,
): MailBody {
  const t = translator(language)
  return compose(
    language,
    t('emails.watchConfirm.subject', { site }),
    [
      {
        paragraphs: t.list('emails.watchConfirm.paragraphs', { site }),
        link: { label: t('emails.watchConfirm.link'), url: confirmUrl },
      },
    ],
    unsubscribeUrl,
  )
}

export interface ChangeRow { threshold: string, year: number, before: string, after: string }
export interface RangeRow { scenario: string, year: number, before: string, after: string }
export interface ReleaseChange { component: string, from: string, to: string, citation: string }
/** An outlook's last output year before and after: a release's last anchor year bounds it. */
export interface HorizonChange { scenario: string, before: number, after: number }

export interface WhatChanged {
  language: Language
  site: string
  cause: string
  chances: ChangeRow[]
  ranges: RangeRow[]
  /** The rise updated by the gauge record, where either outlook was weighted by one. */
  updatedRanges?: RangeRow[]
  releases: ReleaseChange[]
  horizons?: HorizonChange[]
  /**
   * The sentence on the site's headline under its planning scenario, named, before and after (absent for a watch from a
   * shared briefing).
   */
  planning?: string
  briefingUrl: string | null
  unsubscribeUrl: string
}

export function whatChangedMail(m: WhatChanged): MailBody {
  const t = translator(m.language)
  const horizons = (m.horizons ?? []).map(h =>
    t(h.after < h.before ? 'emails.whatChanged.horizonShortened' : 'emails.whatChanged.horizonExtended', { ...h }),
  )
  const blocks: Block[] = [
    { paragraphs: [m.cause, ...(m.planning ? [m.planning] : []), ...horizons, t('emails.whatChanged.numbers')] },
    {
      heading: t('emails.whatChanged.chances'),
      rows: [
        t.list('emails.whatChanged.chanceColumns'),
        ...m.chances.map(r => [r.threshold, String(r.year), r.before, r.after]),
      ],
    },
    {
      heading: t('emails.whatChanged.ranges'),
      rows: [
        t.list('emails.whatChanged.rangeColumns'),
        ...m.ranges.map(r => [r.scenario, String(r.year), r.before, r.after]),
      ],
    },
  ]
  if (m.updatedRanges?.length) {
    blocks.push({
      heading: t('emails.whatChanged.updatedRanges'),
      rows: [
        t.list('emails.whatChanged.rangeColumns'),
        ...m.updatedRanges.map(r => [r.scenario, String(r.year), r.before, r.after]),
      ],
    })
  }
  if (m.releases.length) {
    blocks.push({
      heading: t('emails.whatChanged.releases'),
      rows: [
        t.list('emails.whatChanged.releaseColumns'),
        ...m.releases.map(r => [r.component, r.from, r.to, r.citation]),
      ],
    })
  }
  if (m.briefingUrl) {
    blocks.push({
      paragraphs: [t('emails.whatChanged.latestBriefing')],
      link: { label: t('emails.whatChanged.latestBriefingLink'), url: m.briefingUrl },
    })
  }
  return compose(m.language, t('emails.whatChanged.subject', { site: m.site }), blocks, m.unsubscribeUrl)
}

export interface StaleBriefing {
  language: Language
  site: string
  title: string
  version: number
  /** One line per changed figure: what it says now and what the briefing says. */
  changes: string[]
  url: string
}

/** To a briefing's planners: newer science changed numbers their issued briefing states. */
export function briefingStaleMail(m: StaleBriefing): MailBody {
  const t = translator(m.language)
  const facts = { site: m.site, title: m.title, version: m.version }
  return compose(m.language, t('emails.briefingStale.subject', facts), [
    { paragraphs: [t('emails.briefingStale.intro', facts)] },
    { heading: t('emails.briefingStale.heading'), paragraphs: m.changes },
    { paragraphs: [t('emails.briefingStale.newVersion')], link: { label: t('emails.briefingStale.link'), url: m.url } },
  ])
}

export function briefingIssuedMail(
  language: Language,
  site: string,
  title: string,
  url: string | null,
  unsubscribeUrl: string,
): MailBody {
  const t = translator(language)
  return compose(
    language,
    t('emails.briefingIssued.subject', { site, title }),
    [
      {
        paragraphs: [
          t('emails.briefingIssued.issued', { site, title }),
          ...(url ? [] : [t('emails.briefingIssued.notShared')]),
        ],
        ...(url ? { link: { label: t('emails.briefingIssued.link'), url } } : {}),
      },
    ],
    unsubscribeUrl,
  )
}

/** The one e-mail a watch started from a shared briefing's link gets when that link is withdrawn. */
export function shareWatchEndedMail(language: Language, site: string, title: string): MailBody {
  const t = translator(language)
  return compose(language, t('emails.shareWatchEnded.subject', { site }), [
    { paragraphs: t.list('emails.shareWatchEnded.paragraphs', { site, title }) },
  ])
}

export function invitationMail(
  language: Language,
  inviter: string,
  organisation: string,
  roleKey: string,
  url: string,
): MailBody {
  const t = translator(language)
  const role = ['admin', 'analyst', 'planner', 'reader'].includes(roleKey)
    ? t(`emails.invitation.roles.${roleKey}`)
    : roleKey
  return compose(language, t('emails.invitation.subject', { inviter }), [
    {
      paragraphs: t.list('emails.invitation.paragraphs', { inviter, organisation, role }),
      link: { label: t('emails.invitation.link'), url },
    },
  ])
}

export function passwordResetMail(language: Language, url: string): MailBody {
  const t = translator(language)
  return compose(language, t('emails.passwordReset.subject'), [
    { paragraphs: t.list('emails.passwordReset.paragraphs'), link: { label: t('emails.passwordReset.link'), url } },
  ])
}
