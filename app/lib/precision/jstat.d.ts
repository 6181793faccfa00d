// Only the parts of jstat 1.9.6 this engine calls; the package ships no types.
declare module "jstat" {
  interface JStat {
    studentt: { inv(probability: number, degreesOfFreedom: number): number };
    centralF: { inv(probability: number, df1: number, df2: number): number };
  }
  const jStat: JStat;
  export default jStat;
}
