import { describe, expect, it } from "vitest";
import { checkFreshReading } from "./fresh";

describe("fresh-property readings", () => {
  it("refuses a slump taller than the 300 mm cone (common practice)", () => {
    expect(checkFreshReading("slump", "320")).toEqual({ status: "refused", message: "Slump must be between 0 and 300 mm." });
    expect(checkFreshReading("slump", "-5")).toMatchObject({ status: "refused" });
  });

  it("keeps a reading outside the study's tolerance and marks it", () => {
    const check = checkFreshReading("slump", "105", { target: 75, tolerance: 25 });
    expect(check).toMatchObject({ status: "ok", value: 105, tolerance: { withinTolerance: false, lower: 50, upper: 100 } });
    expect(checkFreshReading("slump", "100", { target: 75, tolerance: 25 })).toMatchObject({ tolerance: { withinTolerance: true } });
    expect(checkFreshReading("air_content", "4.5", { target: 6, tolerance: 1.5 })).toMatchObject({ tolerance: { withinTolerance: true } });
  });

  it("warns about an unusual but possible reading, and reads blanks as empty", () => {
    expect(checkFreshReading("unit_weight", "1500")).toMatchObject({ status: "ok", warning: "Unusual unit weight; check the reading and its unit (kg/m³)." });
    expect(checkFreshReading("concrete_temperature", " ")).toEqual({ status: "empty" });
    expect(checkFreshReading("ambient_temperature", "warm")).toEqual({ status: "refused", message: "Enter a number." });
  });
});
