import { describe, expect, it } from 'vitest'
import { SiteSchema } from '../../../shared/schemas/sites'
import { textField, withoutControls } from '../../../shared/schemas/text'

// Which characters a text field drops: Unicode's general category Cc (C0, DEL, C1) other than tab and
// line breaks, and the bidirectional formatting characters of UAX #9 that embed, override or isolate
// [pub: Unicode Standard Annex #9, Unicode Bidirectional Algorithm, table 1 "Explicit formatting characters"].
describe('text fields without control characters', () => {
  it('drops BEL, ESC, DEL, C1 codes and bidirectional embeddings, overrides and isolates', () => {
    expect(withoutControls('a\u0007b\u001Bc\u007Fd\u0085e\u009Bf')).toBe('abcdef')
    for (const code of [0x202A, 0x202B, 0x202C, 0x202D, 0x202E, 0x2066, 0x2067, 0x2068, 0x2069]) {
      expect(withoutControls(`x${String.fromCodePoint(code)}y`), code.toString(16)).toBe('xy')
    }
  })

  it('keeps tab and line breaks, right-to-left letters, marks, joiners and emoji', () => {
    const fair = 'Line one\tcell\r\nرصيف \u200FQuay נמל Kel\u200Cwick 👩‍👩‍👧 Cafe\u0301'
    expect(withoutControls(fair)).toBe(fair)
  })

  it('applies before the length and emptiness rules of a schema', () => {
    expect(textField().trim().min(1).safeParse('\u0007\u202E').success).toBe(false)
    const parsed = SiteSchema.safeParse({
      name: 'Bell\u0007 Quay',
      latitude: 0,
      longitude: 0,
      referenceLevel: 'Chart datum',
      datum: { kind: 'chart', offset: 0 },
      referenceEpoch: 2020,
      landMotion: { rateMmPerYear: 0, sigmaMmPerYear: 0, source: 'gps', epoch: 2020 },
    })
    expect(parsed.success && parsed.data.name).toBe('Bell Quay')
  })
})
