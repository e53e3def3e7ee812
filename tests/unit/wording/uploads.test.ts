import { describe, expect, it } from 'vitest'
import { CsvError, parseDrawsCsv, parseQuantileCsv, type CsvIssue } from '#shared/releases/csv'
import { parseGaugeRecordCsv } from '#shared/observations/gauge-record'
import { MAX_UPLOADED_DRAWS } from '#shared/releases/limits'
import { translator } from '#shared/wording/translate'
import { uploadIssueMessage, type UploadIssueFacts } from '#shared/wording/uploads'

/** The issues of a refused file, each of which must carry its facts. */
function issuesOf(run: () => unknown): Array<CsvIssue & UploadIssueFacts> {
  try {
    run()
  }
  catch (error) {
    if (!(error instanceof CsvError)) throw error
    for (const issue of error.issues) expect(issue.code, issue.message).toBeTypeOf('string')
    return error.issues as Array<CsvIssue & UploadIssueFacts>
  }
  throw new Error('expected a CsvError')
}

const spanish = translator('es')

describe('upload issues are facts a page words in its reader\'s language', () => {
  it('carries the code and values of each row issue beside the English words', () => {
    const [ragged, text] = issuesOf(() => parseQuantileCsv('level,2050,2100\n0.5,0.1\n0.83,abc,0.4\n'))
    expect(ragged).toEqual({
      field: 'csv row 2',
      code: 'cellCount',
      params: { cells: 2, columns: 3 },
      message: 'Has 2 cells but the header has 3.',
    })
    expect(uploadIssueMessage(spanish, ragged!)).toBe('Tiene 2 celdas, pero el encabezado tiene 3.')
    expect(text).toMatchObject({ field: 'csv row 3, column 2050', code: 'notFinite', params: { cell: 'abc' } })
    expect(uploadIssueMessage(spanish, text!)).toBe('«abc» no es un número finito.')
  })

  it('words the unit advice in the same language, keeping a value as the file has it', () => {
    const [issue] = issuesOf(() => parseGaugeRecordCsv('year,height\n2000,140\n2001,150\n'))
    expect(issue).toMatchObject({ code: 'outside', params: { value: '140', min: -20, max: 20, advice: 'centimetres' } })
    expect(issue!.message).toBe('140 is outside -20 to 20 m above the site\'s datum; these look like centimetres: divide by 100.')
    expect(uploadIssueMessage(spanish, issue!)).toBe(
      '140 está fuera del intervalo de -20 a 20 m sobre el datum del lugar; parecen centímetros: divida entre 100.',
    )
  })

  it('groups counts as each language does, but never a year', () => {
    const rows = Array.from({ length: MAX_UPLOADED_DRAWS + 1 }, () => '0.1').join('\n')
    const [issue] = issuesOf(() => parseDrawsCsv(`2100\n${rows}\n`))
    expect(issue!.message).toBe('At most 100,000 draws, got 100,001. Thin the draws evenly.')
    expect(uploadIssueMessage(spanish, issue!)).toBe(
      'Como máximo 100.000 muestras; hay 100.001. Reduzca las muestras de forma uniforme.',
    )
    const [year] = issuesOf(() => parseGaugeRecordCsv('year,height\n98,1.1\n'))
    expect(uploadIssueMessage(spanish, year!)).toBe('«98» no es un año entre 1700 y 2200; escriba el año completo, como 1998.')
  })
})
