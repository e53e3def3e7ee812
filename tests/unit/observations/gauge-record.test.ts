import { describe, expect, it } from 'vitest'
import { CsvError } from '../../../shared/releases/csv'
import { gaugePoints, parseGaugeRecordCsv } from '../../../shared/observations/gauge-record'

function issuesOf(text: string): string[] {
  try {
    parseGaugeRecordCsv(text)
  }
  catch (error) {
    if (error instanceof CsvError) return error.issues.map(issue => `${issue.field}: ${issue.message}`)
    throw error
  }
  return []
}

describe('parseGaugeRecordCsv', () => {
  it('reads annual means, sorts them and lists the gaps', () => {
    const record = parseGaugeRecordCsv('year,height\n2001,1.21\n1999,1.20\n2004,1.25\n')
    expect(record.resolution).toBe('annual')
    expect(record.values.map(v => v.year)).toEqual([1999, 2001, 2004])
    expect(record.gaps).toEqual([{ from: '2000', to: '2000', missing: 1 }, { from: '2002', to: '2003', missing: 2 }])
  })

  it('reads monthly means with flags; flagged values are kept but not fitted', () => {
    const record = parseGaugeRecordCsv('Year,Month,Height,Flag\n2000,11,1.1,\n2000,12,1.2,\n2001,3,1.3,suspect\n')
    expect(record.resolution).toBe('monthly')
    expect(record.gaps).toEqual([{ from: '2001-01', to: '2001-02', missing: 2 }])
    expect(record.values[2]!.flag).toBe('suspect')
    const points = gaugePoints(record)
    expect(points).toHaveLength(2)
    expect(points[0]!.time).toBeCloseTo(2000 + 10.5 / 12, 12)
  })

  it('drops control characters and bidirectional overrides from a flag, as from any text field', () => {
    const record = parseGaugeRecordCsv('year,height,flag\n2000,1.1,sus\u0007pect\u202E\n2001,1.2,\n')
    expect(record.values.map(v => v.flag)).toEqual(['suspect', null])
  })

  it('refuses a time given twice, naming both rows', () => {
    expect(issuesOf('year,height\n2000,1.1\n2001,1.2\n2000,1.3\n')).toEqual([
      'csv row 4, column year: 2000 is also on row 2; give one value per year.',
    ])
  })

  it('says when heights are in millimetres or centimetres', () => {
    expect(issuesOf('year,height\n2000,7012\n2001,7020\n')[0]).toMatch(/millimetres: divide by 1000/)
    expect(issuesOf('year,height\n2000,70.1\n2001,70.2\n')[0]).toMatch(/centimetres: divide by 100/)
  })

  it('names the bad cell of every malformed row and the header it expects', () => {
    expect(issuesOf('year,height\n98,1.1\n2000,\n2001,abc\n')).toEqual([
      'csv row 2, column year: "98" is not a year between 1700 and 2200; enter the whole year, like 1998.',
      'csv row 3, column height: Is empty; leave the row out for a missing value, or enter the height in metres.',
      'csv row 4, column height: "abc" is not a number.',
    ])
    expect(issuesOf('year,month,height\n2000,13,1.1\n')).toEqual([
      'csv row 2, column month: "13" is not a month; enter 1 to 12.',
    ])
    expect(issuesOf('date,level\n2000,1\n')[0]).toMatch(/header must be "year,height"/)
  })
})
