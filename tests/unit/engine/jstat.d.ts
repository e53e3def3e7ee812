// jstat ships no type declarations; these cover the distributions and matrix operations the tests compare against.
declare module 'jstat' {
  interface JStatNormal {
    cdf(x: number, mean: number, sd: number): number
    inv(p: number, mean: number, sd: number): number
    pdf(x: number, mean: number, sd: number): number
  }
  interface JStatLognormal {
    cdf(x: number, mu: number, sigma: number): number
  }
  type Matrix = number[][]
  const jStatPackage: {
    jStat: {
      normal: JStatNormal
      lognormal: JStatLognormal
      inv(matrix: Matrix): Matrix
      multiply(a: Matrix, b: Matrix): Matrix
      transpose(matrix: Matrix): Matrix
    }
  }
  export default jStatPackage
}
