// The normal-distribution parts of jstat 1.9.6 used by the comparison and ruggedness modules (the package ships no types).
declare module "jstat" {
  interface JStat {
    normal: {
      cdf(x: number, mean: number, sd: number): number;
      pdf(x: number, mean: number, sd: number): number;
      inv(probability: number, mean: number, sd: number): number;
    };
  }
}
