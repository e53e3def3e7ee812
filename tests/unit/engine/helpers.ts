import type { ComponentInput, OutlookInput } from '../../../shared/engine'

/** A normal release from its baseline year, with one mean and sd per anchor year. */
export function normalComponent(
  key: string,
  anchors: Record<number, [number, number]>,
  baselineYear = 2000,
  scale = 1,
): ComponentInput {
  const anchorYears = Object.keys(anchors).map(Number)
  return {
    key,
    scale,
    release: {
      form: 'normal',
      baselineYear,
      anchorYears,
      mean: anchorYears.map(year => anchors[year]![0]),
      sd: anchorYears.map(year => anchors[year]![1]),
    },
  }
}

export function baseInput(overrides: Partial<OutlookInput> = {}): OutlookInput {
  return {
    baselineYear: 2000,
    years: [2050, 2100],
    samples: 20_000,
    seed: 7,
    components: [normalComponent('ocean-expansion', { 2050: [0.1, 0.03], 2100: [0.3, 0.08] })],
    heights: { from: 0, to: 1, step: 0.1 },
    ...overrides,
  }
}

/** Every number anywhere in a result, to check none is NaN. */
export function allNumbers(value: unknown, out: number[] = []): number[] {
  if (typeof value === 'number') out.push(value)
  else if (Array.isArray(value)) value.forEach(item => allNumbers(item, out))
  else if (value && typeof value === 'object') Object.values(value).forEach(item => allNumbers(item, out))
  return out
}
