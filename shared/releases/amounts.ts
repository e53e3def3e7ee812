import { gigatonnesToMetres } from '../engine'
import type { AmountUnit } from '../types/science'

/** An amount as entered (metres, millimetres or gigatonnes of ice lost) in metres of global mean rise. */
export function amountToMetres(value: number, unit: AmountUnit): number {
  if (unit === 'mm') return value / 1000
  if (unit === 'Gt') return gigatonnesToMetres(value)
  return value
}
