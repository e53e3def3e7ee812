import type { Language } from '#shared/wording/chance'

// Every e-mail in plain text and HTML, English and Spanish, our own wording, readable without
// images. Values are escaped for HTML here, once.

export interface MailBody { subject: string, text: string, html: string }

export function escapeHtml(value: string) {
  return value.replace(/&/g, '&amp;').replace(/</g, '&lt;').replace(/>/g, '&gt;').replace(/"/g, '&quot;').replace(/'/g, '&#39;')
}

export interface Block { heading?: string, paragraphs?: string[], rows?: string[][], link?: { label: string, url: string } }

const FOOTER: Record<Language, (unsubscribe?: string) => string> = {
  en: unsubscribe => `Brinkwater sends sea-level outlooks for coastal planning. Projections are not predictions and are not engineering or legal advice.${unsubscribe ? ` Stop these e-mails: ${unsubscribe}` : ''}`,
  es: unsubscribe => `Brinkwater envía perspectivas del nivel del mar para la planificación costera. Las proyecciones no son predicciones ni asesoramiento de ingeniería o jurídico.${unsubscribe ? ` Dejar de recibir estos correos: ${unsubscribe}` : ''}`,
}

/** Lays blocks out twice: as plain text and as simple, image-free HTML. */
export function compose(language: Language, subject: string, blocks: Block[], unsubscribe?: string): MailBody {
  const text = [
    ...blocks.flatMap(block => [
      ...(block.heading ? [block.heading, '-'.repeat(block.heading.length)] : []),
      ...(block.paragraphs ?? []),
      ...(block.rows ?? []).map(row => row.join('  |  ')),
      ...(block.link ? [`${block.link.label}: ${block.link.url}`] : []),
      '',
    ]),
    FOOTER[language](unsubscribe),
  ].join('\n')
  const html = `<!doctype html><html lang="${language}"><body style="font-family:'Atkinson Hyperlegible',Verdana,sans-serif;color:#0b1a23;line-height:1.5;max-width:640px">`
    + blocks.map(block => [
      block.heading ? `<h2 style="color:#1c5a6d;font-size:18px">${escapeHtml(block.heading)}</h2>` : '',
      ...(block.paragraphs ?? []).map(p => `<p>${escapeHtml(p)}</p>`),
      block.rows?.length ? `<table style="border-collapse:collapse">${block.rows.map((row, i) => `<tr>${row.map(cell => `<${i === 0 ? 'th' : 'td'} style="border:1px solid #e4dcc7;padding:4px 8px;text-align:left">${escapeHtml(cell)}</${i === 0 ? 'th' : 'td'}>`).join('')}</tr>`).join('')}</table>` : '',
      block.link ? `<p><a href="${escapeHtml(block.link.url)}" style="color:#1c5a6d;font-weight:bold">${escapeHtml(block.link.label)}</a></p>` : '',
    ].join('')).join('')
    + `<hr style="border:0;border-top:1px solid #e4dcc7"><p style="font-size:12px;color:#5d5036">${escapeHtml(FOOTER[language]())}${unsubscribe ? ` <a href="${escapeHtml(unsubscribe)}">${language === 'es' ? 'Dejar de recibir estos correos' : 'Stop these e-mails'}</a>` : ''}</p></body></html>`
  return { subject, text, html }
}

export function watchConfirmMail(language: Language, site: string, confirmUrl: string, unsubscribeUrl: string): MailBody {
  return language === 'es'
    ? compose('es', `Confirme que quiere seguir ${site}`, [{ paragraphs: [`Alguien (esperamos que usted) pidió recibir un correo cuando cambie la perspectiva del nivel del mar para ${site}.`, 'Si no fue usted, ignore este mensaje y no recibirá nada más. El enlace caduca en 48 horas.'], link: { label: 'Confirmar el seguimiento', url: confirmUrl } }], unsubscribeUrl)
    : compose('en', `Confirm that you want to watch ${site}`, [{ paragraphs: [`Someone (we hope you) asked to hear when the sea-level outlook for ${site} changes.`, 'If that was not you, ignore this message and nothing more will come. The link expires in 48 hours.'], link: { label: 'Confirm the watch', url: confirmUrl } }], unsubscribeUrl)
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
  releases: ReleaseChange[]
  horizons?: HorizonChange[]
  /** The sentence on the site's headline under its planning scenario, named, before and after (absent for a watch from a shared briefing). */
  planning?: string
  briefingUrl: string | null
  unsubscribeUrl: string
}

export function whatChangedMail(m: WhatChanged): MailBody {
  const es = m.language === 'es'
  const horizons = (m.horizons ?? []).map(h => h.after < h.before
    ? (es
        ? `El horizonte se acortó (${h.scenario}): la perspectiva llegaba hasta ${h.before} y ahora solo llega hasta ${h.after}, porque la nueva versión ya no da años posteriores. No hay cifras para los años después de ${h.after}.`
        : `The horizon was shortened (${h.scenario}): the outlook reached ${h.before} and now reaches only ${h.after}, because the new release no longer gives later years. There are no numbers for years after ${h.after}.`)
    : (es
        ? `El horizonte se amplió (${h.scenario}): la perspectiva llegaba hasta ${h.before} y ahora llega hasta ${h.after}.`
        : `The horizon was extended (${h.scenario}): the outlook reached ${h.before} and now reaches ${h.after}.`))
  const blocks: Block[] = [
    { paragraphs: [m.cause, ...(m.planning ? [m.planning] : []), ...horizons, es ? 'Estas son las cifras antes y después del cambio.' : 'Here are the numbers before and after the change.'] },
    { heading: es ? 'La probabilidad para cada umbral' : 'The chance for each threshold', rows: [[es ? 'Umbral' : 'Threshold', es ? 'Año' : 'Year', es ? 'Antes' : 'Before', es ? 'Después' : 'After'], ...m.chances.map(r => [r.threshold, String(r.year), r.before, r.after])] },
    { heading: es ? 'Subida: estimación central (rango probable)' : 'Rise: middle estimate (likely range)', rows: [[es ? 'Escenario' : 'Scenario', es ? 'Año' : 'Year', es ? 'Antes' : 'Before', es ? 'Después' : 'After'], ...m.ranges.map(r => [r.scenario, String(r.year), r.before, r.after])] },
  ]
  if (m.releases.length) {
    blocks.push({ heading: es ? 'Qué versiones cambiaron' : 'Which releases changed', rows: [[es ? 'Fuente' : 'Source', es ? 'Antes' : 'Before', es ? 'Ahora' : 'Now', es ? 'Cita' : 'Citation'], ...m.releases.map(r => [r.component, r.from, r.to, r.citation])] })
  }
  if (m.briefingUrl) {
    blocks.push({
      paragraphs: [es ? 'El último informe se emitió antes de este cambio y no se modifica: su página indica qué cifras han quedado desfasadas.' : 'The latest briefing was issued before this change and stays as issued: its page says which of its numbers are out of date.'],
      link: { label: es ? 'Leer el último informe' : 'Read the latest briefing', url: m.briefingUrl },
    })
  }
  return compose(m.language, es ? `Cambió la perspectiva del nivel del mar para ${m.site}` : `The sea-level outlook for ${m.site} has changed`, blocks, m.unsubscribeUrl)
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
  const es = m.language === 'es'
  return compose(m.language, es ? `Informe desfasado: ${m.title} (versión ${m.version}, ${m.site})` : `Briefing out of date: ${m.title} (version ${m.version}, ${m.site})`, [
    { paragraphs: [es
      ? `Una perspectiva más reciente para ${m.site} cambia cifras de la versión ${m.version} de «${m.title}». El informe emitido no se modifica; su página y su enlace compartido avisan ya del cambio.`
      : `A newer outlook for ${m.site} changes numbers in version ${m.version} of "${m.title}". The issued briefing stays as it is; its page and its shared link now say so.`] },
    { heading: es ? 'Qué cambió' : 'What changed', paragraphs: m.changes },
    { paragraphs: [es ? 'En la página del informe, «Crear una versión nueva con las últimas perspectivas» prepara un borrador con las cifras actuales para revisarlo y emitirlo.' : 'On the briefing\'s page, "Make a new version from the latest outlooks" prepares a draft with the current numbers to review and issue.'],
      link: { label: es ? 'Abrir el informe' : 'Open the briefing', url: m.url } },
  ])
}

export function briefingIssuedMail(language: Language, site: string, title: string, url: string | null, unsubscribeUrl: string): MailBody {
  const es = language === 'es'
  return compose(language, es ? `Nuevo informe para ${site}: ${title}` : `New briefing for ${site}: ${title}`, [{
    paragraphs: [es ? `Se ha emitido un nuevo informe sobre el nivel del mar para ${site}: «${title}».` : `A new sea-level briefing has been issued for ${site}: "${title}".`,
      ...(url ? [] : [es ? 'Sus autores aún no lo han publicado con un enlace; pídaselo a la organización.' : 'Its authors have not published it by link yet; ask the organisation for a copy.'])],
    ...(url ? { link: { label: es ? 'Leer el informe' : 'Read the briefing', url } } : {}),
  }], unsubscribeUrl)
}

/** The one e-mail a watch started from a shared briefing's link gets when that link is withdrawn. */
export function shareWatchEndedMail(language: Language, site: string, title: string): MailBody {
  return language === 'es'
    ? compose('es', `Ya no recibirá novedades de ${site}`, [{ paragraphs: [`Siguió ${site} con el enlace del informe «${title}». Sus autores han retirado ese enlace, así que el seguimiento ha terminado y no recibirá más correos sobre él.`, 'Si aún necesita estas cifras, pida un enlace nuevo a la organización que publicó el informe.'] }])
    : compose('en', `You will no longer hear about ${site}`, [{ paragraphs: [`You watched ${site} through the link of the briefing "${title}". Its authors have withdrawn that link, so the watch has ended and no more e-mails will come about it.`, 'If you still need these numbers, ask the organisation that published the briefing for a new link.'] }])
}

const ROLE_NAMES: Record<Language, Record<string, string>> = {
  en: { admin: 'an administrator', analyst: 'an analyst', planner: 'a planner', reader: 'a reader' },
  es: { admin: 'administrador/a', analyst: 'analista', planner: 'planificador/a', reader: 'lector/a' },
}

export function invitationMail(language: Language, inviter: string, organisation: string, roleKey: string, url: string): MailBody {
  const role = ROLE_NAMES[language][roleKey] ?? roleKey
  return language === 'es'
    ? compose('es', `Invitación a Brinkwater de ${inviter}`, [{ paragraphs: [`${inviter} le invita a unirse a ${organisation} en Brinkwater como ${role}.`, 'Elija una contraseña con el enlace; caduca en 7 días y sirve una sola vez.'], link: { label: 'Aceptar la invitación', url } }])
    : compose('en', `${inviter} invites you to Brinkwater`, [{ paragraphs: [`${inviter} invites you to join ${organisation} on Brinkwater as ${role}.`, 'Choose a password with the link; it expires in 7 days and works once.'], link: { label: 'Accept the invitation', url } }])
}

export function passwordResetMail(language: Language, url: string): MailBody {
  return language === 'es'
    ? compose('es', 'Restablecer su contraseña de Brinkwater', [{ paragraphs: ['Alguien pidió restablecer la contraseña de esta cuenta. Si no fue usted, ignore este mensaje: su contraseña no cambia.', 'El enlace caduca en 1 hora y sirve una sola vez.'], link: { label: 'Elegir una contraseña nueva', url } }])
    : compose('en', 'Reset your Brinkwater password', [{ paragraphs: ['Someone asked to reset the password of this account. If it was not you, ignore this message: your password stays as it is.', 'The link expires in 1 hour and works once.'], link: { label: 'Choose a new password', url } }])
}
