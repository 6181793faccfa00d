import { describe, expect, it } from "vitest";
import { wetBatchMassKg } from "./batch";
import { mixingSequence, splitIntoMixes } from "./mixes";

describe("splitting a batch into mixes", () => {
  it("splits 150 L into three equal mixes for a 60 L mixer (hand-checked: ⌈150 / 60⌉ = 3, 150 / 3 = 50 L)", () => {
    const split = splitIntoMixes(0.15, 0.06);
    expect(split.mixes).toBe(3);
    expect(split.volumePerMixM3).toBeCloseTo(0.05, 12);
  });

  it("takes an exact fit as that many mixes, not one more (hand-checked: 150 L / 50 L = 3)", () => {
    expect(splitIntoMixes(0.15, 0.05).mixes).toBe(3);
    expect(splitIntoMixes(0.3, 0.1).mixes).toBe(3);
  });

  it("adds a mix for any overflow (hand-checked: 150.25 L / 50 L = 3.005 → 4 mixes of 37.5625 L)", () => {
    const split = splitIntoMixes(0.15025, 0.05);
    expect(split.mixes).toBe(4);
    expect(split.volumePerMixM3).toBeCloseTo(0.0375625, 12);
  });

  it("keeps a batch that fits, or has no mixer size, as one mix", () => {
    expect(splitIntoMixes(0.04, 0.06)).toEqual({ mixes: 1, volumePerMixM3: 0.04, fractionPerMix: 1 });
    expect(splitIntoMixes(0.15, null).mixes).toBe(1);
  });

  it("gives each mix its share of a corrected aggregate (batching.md check value 1019.80 kg / 3 = 339.93 kg)", () => {
    const split = splitIntoMixes(1, 0.4);
    expect(split.mixes).toBe(3);
    expect(wetBatchMassKg(1000, 3, 1) * split.fractionPerMix).toBeCloseTo(339.93, 2);
  });

  it("refuses a mixer of no size", () => {
    expect(() => splitIntoMixes(0.15, 0)).toThrow(RangeError);
    expect(() => splitIntoMixes(0, 0.05)).toThrow(RangeError);
  });
});

describe("mixing sequence", () => {
  it("charges coarse aggregate, part of the water and the admixture before the mixer turns (ASTM C192 order, from memory)", () => {
    const steps = mixingSequence(["cement", "scm", "water", "coarse_aggregate", "fine_aggregate", "admixture"]);
    expect(steps[1]).toBe("With the mixer stopped, add the coarse aggregate, about a third of the water and the admixture, in that water.");
    expect(steps[2]).toBe("Start the mixer; add the fine aggregate, the cement, the supplementary cementitious materials and the rest of the water.");
    expect(steps).toContain("Mix 3 minutes once everything is in, rest 3 minutes with the mixer covered, then mix 2 minutes more.");
  });

  it("names only what the mixture has, and puts fibers in with the aggregate", () => {
    const steps = mixingSequence(["cement", "water", "coarse_aggregate", "fine_aggregate", "fiber"]);
    expect(steps[1]).toBe("With the mixer stopped, add the coarse aggregate, the fibers and about a third of the water.");
    expect(steps.join(" ")).not.toMatch(/admixture|supplementary/);
  });
});
