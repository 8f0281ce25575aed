// jstat ships no types; only the parts lib/stats and the tests' oracles use are declared.
declare module 'jstat' {
  interface JStatStatic {
    studentt: {
      inv(p: number, dof: number): number;
      cdf(x: number, dof: number): number;
    };
    normal: {
      cdf(x: number, mean: number, sd: number): number;
    };
    ibeta(x: number, a: number, b: number): number | false;
    /** k in 0..1; inclusive (exclusive = false) interpolates linearly between order statistics. */
    percentile(sorted: number[], k: number, exclusive?: boolean): number;
  }
  const jStat: JStatStatic;
  export default jStat;
}
