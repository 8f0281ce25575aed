// jstat ships no types; only the parts lib/stats uses are declared.
declare module 'jstat' {
  interface JStatStatic {
    studentt: {
      inv(p: number, dof: number): number;
      cdf(x: number, dof: number): number;
    };
    ibeta(x: number, a: number, b: number): number | false;
  }
  const jStat: JStatStatic;
  export default jStat;
}
