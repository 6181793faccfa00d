import jStat from "jstat";

function assertProbability(probability: number): void {
  if (!(probability > 0 && probability < 1)) {
    throw new RangeError(`probability must lie strictly between 0 and 1, got ${probability}`);
  }
}

function assertDegreesOfFreedom(df: number, name: string): void {
  if (!(df > 0 && Number.isFinite(df))) {
    throw new RangeError(`${name} must be a positive finite number, got ${df}`);
  }
}

/** Student's t quantile: the t with P(T ≤ t) = probability for `df` degrees of freedom. */
export function studentTQuantile(probability: number, df: number): number {
  assertProbability(probability);
  assertDegreesOfFreedom(df, "degrees of freedom");
  return jStat.studentt.inv(probability, df);
}

/** F quantile: the F with P(X ≤ F) = probability for (df1, df2) degrees of freedom. */
export function fQuantile(probability: number, df1: number, df2: number): number {
  assertProbability(probability);
  assertDegreesOfFreedom(df1, "numerator degrees of freedom");
  assertDegreesOfFreedom(df2, "denominator degrees of freedom");
  return jStat.centralF.inv(probability, df1, df2);
}
