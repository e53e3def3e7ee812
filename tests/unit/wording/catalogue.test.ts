import { readdirSync, readFileSync } from 'node:fs'
import { describe, expect, it } from 'vitest'
import { LANGUAGES, PAGE_DOMAINS } from '../../../locales'
import { causeSentence } from '#shared/wording/causes'
import { formatMessage, translator } from '#shared/wording/translate'

const LOCALES = new URL('../../../locales/', import.meta.url)
const WORD_DOMAINS = ['chance', 'document', 'emails', 'uploads']

/** Every key path of a JSON file, with "[]" for a list and its length. */
function keysOf(value: unknown, path = ''): string[] {
  if (Array.isArray(value)) return [`${path}[${value.length}]`]
  if (value && typeof value === 'object')
    return Object.entries(value).flatMap(([key, inner]) => keysOf(inner, path ? `${path}.${key}` : key))
  return [path]
}

describe('the catalogue', () => {
  it('gives every language the same files with the same keys', () => {
    for (const { code } of LANGUAGES) {
      const files = readdirSync(new URL(`${code}/`, LOCALES))
        .filter(name => name.endsWith('.json'))
        .map(name => name.replace('.json', ''))
        .sort()
      expect(files).toEqual([...PAGE_DOMAINS, ...WORD_DOMAINS].sort())
      for (const file of files) {
        const read = (language: string) =>
          keysOf(JSON.parse(readFileSync(new URL(`${language}/${file}.json`, LOCALES), 'utf8'))).sort()
        expect(read(code), `locales/${code}/${file}.json`).toEqual(read('en'))
      }
    }
  })

  it('chooses plural forms as vue-i18n does', () => {
    expect(formatMessage('{n} year | {n} years', { n: 1 })).toBe('1 year')
    expect(formatMessage('{n} year | {n} years', { n: 0 })).toBe('0 years')
    expect(formatMessage('No releases. | One release. | {count} releases.', { count: 0 })).toBe('No releases.')
    expect(formatMessage('No releases. | One release. | {count} releases.', { count: 1 })).toBe('One release.')
    expect(formatMessage('No releases. | One release. | {count} releases.', { count: 7 })).toBe('7 releases.')
    expect(formatMessage('Write to us{\'@\'}home', {})).toBe('Write to us@home')
  })

  it('words parameters once, never reading a value as message syntax', () => {
    const t = translator('en')
    expect(t('emails.whatChanged.subject', { site: '{site} | Caldwyn' })).toBe(
      'The sea-level outlook for {site} | Caldwyn has changed',
    )
    expect(t('chance.odds.oneIn', { n: 4 })).toBe('about a 1-in-4 chance')
    expect(() => t('chance.odds.oneIn')).toThrow(/\{n\}/)
    expect(() => t('emails.nothing')).toThrow(/No words/)
  })
})

describe('causes', () => {
  it('are worded in the reader\'s language from the facts stored', () => {
    const cause = {
      kind: 'release',
      action: 'published',
      component: 'antarctica',
      version: 3,
      scenario: 'SSP5-8.5',
    } as const
    expect(causeSentence(cause, 'en')).toBe(
      'A new release for Antarctic ice sheet (version 3, SSP5-8.5) changes the outlook for this site.',
    )
    expect(causeSentence(cause, 'es')).toBe(
      'Una versión nueva de Manto de hielo antártico (versión 3, SSP5-8.5) cambia la perspectiva de este sitio.',
    )
    expect(causeSentence({ kind: 'requested', scenario: null }, 'es')).toBe(
      'Una persona administradora pidió recalcular las perspectivas.',
    )
    expect(causeSentence({ kind: 'requested', scenario: 'SSP2-4.5' }, 'en')).toBe(
      'An administrator asked for the outlooks for SSP2-4.5 to be recomputed.',
    )
  })

  it('stored as sentences before causes were facts are shown as stored', () => {
    const old = {
      en: 'New annual maxima were fitted for Port Esk.',
      es: 'Se ajustaron nuevos máximos anuales para Port Esk.',
    }
    expect(causeSentence(old, 'es')).toBe(old.es)
    expect(causeSentence(old, 'en')).toBe(old.en)
  })
})
