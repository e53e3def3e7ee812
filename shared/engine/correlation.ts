import type { EngineInputIssue } from './errors'

// Correlation between component scores (the Gaussian copula) and its Cholesky factor.

const SYMMETRY_TOLERANCE = 1e-9
const PIVOT_TOLERANCE = 1e-10

/** Checks shape, range, symmetry and unit diagonal; returns the problems found (empty when fine). */
export function correlationShapeIssues(matrix: number[][], size: number, path = 'correlation'): EngineInputIssue[] {
  const issues: EngineInputIssue[] = []
  if (matrix.length !== size) {
    issues.push({
      path,
      message: `must be ${size}×${size} (one row and column per component, in component order), got ${matrix.length} rows`,
    })
    return issues
  }
  matrix.forEach((row, i) => {
    if (row.length !== size)
      issues.push({ path: `${path}[${i}]`, message: `must have ${size} entries, got ${row.length}` })
  })
  if (issues.length) return issues
  for (let i = 0; i < size; i++) {
    if (Math.abs(matrix[i]![i]! - 1) > SYMMETRY_TOLERANCE) {
      issues.push({
        path: `${path}[${i}][${i}]`,
        message: `diagonal must be 1 (a component is fully correlated with itself), got ${matrix[i]![i]}`,
      })
    }
    for (let j = 0; j < size; j++) {
      const value = matrix[i]![j]!
      if (value < -1 || value > 1) {
        issues.push({ path: `${path}[${i}][${j}]`, message: `must lie in [-1, 1], got ${value}` })
      }
      else if (j > i && Math.abs(value - matrix[j]![i]!) > SYMMETRY_TOLERANCE) {
        issues.push({
          path: `${path}[${i}][${j}]`,
          message: `not symmetric: [${i}][${j}] is ${value} but [${j}][${i}] is ${matrix[j]![i]}; make both the same`,
        })
      }
    }
  }
  return issues
}

/**
 * Lower-triangular L with L·Lᵀ = matrix, for positive semi-definite matrices too (a zero pivot gives a
 * zero column), so perfectly correlated components are allowed. Returns the index of the first row
 * that shows the matrix is not positive semi-definite instead, or the factor row-major in a
 * Float64Array of size².
 */
export function choleskySemiDefinite(matrix: number[][]): { factor: Float64Array } | { failsAtRow: number } {
  const size = matrix.length
  const factor = new Float64Array(size * size)
  for (let j = 0; j < size; j++) {
    let pivot = matrix[j]![j]!
    for (let k = 0; k < j; k++) pivot -= factor[j * size + k]! ** 2
    if (pivot < -PIVOT_TOLERANCE) return { failsAtRow: j }
    if (pivot <= PIVOT_TOLERANCE) {
      // A zero pivot is only consistent when the rest of the column is already explained.
      for (let i = j + 1; i < size; i++) {
        let rest = matrix[i]![j]!
        for (let k = 0; k < j; k++) rest -= factor[i * size + k]! * factor[j * size + k]!
        if (Math.abs(rest) > 1e-8) return { failsAtRow: i }
      }
      continue
    }
    const diagonal = Math.sqrt(pivot)
    factor[j * size + j] = diagonal
    for (let i = j + 1; i < size; i++) {
      let rest = matrix[i]![j]!
      for (let k = 0; k < j; k++) rest -= factor[i * size + k]! * factor[j * size + k]!
      factor[i * size + j] = rest / diagonal
    }
  }
  return { factor }
}

export function identityFactor(size: number): Float64Array {
  const factor = new Float64Array(size * size)
  for (let i = 0; i < size; i++) factor[i * size + i] = 1
  return factor
}
