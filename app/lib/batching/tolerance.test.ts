import { describe, expect, it } from "vitest";
import { checkAirContent, checkFreshProperties, checkSlump, slumpTolerance } from "./tolerance";

describe("slump tolerance (ASTM C94 table, from memory)", () => {
  it("inch column: ≤ 2 in ± 1/2 in, over 2 through 4 in ± 1 in, over 4 in ± 1 1/2 in", () => {
    expect(slumpTolerance(1, "in")).toBe(0.5);
    expect(slumpTolerance(2, "in")).toBe(0.5);
    expect(slumpTolerance(2.25, "in")).toBe(1);
    expect(slumpTolerance(4, "in")).toBe(1);
    expect(slumpTolerance(4.25, "in")).toBe(1.5);
    expect(slumpTolerance(8, "in")).toBe(1.5);
  });

  it("mm column: ≤ 50 mm ± 15 mm, over 50 through 100 mm ± 25 mm, over 100 mm ± 40 mm", () => {
    expect(slumpTolerance(50, "mm")).toBe(15);
    expect(slumpTolerance(55, "mm")).toBe(25);
    expect(slumpTolerance(100, "mm")).toBe(25);
    expect(slumpTolerance(105, "mm")).toBe(40);
  });

  it("refuses a negative specified slump", () => {
    expect(() => slumpTolerance(-1, "in")).toThrow(RangeError);
  });
});

describe("tolerance checks", () => {
  it("includes the limits and marks readings beyond them", () => {
    // 3 in specified → ± 1 in (C94, from memory): 2 to 4 in
    expect(checkSlump(3, 4, "in")).toEqual({
      target: 3,
      measured: 4,
      tolerance: 1,
      lower: 2,
      upper: 4,
      deviation: 1,
      withinTolerance: true,
    });
    expect(checkSlump(3, 4.25, "in").withinTolerance).toBe(false);
    expect(checkSlump(3, 1.75, "in").withinTolerance).toBe(false);
    // 40 mm specified → ± 15 mm (C94, from memory)
    expect(checkSlump(40, 55, "mm").withinTolerance).toBe(true);
    expect(checkSlump(40, 60, "mm").withinTolerance).toBe(false);
  });

  it("air content ± 1.5 percentage points (C94, from memory)", () => {
    expect(checkAirContent(6, 7.5).withinTolerance).toBe(true);
    expect(checkAirContent(6, 4.5).withinTolerance).toBe(true);
    expect(checkAirContent(6, 7.6).withinTolerance).toBe(false);
    expect(checkAirContent(6, 4.4).withinTolerance).toBe(false);
    // 7.7 − 6.2 is 1.5000000000000009 in binary; a reading on the limit stays in
    expect(checkAirContent(6.2, 7.7).withinTolerance).toBe(true);
  });

  it("keeps out-of-tolerance batches, marked, with a message", () => {
    // invented batch: slump 5.5 in against 3 in (± 1 in), air 6.5 % against 6 % (± 1.5)
    const checks = checkFreshProperties({
      slump: { target: 3, measured: 5.5, unit: "in" },
      airContent: { targetPercent: 6, measuredPercent: 6.5 },
    });
    expect(checks.map((c) => [c.property, c.withinTolerance, c.message])).toEqual([
      ["slump", false, "Slump 5.5 in is outside 3 ± 1 in"],
      ["air_content", true, "Air content 6.5 % is within 6 ± 1.5 %"],
    ]);
    expect(checks[0].measured).toBe(5.5);
  });

  it("checks only the properties given", () => {
    expect(checkFreshProperties({})).toEqual([]);
    expect(
      checkFreshProperties({ airContent: { targetPercent: 5, measuredPercent: 7 } }),
    ).toHaveLength(1);
  });
});
