// jstat ships no type declarations; these cover the normal distribution the engine tests compare against.
declare module 'jstat' {
  interface JStatNormal {
    cdf(x: number, mean: number, sd: number): number
    inv(p: number, mean: number, sd: number): number
  }
  const jStatPackage: { jStat: { normal: JStatNormal } }
  export default jStatPackage
}
