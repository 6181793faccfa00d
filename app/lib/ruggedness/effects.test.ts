import { describe, expect, it } from "vitest";
import { seededUniform } from "~/lib/precision/seeded-uniform";
import { plackettBurmanDesign, type Level } from "./designs";
import { columnEffects, runAverages } from "./effects";

describe("columnEffects", () => {
  it("reproduces a published worked example of an 8-run two-level design", () => {
    // Montgomery, Design and Analysis of Experiments, 8th ed. (Wiley 2012), solution of problem 8.1:
    // the 2^(4−1) fraction with I = ABCD of the chemical process experiment, runs (1), ad, bd, ab, cd,
    // ac, bc, abcd with yields 90, 72, 87, 83, 99, 81, 88, 80. Its seven columns A, B, C, D = ABC,
    // AB, AC, AD form an 8-run orthogonal two-level design, like the 8-run Plackett–Burman design.
    // Published effects: A −12, B −1, C 4, D −1, AB 6, AC −1, AD −5.
    const abc: Level[][] = [
      [-1, -1, -1],
      [1, -1, -1],
      [-1, 1, -1],
      [1, 1, -1],
      [-1, -1, 1],
      [1, -1, 1],
      [-1, 1, 1],
      [1, 1, 1],
    ];
    const design = abc.map(([a, b, c]) => {
      const d = a! * b! * c!; // D = ABC
      return [a!, b!, c!, d, a! * b!, a! * c!, a! * d] as Level[];
    });
    const yields = [90, 72, 87, 83, 99, 81, 88, 80];
    expect(columnEffects(design, yields)).toEqual([-12, -1, 4, -1, 6, -1, -5]);
  });

  it.each([8, 12] as const)("%i runs: each effect is twice the least-squares coefficient of its column (independent fit)", (runs) => {
    const design = plackettBurmanDesign(runs);
    const uniform = seededUniform(runs * 101);
    const y = design.map(() => 10 + 20 * uniform());
    const effects = columnEffects(design, y);
    const coefficients = leastSquares(design.map((row) => [1, ...row]), y);
    effects.forEach((effect, i) => expect(effect).toBeCloseTo(2 * coefficients[i + 1]!, 10));
  });

  it("refuses a mismatch between runs and averages", () => {
    expect(() => columnEffects(plackettBurmanDesign(8), [1, 2, 3])).toThrow(RangeError);
  });
});

describe("runAverages", () => {
  it("averages the replicates of each run", () => {
    expect(runAverages([[4, 6], [7], [1, 2]])).toEqual([5, 7, 1.5]);
    expect(() => runAverages([[]])).toThrow(RangeError);
  });
});

/** Ordinary least squares by the normal equations XᵀX b = Xᵀy, solved by Gaussian elimination with partial pivoting. */
function leastSquares(x: number[][], y: number[]): number[] {
  const p = x[0]!.length;
  const a = Array.from({ length: p }, (_, i) => [
    ...Array.from({ length: p }, (_, j) => x.reduce((sum, row) => sum + row[i]! * row[j]!, 0)),
    x.reduce((sum, row, k) => sum + row[i]! * y[k]!, 0),
  ]);
  for (let col = 0; col < p; col++) {
    const pivot = a.slice(col).reduce((best, row, k) => (Math.abs(row[col]!) > Math.abs(a[best]![col]!) ? col + k : best), col);
    [a[col], a[pivot]] = [a[pivot]!, a[col]!];
    for (let row = 0; row < p; row++) {
      if (row === col) continue;
      const factor = a[row]![col]! / a[col]![col]!;
      for (let k = col; k <= p; k++) a[row]![k]! -= factor * a[col]![k]!;
    }
  }
  return a.map((row, i) => row[p]! / row[i]!);
}
