import { describe, expect, it } from "vitest";
import { analyzeStudy } from "./analyze-study";
import { hCritical, kCritical } from "./consistency";
import { CLEAN_CELLS, type Cells, L03_WIDE, L05_HIGH, toRows } from "./planted-outliers.fixture";
import type { ComputedGroup, GroupResult, ResultRow, UncomputedGroup } from "./types";

function computed(group: GroupResult | undefined): ComputedGroup {
  expect(group?.status).toBe("computed");
  return group as ComputedGroup;
}

function uncomputed(group: GroupResult | undefined): UncomputedGroup {
  expect(group?.status).toBe("not-computed");
  return group as UncomputedGroup;
}

const BASE = CLEAN_CELLS;
const PLANTED_BETWEEN: Cells = { ...BASE, ...L05_HIGH };
// Invented: lab L06 planted about 5 units low (between-lab outlier on the other side).
const PLANTED_LOW: Cells = { ...BASE, L06: [95.1, 94.8, 95.3] };
// Invented: labs L02 and L07 planted together about 1.5 units high (a pair for the double Grubbs test).
const PLANTED_PAIR: Cells = { ...BASE, L02: [101.4, 101.7, 101.1], L07: [101.7, 102.0, 101.4] };
const PLANTED_WITHIN: Cells = { ...BASE, ...L03_WIDE };

function flagged(group: ComputedGroup) {
  return group.labs.filter((lab) => lab.flags.length > 0).map((lab) => ({ lab: lab.lab, flags: lab.flags }));
}

describe("planted outliers (invented data)", () => {
  it("the clean base flags no lab", () => {
    expect(flagged(computed(analyzeStudy(toRows(BASE)).groups[0]))).toEqual([]);
  });

  it("a planted between-lab outlier is flagged on h, for that lab only", () => {
    const group = computed(analyzeStudy(toRows(PLANTED_BETWEEN)).groups[0]);
    expect(flagged(group)).toEqual([{ lab: "L05", flags: ["h"] }]);
    expect(group.grubbs.high).toMatchObject({ lab: "L05", class: "outlier" });
    expect(group.grubbs.low.class).toBeNull();
    expect(group.cochran.class).toBeNull();
  });

  it("a planted low between-lab outlier is flagged on h, for that lab only", () => {
    const group = computed(analyzeStudy(toRows(PLANTED_LOW)).groups[0]);
    expect(flagged(group)).toEqual([{ lab: "L06", flags: ["h"] }]);
    expect(group.labs.find((lab) => lab.lab === "L06")?.h).toBeLessThan(-group.hCritical);
    expect(group.grubbs.low).toMatchObject({ lab: "L06", class: "outlier" });
    expect(group.grubbs.high.class).toBeNull();
  });

  it("a planted pair of high labs is caught by the double Grubbs test, high side only", () => {
    const group = computed(analyzeStudy(toRows(PLANTED_PAIR)).groups[0]);
    expect(group.grubbs.doubleHigh).toMatchObject({ labs: ["L07", "L02"], class: "outlier" });
    expect(group.grubbs.doubleLow?.class).toBeNull();
  });

  it("a planted within-lab outlier is flagged on k, for that lab only", () => {
    const group = computed(analyzeStudy(toRows(PLANTED_WITHIN)).groups[0]);
    expect(flagged(group)).toEqual([{ lab: "L03", flags: ["k"] }]);
    expect(group.cochran).toMatchObject({ lab: "L03", class: "outlier" });
    expect(group.grubbs.high.class).toBeNull();
    expect(group.grubbs.low.class).toBeNull();
  });

  it("reports the critical values for its p and n at the chosen level", () => {
    const group = computed(analyzeStudy(toRows(PLANTED_BETWEEN), { alpha: 0.05 }).groups[0]);
    expect(group.alpha).toBe(0.05);
    expect(group.hCritical).toBe(hCritical(8, 0.05));
    expect(group.kCritical).toBe(kCritical(8, 3, 0.05));
  });
});

