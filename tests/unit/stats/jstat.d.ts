// Types for the parts of jstat (a general-purpose JS statistics library, used only as an
// outside reference in these tests) that the stats tests call. jstat ships no types.
declare module 'jstat' {
  interface JStatStatic {
    ibeta(x: number, a: number, b: number): number;
    lowRegGamma(a: number, x: number): number;
    gammaln(x: number): number;
    beta: { inv(p: number, a: number, b: number): number; cdf(x: number, a: number, b: number): number };
    chisquare: { inv(p: number, df: number): number; cdf(x: number, df: number): number };
    normal: { inv(p: number, mean: number, sd: number): number; cdf(x: number, mean: number, sd: number): number };
    binomial: { cdf(k: number, n: number, p: number): number; pdf(k: number, n: number, p: number): number };
  }
  const jStat: JStatStatic;
  export default jStat;
}
