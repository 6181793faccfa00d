import jStat from "jstat";
import { logBeta, logGamma, regularizedBeta, regularizedGamma } from "./special-functions";

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

/**
 * Solves tail(x) = target for an increasing distribution function by Newton
 * steps from a starting value, each step kept inside a bracket that bisection
 * narrows when Newton overshoots. `tail` returns the lower and upper tail
 * probabilities (each computed directly), `density` the density; the side
 * with the smaller target is matched so no digits are lost to 1 − p.
 * Stops when a step changes x by less than 1e-15 of x (the functions are
 * good to about 1e-15, so the quantile to about 1e-13 relative).
 */
function invert(
  probability: number,
  start: number,
  tail: (x: number) => { lower: number; upper: number },
  density: (x: number) => number,
  lowerBound: number,
): number {
  const useUpper = probability > 0.5;
  const target = useUpper ? 1 - probability : probability;
  // residual > 0 means x is too large
  const residual = (x: number) => {
    const t = tail(x);
    return useUpper ? target - t.upper : t.lower - target;
  };
  let low = lowerBound;
  let high = Number.POSITIVE_INFINITY;
  let x = Number.isFinite(start) && start > lowerBound ? start : lowerBound + 1;
  for (let iteration = 0; iteration < 200; iteration++) {
    const r = residual(x);
    if (r === 0) return x;
    if (r > 0) high = x;
    else low = x;
    let next = x - r / density(x);
    if (!(next > low && next < high) || !Number.isFinite(next)) {
      next = Number.isFinite(high) ? (low + high) / 2 : 2 * Math.max(x, 1);
    }
    if (Math.abs(next - x) <= 1e-15 * Math.abs(x)) return next;
    x = next;
  }
  return x;
}

/**
 * Student's t quantile: the t with P(T ≤ t) = probability for `df` degrees of
 * freedom. P(T > t) = ½·I_{df/(df+t²)}(df/2, ½) for t ≥ 0; jStat's value
 * starts Newton steps on that tail (relative accuracy about 1e-13).
 */
export function studentTQuantile(probability: number, df: number): number {
  assertProbability(probability);
  assertDegreesOfFreedom(df, "degrees of freedom");
  if (probability === 0.5) return 0;
  if (probability < 0.5) return -studentTQuantile(1 - probability, df);
  const logNormaliser = -0.5 * Math.log(df) - logBeta(df / 2, 0.5);
  const tail = (t: number) => {
    const half = 0.5 * regularizedBeta(df / (df + t * t), df / 2, 0.5).lower;
    return { lower: 1 - half, upper: half };
  };
  const density = (t: number) => Math.exp(logNormaliser - ((df + 1) / 2) * Math.log1p((t * t) / df));
  return invert(probability, jStat.studentt.inv(probability, df), tail, density, 0);
}

/**
 * F quantile: the F with P(X ≤ F) = probability for (df1, df2) degrees of
 * freedom. P(X ≤ f) = I_{df1·f/(df1·f + df2)}(df1/2, df2/2); refined by Newton
 * steps from jStat's value (relative accuracy about 1e-13).
 */
export function fQuantile(probability: number, df1: number, df2: number): number {
  assertProbability(probability);
  assertDegreesOfFreedom(df1, "numerator degrees of freedom");
  assertDegreesOfFreedom(df2, "denominator degrees of freedom");
  const a = df1 / 2;
  const b = df2 / 2;
  const logNormaliser = a * Math.log(df1 / df2) - logBeta(a, b);
  const tail = (f: number) => regularizedBeta((df1 * f) / (df1 * f + df2), a, b);
  const density = (f: number) => Math.exp(logNormaliser + (a - 1) * Math.log(f) - (a + b) * Math.log1p((df1 * f) / df2));
  return invert(probability, jStat.centralF.inv(probability, df1, df2), tail, density, 0);
}

/**
 * Chi-square quantile: the x with P(X ≤ x) = probability for `df` degrees of
 * freedom. P(X ≤ x) = P(df/2, x/2), the regularized incomplete gamma function;
 * Newton steps from the Wilson–Hilferty approximation.
 */
export function chiSquareQuantile(probability: number, df: number): number {
  assertProbability(probability);
  assertDegreesOfFreedom(df, "degrees of freedom");
  const a = df / 2;
  const tail = (x: number) => regularizedGamma(a, x / 2);
  const density = (x: number) => Math.exp((a - 1) * Math.log(x) - x / 2 - a * Math.LN2 - logGamma(a));
  const z = normalQuantileApproximation(probability);
  const wilsonHilferty = df * (1 - 2 / (9 * df) + z * Math.sqrt(2 / (9 * df))) ** 3;
  return invert(probability, wilsonHilferty, tail, density, 0);
}

/** Starting value only: Acklam-style rational approximation is not needed; this is good to 4.5e-4 (A&S 26.2.23). */
function normalQuantileApproximation(probability: number): number {
  const q = probability < 0.5 ? probability : 1 - probability;
  const t = Math.sqrt(-2 * Math.log(q));
  const z = t - (2.515517 + 0.802853 * t + 0.010328 * t * t) / (1 + 1.432788 * t + 0.189269 * t * t + 0.001308 * t * t * t);
  return probability < 0.5 ? -z : z;
}
