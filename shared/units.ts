// Heights are stored and computed in metres; feet are a display choice only.
export const METRES_PER_FOOT = 0.3048 // international foot, exact by definition

export type HeightUnit = 'm' | 'ft'
export const HEIGHT_UNITS: readonly HeightUnit[] = ['m', 'ft']

export function fromMetres(metres: number, unit: HeightUnit): number {
  return unit === 'ft' ? metres / METRES_PER_FOOT : metres
}

export function toMetres(value: number, unit: HeightUnit): number {
  return unit === 'ft' ? value * METRES_PER_FOOT : value
}

/** "0.50 m" or "1.6 ft": centimetre precision in metres, tenth-of-a-foot precision in feet. */
/** `fine`: a digit more (millimetres, hundredths of a foot) for gauge-sized changes. */
export function formatHeight(metres: number, unit: HeightUnit, locale = 'en', fine = false): string {
  const digits = (unit === 'ft' ? 1 : 2) + (fine ? 1 : 0)
  const value = fromMetres(metres, unit).toLocaleString(locale, {
    minimumFractionDigits: digits,
    maximumFractionDigits: digits,
  })
  return `${value} ${unit}`
}
