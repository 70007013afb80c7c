// Minimal ambient types for the jstat package (CommonJS; loads as a default export
// under ESM). Only the members this project calls are declared.
declare module 'jstat' {
  interface JStatNormal {
    /** Quantile (inverse CDF) of N(mean, sd²). */
    inv(p: number, mean: number, sd: number): number;
    cdf(x: number, mean: number, sd: number): number;
  }
  interface JStatWeibull {
    /** Note jstat's argument order: scale before shape. */
    cdf(x: number, scale: number, shape: number): number;
    inv(p: number, scale: number, shape: number): number;
  }
  interface JStatStatic {
    normal: JStatNormal;
    weibull: JStatWeibull;
    /** Regularised lower incomplete gamma P(a, x). */
    lowRegGamma(a: number, x: number): number;
    mean(values: number[]): number;
    /** Sample covariance (divides by n − 1). */
    covariance(a: number[], b: number[]): number;
    /** Variance; `sample = true` divides by n − 1. */
    variance(values: number[], sample?: boolean): number;
    /** Standard deviation; `sample = true` divides by n − 1. */
    stdev(values: number[], sample?: boolean): number;
  }
  const jStat: JStatStatic;
  export default jStat;
}
