import { describe, expect, it } from "vitest";
import { analyzeStudy, formatSignificant, type ComputedGroup, type ResultRow } from "~/lib/precision";
import { c670Text, e691Text, ROUNDING_RULE, responseForm, type StatementSnapshot } from "./statement-text";

// Planted data (invented): 4 labs, 2 materials, 2 replicates; L4 on B is left out.
const VALUES: Record<string, Record<string, number[]>> = {
  A: { L1: [10, 11], L2: [12, 12], L3: [9, 10], L4: [11, 13] },
  B: { L1: [20, 22], L2: [23, 24], L3: [19, 21], L4: [30, 31] },
};
const rows: ResultRow[] = Object.entries(VALUES).flatMap(([material, labs]) =>
  Object.entries(labs).flatMap(([lab, values]) => values.map((value, i) => ({ lab, material, response: "holes", replicate: i + 1, value }))),
);
const analysis = analyzeStudy(rows, { excludedCells: [{ lab: "L4", material: "B", response: "holes", reason: "batch water doubled by mistake" }] });
const snapshot: StatementSnapshot = {
  study: { code: "T-1", title: "Test", testMethod: "Float finishing test" },
  dataVersion: 3,
  frozenAt: "2026-01-01T00:00:00.000Z",
  labs: 4,
  replicates: 2,
  materials: [
    { code: "A", description: "" },
    { code: "B", description: "" },
  ],
  responses: [{ key: "holes", name: "Passes to close the holes", unit: "passes", decimals: 0 }],
  analysis,
};
const a = analysis.groups.find((g) => g.material === "A") as ComputedGroup;

describe("E691 form", () => {
  const text = e691Text(snapshot);
  it("states the design and the excluded cell", () => {
    expect(text).toContain("4 laboratories");
    expect(text).toContain("2 materials (A, B)");
    expect(text).toContain("2 replicate results");
    expect(text).toContain("lab L4, material B, holes: batch water doubled by mistake");
  });
  // Figures follow one stated rounding rule, three significant digits (ASTM E691: two or three);
  // this test used to expect the response's decimals + 2 for s and + 1 for r and R.
  it("reports the engine's s_r, s_R, r and R of each material to three significant digits", () => {
    const sig = (x: number) => formatSignificant(x, 3);
    expect(text).toContain(`A, average ${a.mean.toFixed(1)} passes: s_r = ${sig(a.sr)}, s_R = ${sig(a.sR)}, r = ${sig(a.r)}, R = ${sig(a.R)}`);
    expect(text).toContain(ROUNDING_RULE);
    expect(ROUNDING_RULE).toMatch(/3 significant digits \(ASTM E691 asks for two or three\)/);
    // ASTM E691: r = 2.8 s_r.
    expect(a.r / a.sr).toBeCloseTo(2.8, 10);
  });
  it("gives the 95 % confidence intervals and ISO 5725-1's ±A_r, ±A_R", () => {
    const u = a.uncertainty;
    expect(text).toContain(`σ_r ${formatSignificant(u.sr.lower, 3)} to ${formatSignificant(u.sr.upper, 3)} passes (chi-square, 4 degrees of freedom)`);
    expect(text).toMatch(/σ_R .* \(Satterthwaite, \d+\.\d effective degrees of freedom\)/);
    expect(text).toContain(`s_r ± ${(100 * u.Ar).toFixed(0)} %`);
  });
  it("states where the design falls short of the practices' minimums", () => {
    expect(text).toContain("Limitations of the study design:");
    expect(text).toMatch(/fewer than 6 labs/);
    expect(text).toMatch(/2 materials; ASTM E691 asks for at least 3/);
  });
});

describe("C670 form", () => {
  const text = c670Text(snapshot);
  it("gives 1s and d2s with d2s = 2√2 · 1s", () => {
    // ASTM C670: d2s = 2·√2·s, about 2.83 s.
    expect(a.d2sr / a.oneSr).toBeCloseTo(2 * Math.SQRT2, 10);
    expect(text).toMatch(/Single-operator precision/);
    expect(text).toMatch(/Multilaboratory precision/);
    expect(text).toContain("left out of the analysis");
  });
  // One form per response for both precisions, by one stated rule (this test used to
  // check a per-precision choice, which could give s_r in percent and s_R in passes).
  it("gives both precisions of a response in one form, chosen by one stated rule", () => {
    const form = responseForm(analysis, "holes");
    const section = text.slice(text.indexOf("Passes to close the holes"));
    if (form.form === "percent") {
      expect(section.match(/1s % =/g)).toHaveLength(4);
      expect(section).not.toMatch(/1s = /);
    } else {
      expect(section.match(/1s = /g)).toHaveLength(4);
      expect(section).not.toMatch(/1s % =/);
    }
    expect(section).toContain(form.reason);
    expect(text).toMatch(/in percent \(1s %, d2s %\) when the coefficient of variation is steadier/);
  });
  it("uses the percent form when s grows with the level, for single-operator and multilaboratory alike", () => {
    const grows = analyzeStudy(
      ["A", "B"].flatMap((material, m) =>
        ["L1", "L2", "L3", "L4", "L5", "L6"].flatMap((lab, i) =>
          [0, 1].map((replicate) => ({ lab, material, response: "holes", replicate: replicate + 1, value: (m + 1) * (10 + (i % 3) + replicate * ((i % 2) + 1)) })),
        ),
      ),
    );
    const percentText = c670Text({ ...snapshot, analysis: grows });
    expect(responseForm(grows, "holes").form).toBe("percent");
    expect(percentText.match(/1s % =/g)).toHaveLength(4);
    expect(percentText).toMatch(/Single-operator precision: the single-operator coefficient of variation/);
    expect(percentText).toMatch(/Multilaboratory precision: the multilaboratory coefficient of variation/);
  });
  it("says when nothing was excluded", () => {
    expect(c670Text({ ...snapshot, analysis: analyzeStudy(rows) })).toContain("Every submitted cell was used");
  });
});
