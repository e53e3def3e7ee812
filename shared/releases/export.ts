import { toCsv } from './csv'

interface Distribution {
  form: string
  anchorYears: number[]
  [key: string]: unknown
}

const numbers = (value: unknown) => value as number[]

/** A release's distribution as CSV rows (metres): the upload layout for tables and draws. */
export function releaseCsv(distribution: Distribution): string {
  const years = distribution.anchorYears
  switch (distribution.form) {
    case 'quantiles': {
      const levels = numbers(distribution.levels)
      const values = distribution.values as number[][]
      return toCsv([['level', ...years], ...levels.map((level, k) => [level, ...years.map((_, a) => values[a]![k]!)])])
    }
    case 'samples':
      return toCsv([years, ...(distribution.draws as number[][])])
    case 'normal':
      return toCsv([
        ['year', 'mean', 'sd'],
        ...years.map((year, a) => [year, numbers(distribution.mean)[a]!, numbers(distribution.sd)[a]!]),
      ])
    default:
      return toCsv([
        ['year', 'shift', 'mu', 'sigma'],
        ...years.map((year, a) => [
          year,
          numbers(distribution.shift)[a]!,
          numbers(distribution.mu)[a]!,
          numbers(distribution.sigma)[a]!,
        ]),
      ])
  }
}
