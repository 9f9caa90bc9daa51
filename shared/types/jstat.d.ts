/** Minimal declarations of the parts of jstat the tests use (the package ships no types). */
declare module "jstat" {
  interface JStatNormal {
    inv(p: number, mean: number, std: number): number;
    cdf(x: number, mean: number, std: number): number;
    pdf(x: number, mean: number, std: number): number;
  }
  interface JStatBeta {
    inv(p: number, a: number, b: number): number;
  }
  interface JStatStatic {
    normal: JStatNormal;
    beta: JStatBeta;
    mean(arr: number[]): number;
    /** flag true: sample standard deviation (n − 1) */
    stdev(arr: number[], flag?: boolean): number;
    median(arr: number[]): number;
    /** median absolute deviation */
    meddev(arr: number[]): number;
    min(arr: number[]): number;
    max(arr: number[]): number;
    /** without `exclusive`: linear interpolation at rank k·(n − 1) */
    percentile(arr: number[], k: number, exclusive?: boolean): number;
  }
  const jStat: JStatStatic;
  export default jStat;
  export { jStat };
}
