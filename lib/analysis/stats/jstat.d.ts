// Minimal types for the parts of jstat 1.9.6 (a CommonJS/UMD package without types) this project uses.
declare module "jstat" {
  interface JStatStatic {
    /** Regularised incomplete beta function I_x(a, b). */
    ibeta(x: number, a: number, b: number): number;
    /** Inverse of I_x(a, b) in x. */
    ibetainv(p: number, a: number, b: number): number;
    /** Complementary error function (computed as 1 − erf). */
    erfc(x: number): number;
    studentt: {
      cdf(x: number, dof: number): number;
      inv(p: number, dof: number): number;
    };
    centralF: {
      cdf(x: number, df1: number, df2: number): number;
    };
    normal: {
      cdf(x: number, mean: number, std: number): number;
      inv(p: number, mean: number, std: number): number;
    };
  }
  const jStat: JStatStatic;
  export default jStat;
}