describe("invariances (properties of the formulas)", () => {
  const transform = (cells: Cells, f: (x: number) => number): Cells =>
    Object.fromEntries(Object.entries(cells).map(([lab, values]) => [lab, values.map(f)]));

  for (const [name, data] of [["between", PLANTED_BETWEEN], ["within", PLANTED_WITHIN]] as const) {
    const original = computed(analyzeStudy(toRows(data)).groups[0]);

    it(`adding a constant leaves s_r, s_R, h and k unchanged (${name})`, () => {
      const shifted = computed(analyzeStudy(toRows(transform(data, (x) => x + 1234.5))).groups[0]);
      expect(shifted.sr).toBeCloseTo(original.sr, 10);
      expect(shifted.sR).toBeCloseTo(original.sR, 10);
      shifted.labs.forEach((lab, i) => {
        expect(lab.h).toBeCloseTo(original.labs[i].h as number, 9);
        expect(lab.k).toBeCloseTo(original.labs[i].k as number, 9);
        expect(lab.flags).toEqual(original.labs[i].flags);
      });
      expect(shifted.mean).toBeCloseTo(original.mean + 1234.5, 9);
    });

    it.each([-2.5, 1e4])(`multiplying by %d scales s_r and s_R by |c| (${name})`, (c) => {
      const scaled = computed(analyzeStudy(toRows(transform(data, (x) => c * x))).groups[0]);
      expect(scaled.sr / original.sr).toBeCloseTo(Math.abs(c), 10);
      expect(scaled.sR / original.sR).toBeCloseTo(Math.abs(c), 10);
      scaled.labs.forEach((lab, i) => {
        expect(lab.k).toBeCloseTo(original.labs[i].k as number, 9);
        expect(lab.h).toBeCloseTo(Math.sign(c) * (original.labs[i].h as number), 9);
      });
    });
  }
});

describe("excluded cells", () => {
  it("are removed before computing and reported back", () => {
    const reason = "transcription error confirmed by the lab";
    const analysis = analyzeStudy(toRows(PLANTED_BETWEEN), {
      excludedCells: [{ lab: "L05", material: "M1", response: "slump", reason }],
    });
    const withoutL05 = Object.fromEntries(Object.entries(PLANTED_BETWEEN).filter(([lab]) => lab !== "L05"));
    expect(analysis.excluded).toEqual([{ lab: "L05", material: "M1", response: "slump", reason, results: 3 }]);
    expect(analysis.groups).toEqual(analyzeStudy(toRows(withoutL05)).groups);
    expect(computed(analysis.groups[0]).p).toBe(7);
    expect(analysis.problems).toEqual([]);
  });

  it("an exclusion that matches nothing is a problem, not a silent no-op", () => {
    const analysis = analyzeStudy(toRows(BASE), {
      excludedCells: [{ lab: "L99", material: "M1", response: "slump", reason: "typo" }],
    });
    expect(analysis.excluded[0].results).toBe(0);
    expect(analysis.problems).toMatchObject([{ code: "excluded-cell-not-found", lab: "L99" }]);
    expect(computed(analysis.groups[0]).p).toBe(8);
  });

  it("excluding a damaged cell drops its problems and lets the group be computed", () => {
    const rows = toRows(BASE);
    rows[0] = { ...rows[0], value: Number.NaN };
    expect(analyzeStudy(rows).groups[0].status).toBe("not-computed");
    const analysis = analyzeStudy(rows, { excludedCells: [{ lab: "L01", material: "M1", response: "slump", reason: "lost specimen" }] });
    expect(analysis.problems).toEqual([]);
    expect(computed(analysis.groups[0]).p).toBe(7);
  });
});

