// Small symmetric positive-definite systems (a handful of regression coefficients) by Cholesky
// factorisation, A = L·Lᵀ (Golub & Van Loan, Matrix Computations, §4.2).

function cholesky(matrix: readonly (readonly number[])[]): number[][] {
  const size = matrix.length
  const factor = Array.from({ length: size }, () => new Array<number>(size).fill(0))
  for (let j = 0; j < size; j++) {
    let diagonal = matrix[j]![j]!
    for (let k = 0; k < j; k++) diagonal -= factor[j]![k]! ** 2
    if (!(diagonal > 0))
      throw new RangeError(`The matrix is not positive definite at column ${j + 1}; the columns are not independent.`)
    const root = Math.sqrt(diagonal)
    factor[j]![j] = root
    for (let i = j + 1; i < size; i++) {
      let value = matrix[i]![j]!
      for (let k = 0; k < j; k++) value -= factor[i]![k]! * factor[j]![k]!
      factor[i]![j] = value / root
    }
  }
  return factor
}

function solveWithFactor(factor: number[][], rhs: readonly number[]): number[] {
  const size = factor.length
  const y = new Array<number>(size)
  for (let i = 0; i < size; i++) {
    let value = rhs[i]!
    for (let k = 0; k < i; k++) value -= factor[i]![k]! * y[k]!
    y[i] = value / factor[i]![i]!
  }
  const x = new Array<number>(size)
  for (let i = size - 1; i >= 0; i--) {
    let value = y[i]!
    for (let k = i + 1; k < size; k++) value -= factor[k]![i]! * x[k]!
    x[i] = value / factor[i]![i]!
  }
  return x
}

/** Solves A·x = b, and returns ln det A alongside. */
export function solveSymmetric(
  matrix: readonly (readonly number[])[],
  rhs: readonly number[],
): { solution: number[], logDet: number } {
  const factor = cholesky(matrix)
  let logDet = 0
  for (let i = 0; i < factor.length; i++) logDet += 2 * Math.log(factor[i]![i]!)
  return { solution: solveWithFactor(factor, rhs), logDet }
}

export function invertSymmetric(matrix: readonly (readonly number[])[]): number[][] {
  const factor = cholesky(matrix)
  const size = matrix.length
  const columns = Array.from({ length: size }, (_, j) =>
    solveWithFactor(
      factor,
      Array.from({ length: size }, (__, i) => (i === j ? 1 : 0)),
    ),
  )
  return Array.from({ length: size }, (_, i) => columns.map(column => column[i]!))
}
