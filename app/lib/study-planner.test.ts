import { describe, expect, it } from "vitest";
import { repeatabilityUncertainty, reproducibilityUncertainty } from "~/lib/precision";
import { designCost, gammaFromEarlierStudy, planStudy } from "./study-planner";

describe("planStudy", () => {
  it("tabulates ISO 5725-1's A_r and A_R for labs × replicates at the guessed γ", () => {
    const plan = planStudy({ gamma: 2 });
    const ten = plan.table.find((c) => c.labs === 10 && c.replicates === 3)!;
    // reference/critical-values.md check values: A_r(10, 3) = 0.310, A_R(10, 3, γ = 2) = 0.388
    expect(ten.Ar).toBeCloseTo(0.31, 3);
    expect(ten.AR).toBeCloseTo(0.388, 3);
    expect(plan.table.find((c) => c.labs === 3)?.meetsMinimums).toBe(false);
  });

  it("finds the smallest design meeting ±30 % on σ_R with γ = 2 and checks it is the smallest", () => {
    const { smallest } = planStudy({ gamma: 2, targetAR: 0.3 });
    expect(smallest).not.toBeNull();
    const size = smallest!.labs * smallest!.replicates;
    expect(reproducibilityUncertainty(smallest!.labs, smallest!.replicates, 2)).toBeLessThanOrEqual(0.3);
    // by exhaustive check: nothing with fewer results per material meets the target
    for (let p = 6; p <= 100; p++) for (let n = 2; n <= 10; n++) if (p * n < size) expect(reproducibilityUncertainty(p, n, 2)).toBeGreaterThan(0.3);
    expect(smallest).toMatchObject({ labs: 18, replicates: 2 });
  });

  it("as γ grows only labs help: A_R tends to 1.96·√(1/(2(p − 1))), so ±30 % needs p − 1 ≥ (1.96/0.3)²/2 = 21.3", () => {
    expect(planStudy({ gamma: 100, targetAR: 0.3 }).smallest).toMatchObject({ labs: 23, replicates: 2 });
    expect(repeatabilityUncertainty(6, 2)).toBeGreaterThan(0.5);
  });

  it("states the practices' minimums", () => {
    expect(planStudy().minimums.join(" ")).toMatch(/at least 6 labs \(ISO 5725-1 recommends at least 8\)/);
  });
});

describe("designCost", () => {
  const material = {
    code: "M1",
    constituents: [
      { kind: "cement" as const, name: "Cement", ssdMassKgPerM3: 300, relativeDensity: 3.15 },
      { kind: "water" as const, name: "Water", ssdMassKgPerM3: 150, relativeDensity: 1 },
      { kind: "admixture" as const, name: "WR", dosagePer100kgCementitious: 300 },
      { kind: "fiber" as const, name: "PP fiber", volumeFractionPercent: 0.5, fiberDensity: 910 },
    ],
  };

  it("concrete per lab = materials × replicates × specimen volume × (1 + waste)", () => {
    const cost = designCost({ labs: 8, replicates: 3, materials: 4 });
    // by hand: 4 × 3 × 0.0425 m³ × 1.10 = 0.561 m³
    expect(cost.volumePerLabM3).toBeCloseTo(0.561, 12);
    expect(cost.volumeText).toBe("4 materials × 3 replicates × 0.0425 m³ × 1.10 = 0.561 m³ per lab");
  });

  it("constituent masses per lab and in total", () => {
    const cost = designCost({ labs: 10, replicates: 2, materials: [material, { ...material, code: "M2" }] });
    const perMaterialM3 = 2 * 0.0425 * 1.1; // 0.0935 m³
    expect(cost.perLab.find((c) => c.name === "Cement")).toMatchObject({ amount: Number((2 * 300 * perMaterialM3).toFixed(2)), unit: "kg" });
    expect(cost.total.find((c) => c.name === "Cement")?.amount).toBeCloseTo(10 * 2 * 300 * perMaterialM3, 1);
    expect(cost.perLab.find((c) => c.name === "PP fiber")?.amount).toBeCloseTo(2 * 0.005 * 910 * perMaterialM3, 2);
    // admixture: 300 mL per 100 kg of cementitious
    expect(cost.perLab.find((c) => c.name === "WR")).toMatchObject({ unit: "mL", amount: expect.closeTo(2 * 3 * 300 * perMaterialM3, 1) });
  });
});

describe("gammaFromEarlierStudy", () => {
  it("takes the median s_R/s_r of the computed groups, never below 1", () => {
    expect(gammaFromEarlierStudy([{ status: "computed", sr: 1, sR: 2 }, { status: "computed", sr: 1, sR: 3 }, { status: "computed", sr: 1, sR: 1.5 }, { status: "not-computed" }])).toBe(2);
    expect(gammaFromEarlierStudy([{ status: "computed", sr: 0, sR: 1 }])).toBeNull();
  });
});
