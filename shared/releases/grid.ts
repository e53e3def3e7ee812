import { uploadIssue as issue } from '../wording/uploads'
import { CsvError, parseNumberGrid } from './csv'

// Scale-factor grids: how much of a component's global-mean rise is felt at each latitude and
// longitude. Loss from an ice sheet lowers sea level near it and raises it more than the mean far
// away, so plausible factors lie roughly between -1 and 2; an area-weighted mean far from 1 is
// suspicious (mass is conserved).

export const PLAUSIBLE_FACTOR = { min: -1, max: 2 } as const
export const MEAN_FACTOR_TOLERANCE = 0.25

export interface ScaleFactorGrid { latitudes: number[], longitudes: number[], factors: number[][] }
export interface GridIssue { field: string, message: string }

function increasing(values: number[], field: string, lo: number, hi: number, issues: GridIssue[]) {
  values.forEach((value, i) => {
    if (value < lo || value > hi)
      issues.push({ field: `${field}[${i}]`, message: `Must lie between ${lo} and ${hi}, got ${value}.` })
    else if (i > 0 && !(value > values[i - 1]!))
      issues.push({ field: `${field}[${i}]`, message: `Must increase: ${value} follows ${values[i - 1]}.` })
  })
}

/** Problems that make a grid unusable (refused). */
export function gridErrors(grid: ScaleFactorGrid): GridIssue[] {
  const issues: GridIssue[] = []
  if (grid.latitudes.length < 2 || grid.longitudes.length < 2)
    issues.push({ field: 'latitudes', message: 'A grid needs at least two latitudes and two longitudes.' })
  increasing(grid.latitudes, 'latitudes', -90, 90, issues)
  increasing(grid.longitudes, 'longitudes', -180, 360, issues)
  if (grid.factors.length !== grid.latitudes.length)
    issues.push({
      field: 'factors',
      message: `Needs one row per latitude (${grid.latitudes.length}), got ${grid.factors.length}.`,
    })
  grid.factors.forEach((row, i) => {
    if (row.length !== grid.longitudes.length)
      issues.push({
        field: `factors[${i}]`,
        message: `Needs one value per longitude (${grid.longitudes.length}), got ${row.length}.`,
      })
  })
  return issues
}

/** Problems worth a second look but not a refusal. */
export function gridWarnings(grid: ScaleFactorGrid): string[] {
  const warnings: string[] = []
  let outside = 0
  let weighted = 0
  let weights = 0
  grid.factors.forEach((row, i) => {
    const weight = Math.cos((grid.latitudes[i]! * Math.PI) / 180)
    for (const factor of row) {
      if (factor < PLAUSIBLE_FACTOR.min || factor > PLAUSIBLE_FACTOR.max) outside++
      weighted += weight * factor
      weights += weight
    }
  })
  if (outside)
    warnings.push(
      `${outside} factor(s) lie outside ${PLAUSIBLE_FACTOR.min}…${PLAUSIBLE_FACTOR.max}, beyond what ice-loss fingerprints usually give. Check the units and sign.`,
    )
  const mean = weights ? weighted / weights : 1
  if (Math.abs(mean - 1) > MEAN_FACTOR_TOLERANCE)
    warnings.push(
      `The area-weighted mean factor is ${mean.toFixed(2)}; a global grid should average about 1 over the ocean.`,
    )
  return warnings
}

/** A grid from CSV: header `latitude,<lon>,…`, then `<lat>,<factor>,…` per row. */
export function parseGridCsv(text: string): ScaleFactorGrid {
  const { header, rows } = parseNumberGrid(text)
  if (header[0]!.toLowerCase() !== 'latitude')
    throw new CsvError([issue('csv header', 'latitudeHeader', { cell: header[0]! })])
  const longitudes = header.slice(1).map((cell, i) => {
    const value = Number(cell)
    if (cell === '' || !Number.isFinite(value))
      throw new CsvError([issue('csv header', 'longitudeColumn', { column: i + 2, cell })])
    return value
  })
  return { latitudes: rows.map(row => row[0]!), longitudes, factors: rows.map(row => row.slice(1)) }
}

/** Bilinear interpolation of a grid at a point; null outside the grid. */
export function interpolateFactor(grid: ScaleFactorGrid, latitude: number, longitude: number): number | null {
  const find = (axis: number[], value: number) => {
    if (value < axis[0]! || value > axis[axis.length - 1]!) return -1
    let i = 0
    while (i < axis.length - 2 && value > axis[i + 1]!) i++
    return i
  }
  let lon = longitude
  if (lon < grid.longitudes[0]!) lon += 360
  if (lon > grid.longitudes[grid.longitudes.length - 1]!) lon -= 360
  const i = find(grid.latitudes, latitude)
  const j = find(grid.longitudes, lon)
  if (i < 0 || j < 0) return null
  const t = (latitude - grid.latitudes[i]!) / (grid.latitudes[i + 1]! - grid.latitudes[i]!)
  const u = (lon - grid.longitudes[j]!) / (grid.longitudes[j + 1]! - grid.longitudes[j]!)
  const f = grid.factors
  return (
    (1 - t) * (1 - u) * f[i]![j]!
    + (1 - t) * u * f[i]![j + 1]!
    + t * (1 - u) * f[i + 1]![j]!
    + t * u * f[i + 1]![j + 1]!
  )
}
