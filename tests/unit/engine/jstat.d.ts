// jstat ships no type declarations; these cover the distributions the engine tests compare against.
declare module 'jstat' {
  interface JStatNormal {
    cdf(x: number, mean: number, sd: number): number
    inv(p: number, mean: number, sd: number): number
  }
  interface JStatLognormal {
    cdf(x: number, mu: number, sigma: number): number
  }
  const jStatPackage: { jStat: { normal: JStatNormal; lognormal: JStatLognormal } }
  export default jStatPackage
}
