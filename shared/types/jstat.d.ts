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
  }
  const jStat: JStatStatic;
  export default jStat;
  export { jStat };
}
