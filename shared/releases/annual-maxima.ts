import { fitGumbelByLMoments, type GumbelParameters } from '../engine'
import { MIN_ANNUAL_MAXIMA } from '../schemas/sites'
import { CsvError, parseNumberGrid } from './csv'

export interface AnnualMaximaFit { maxima: { year: number, value: number }[], gumbel: GumbelParameters, sampleSize: number }

/** Annual maxima from CSV (`year,value`, one row per year), fitted by L-moments. */
export function fitAnnualMaximaCsv(text: string): AnnualMaximaFit {
  const { header, rows } = parseNumberGrid(text)
  if (header.length !== 2 || header[0]!.toLowerCase() !== 'year' || header[1]!.toLowerCase() !== 'value') {
    throw new CsvError([{ field: 'csv header', message: `The header must be "year,value", got "${header.join(',')}".` }])
  }
  const seen = new Set<number>()
  rows.forEach(([year], r) => {
    if (!Number.isInteger(year) || year! < 1800 || year! > 2200) throw new CsvError([{ field: `csv row ${r + 2}, column year`, message: `"${year}" is not a year between 1800 and 2200.` }])
    if (seen.has(year!)) throw new CsvError([{ field: `csv row ${r + 2}, column year`, message: `${year} appears twice; give one maximum per year.` }])
    seen.add(year!)
  })
  if (rows.length < MIN_ANNUAL_MAXIMA) {
    throw new CsvError([{ field: 'csv', message: `At least ${MIN_ANNUAL_MAXIMA} years are needed for a fit, got ${rows.length}.` }])
  }
  const maxima = rows.map(([year, value]) => ({ year: year!, value: value! })).sort((a, b) => a.year - b.year)
  return { maxima, gumbel: fitGumbelByLMoments(maxima.map(m => m.value)), sampleSize: maxima.length }
}