describe("bad input never yields numbers silently", () => {
  const twoGroups = (): ResultRow[] => [...toRows(BASE, "M1"), ...toRows(BASE, "M2")];

  it("a non-finite value blocks its group with the row named; the other group is computed", () => {
    const rows = twoGroups().map((row, i) => ({ ...row, row: i + 2 }));
    rows[4] = { ...rows[4], value: Number.POSITIVE_INFINITY };
    const analysis = analyzeStudy(rows);
    const blocked = uncomputed(analysis.groups[0]);
    expect(blocked.reasons).toEqual([expect.stringMatching(/^row 6 \(lab L02.*not a finite number/)]);
    expect(blocked.labs.find((lab) => lab.lab === "L02")).toMatchObject({ n: 2, h: null, k: null });
    expect(analysis.problems).toMatchObject([{ code: "non-finite-value", row: 6, lab: "L02" }]);
    computed(analysis.groups[1]);
  });

  it("duplicate replicate numbers are reported with both places", () => {
    const rows = twoGroups();
    rows[2] = { ...rows[2], replicate: 1 };
    const analysis = analyzeStudy(rows);
    expect(analysis.problems).toMatchObject([{ code: "duplicate-replicate", lab: "L01" }]);
    expect(analysis.problems[0].message).toMatch(/^result 3 .*replicate 1 appears twice in this cell; first at result 1$/);
    uncomputed(analysis.groups[0]);
    computed(analysis.groups[1]);
  });

  it("a duplicate is found also when the rows come out of order", () => {
    const rows = toRows(BASE).reverse();
    rows.push({ ...rows[0] });
    expect(analyzeStudy(rows).problems).toMatchObject([{ code: "duplicate-replicate" }]);
  });

  it("a count response rejects negative and fractional values", () => {
    const rows = toRows({ A: [3, 4], B: [5, -1], C: [2.5, 2], D: [4, 4] }, "M1", "passes");
    const analysis = analyzeStudy(rows, { responseKinds: { passes: "count" } });
    expect(analysis.problems.map((problem) => problem.code)).toEqual(["count-negative", "count-not-whole"]);
    expect(uncomputed(analysis.groups[0]).kind).toBe("count");
    // The same values as a continuous response are fine.
    expect(computed(analyzeStudy(rows).groups[0]).kind).toBe("continuous");
  });

  it("a missing lab name and an invalid replicate number are reported", () => {
    const rows = toRows(BASE);
    rows[1] = { ...rows[1], lab: "" };
    rows[7] = { ...rows[7], replicate: 0 };
    const analysis = analyzeStudy(rows);
    expect(analysis.problems.map((problem) => problem.code)).toEqual(["missing-label", "invalid-replicate"]);
    expect(uncomputed(analysis.groups[0]).reasons).toHaveLength(2);
  });

  it("a row without material or response is reported and belongs to no group", () => {
    const rows = [...toRows(BASE), { lab: "L01", material: "", response: "slump", replicate: 4, value: 1 }];
    const analysis = analyzeStudy(rows);
    expect(analysis.problems).toMatchObject([{ code: "missing-label" }]);
    expect(analysis.groups).toHaveLength(1);
  });

  it("fewer than 3 labs: cell statistics and the reason, no precision statistics", () => {
    const analysis = analyzeStudy(toRows({ L01: [1, 2], L02: [2, 3] }));
    const group = uncomputed(analysis.groups[0]);
    expect(group.reasons).toEqual([expect.stringMatching(/at least 3 labs.*has 2/)]);
    expect(group.labs).toMatchObject([{ lab: "L01", n: 2, mean: 1.5 }, { lab: "L02", n: 2, mean: 2.5 }]);
    expect(group).not.toHaveProperty("sr");
    expect(analysis.problems).toMatchObject([{ code: "too-few-labs" }]);
  });

  it("a lab with a single result blocks its group until the cell is excluded", () => {
    const rows = toRows({ ...BASE, L09: [100.1] });
    const group = uncomputed(analyzeStudy(rows).groups[0]);
    expect(group.reasons).toEqual([expect.stringMatching(/lab L09 has 1 result/)]);
    expect(group.labs.find((lab) => lab.lab === "L09")?.sd).toBeNull();
    const excluded = analyzeStudy(rows, { excludedCells: [{ lab: "L09", material: "M1", response: "slump", reason: "one specimen" }] });
    expect(computed(excluded.groups[0]).p).toBe(8);
  });

  it("an unsupported significance level is refused", () => {
    expect(() => analyzeStudy(toRows(BASE), { alpha: 0.1 })).toThrow(RangeError);
  });
});

describe("degenerate but valid data", () => {
  it("no spread in any cell: k undefined and said so", () => {
    const group = computed(
      analyzeStudy(toRows({ A: [3, 3], B: [4, 4], C: [5, 5] }, "M1", "passes"), { responseKinds: { passes: "count" } }).groups[0],
    );
    expect(group.sr).toBe(0);
    expect(group.labs.every((lab) => lab.k === null && lab.h !== null)).toBe(true);
    expect(group.cochran).toMatchObject({ C: null, class: null, lab: null });
    expect(group.notes.join(" ")).toMatch(/k is undefined/);
  });

  it("level 0: no coefficients of variation", () => {
    const group = computed(analyzeStudy(toRows({ A: [-1, 1], B: [-2, 2], C: [0.5, -0.5] })).groups[0]);
    expect(group.mean).toBe(0);
    expect(group).toMatchObject({ cvr: null, cvR: null, oneSrPercent: null, d2sRPercent: null });
  });
});

describe("output", () => {
  it("one group per (material, response) in order of first appearance, with the C670 forms", () => {
    const rows = [...toRows(BASE, "M2", "air"), ...toRows(BASE, "M1", "slump"), ...toRows(BASE, "M2", "slump")];
    const analysis = analyzeStudy(rows);
    expect(analysis.groups.map((group) => `${group.material}/${group.response}`)).toEqual(["M2/air", "M1/slump", "M2/slump"]);
    const group = computed(analysis.groups[0]);
    expect(group.d2sr).toBeCloseTo(2 * Math.SQRT2 * group.sr, 14);
    expect(group.oneSR).toBe(group.sR);
    expect(group.cvR).toBeCloseTo((100 * group.sR) / group.mean, 12);
    expect(group.r).toBeCloseTo(2.8 * group.sr, 14);
  });

  it("a level fit per response over its computed materials", () => {
    // Invented: three materials whose spreads grow with the level.
    const rows = [100, 200, 400].flatMap((level, m) =>
      toRows(
        Object.fromEntries(Object.entries(BASE).map(([lab, values]) => [lab, values.map((x) => level + (x - 100) * (m + 1))])),
        `M${m + 1}`,
        "strength",
      ),
    );
    const [fit] = analyzeStudy(rows).levelFits;
    expect(fit.response).toBe("strength");
    expect(fit.sr.points.map((point) => point.material)).toEqual(["M1", "M2", "M3"]);
    expect(fit.sr.chosen).not.toBeNull();
    expect(fit.sR.candidates).toHaveLength(3);
  });
});

describe("screening order and findings (ISO 5725-2 §7.3)", () => {
  // The double test used to run on the high side as well, and flag L05's neighbour with it.
  it("a lab found by the single Grubbs test is not tested again as part of a pair", () => {
    const group = computed(analyzeStudy(toRows(PLANTED_BETWEEN)).groups[0]);
    expect(group.grubbs.doubleHigh).toBeNull();
    expect(group.screening.find((step) => step.test === "grubbs-double" && step.side === "high")?.outcome).toBe("not-run");
    expect(group.labs.filter((lab) => lab.findings.length > 0).map((lab) => lab.lab)).toEqual(["L05"]);
  });

  it("every finding carries its statistic, its critical values and its test, checkable by hand", () => {
    const group = computed(analyzeStudy(toRows(PLANTED_BETWEEN)).groups[0]);
    const l05 = group.labs.find((lab) => lab.lab === "L05")!;
    expect(l05.findings.map((finding) => finding.test)).toEqual(["h", "grubbs-single"]);
    const [h, grubbs] = l05.findings;
    expect(h).toMatchObject({ side: "high", statistic: l05.h, critical: group.hCritical });
    expect(h.text).toContain(`±${group.hCritical.toFixed(2)}`);
    expect(grubbs).toMatchObject({ side: "high", statistic: group.grubbs.high.G, critical5: group.grubbs.high.critical5, critical1: group.grubbs.high.critical1, class: "outlier" });
    expect(grubbs.text).toMatch(/^Grubbs' single test \(high side\): G = \d\.\d{3}, above the 1 % critical value 2\.274/);
  });

  it("the pair of the double test gets a finding on both labs, each naming the other", () => {
    const group = computed(analyzeStudy(toRows(PLANTED_PAIR)).groups[0]);
    const findings = group.labs.flatMap((lab) => lab.findings.filter((f) => f.test === "grubbs-double").map((f) => `${lab.lab}+${f.partner}`));
    expect(findings.sort()).toEqual(["L02+L07", "L07+L02"]);
  });
});

describe("confidence intervals of the precision figures", () => {
  it("s_r by chi-square with p(n − 1) df, s_R by Satterthwaite, with ISO 5725-1's A_r and A_R", () => {
    const group = computed(analyzeStudy(toRows(PLANTED_BETWEEN)).groups[0]);
    const { uncertainty } = group;
    expect(uncertainty.sr.df).toBe(16);
    expect(uncertainty.sr.lower).toBeLessThan(group.sr);
    expect(uncertainty.sr.upper).toBeGreaterThan(group.sr);
    expect(uncertainty.sR.method).toMatch(/Satterthwaite/);
    expect(uncertainty.sR.df).toBeGreaterThan(1);
    expect(uncertainty.sR.df).toBeLessThan(23);
    expect(uncertainty.Ar).toBeCloseTo(1.96 * Math.sqrt(1 / 32), 14);
    expect(uncertainty.gamma).toBeCloseTo(group.sR / group.sr, 12);
  });
});

describe("numerical range", () => {
  it("a large common offset (1e9 + small differences) keeps its digits through a working origin", () => {
    const offset = 1e9;
    const shifted = computed(analyzeStudy(toRows(Object.fromEntries(Object.entries(PLANTED_WITHIN).map(([lab, v]) => [lab, v.map((x) => x - 100 + offset)])))).groups[0]);
    const original = computed(analyzeStudy(toRows(PLANTED_WITHIN)).groups[0]);
    expect(shifted.sr).toBeCloseTo(original.sr, 6);
    shifted.labs.forEach((lab, i) => {
      expect(lab.mean - offset).toBeCloseTo(original.labs[i].mean - 100, 6);
      expect(lab.h).toBeCloseTo(original.labs[i].h as number, 6);
    });
  });

  it("tiny values are computed, not reported as having no spread", () => {
    const tiny = computed(analyzeStudy(toRows(Object.fromEntries(Object.entries(PLANTED_WITHIN).map(([lab, v]) => [lab, v.map((x) => x * 1e-200)])))).groups[0]);
    const original = computed(analyzeStudy(toRows(PLANTED_WITHIN)).groups[0]);
    expect(tiny.notes.join(" ")).not.toMatch(/no cell shows any spread/);
    expect(tiny.sr / 1e-200).toBeCloseTo(original.sr, 8);
    expect(tiny.labs.map((lab) => lab.flags)).toEqual(original.labs.map((lab) => lab.flags));
  });

  it("values whose squares would overflow are refused with the row named", () => {
    const rows = toRows({ A: [1e200, 2e200], B: [1e200, 3e200], C: [2e200, 2e200] }).map((row, i) => ({ ...row, row: i + 2 }));
    const analysis = analyzeStudy(rows);
    expect(analysis.groups[0].status).toBe("not-computed");
    expect(analysis.problems[0]).toMatchObject({ code: "value-out-of-range", row: 2 });
    expect(analysis.problems[0].message).toMatch(/^row 2 .*square would overflow/);
  });
});
