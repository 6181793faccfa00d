import { describe, expect, it } from "vitest";
import { checkResultValue, checkTestDate, parsePlainNumber } from "./values";

const passes = { name: "Passes to close the preformed holes", unit: "passes", kind: "count" as const, decimals: 0, plausibleMin: 1, plausibleMax: 40 };
const slumpLike = { name: "Spread", unit: "mm", kind: "continuous" as const, decimals: 0, plausibleMin: null, plausibleMax: null };

describe("result values", () => {
  it("reads plain decimals only", () => {
    expect(parsePlainNumber(" 12 ")).toBe(12);
    expect(parsePlainNumber("4.5")).toBe(4.5);
    for (const text of ["0x10", "Infinity", "1,000", "1e3", "", "twelve"]) expect(parsePlainNumber(text)).toBeNull();
  });

  it("refuses counts that are not whole numbers of at least 0", () => {
    expect(checkResultValue(passes, "12")).toEqual({ status: "ok", value: 12 });
    expect(checkResultValue(passes, "0")).toMatchObject({ status: "ok", value: 0 });
    expect(checkResultValue(passes, "2.5")).toEqual({ status: "refused", message: "A count is a whole number, such as 12." });
    expect(checkResultValue(passes, "-1")).toEqual({ status: "refused", message: "A count cannot be negative." });
    expect(checkResultValue(passes, "abc")).toEqual({ status: "refused", message: "Enter a number, such as 12 or 4.5." });
    expect(checkResultValue(passes, "  ")).toEqual({ status: "empty" });
  });

  it("keeps a value outside the plausible range with a warning", () => {
    const check = checkResultValue(passes, "55");
    expect(check).toMatchObject({ status: "ok", value: 55 });
    expect(check.status === "ok" && check.warning).toBe("Unusual: outside the plausible 1 to 40 passes. Check it; submitting asks you to confirm it.");
    expect(checkResultValue(passes, "0")).toMatchObject({ warning: expect.stringContaining("outside the plausible") });
  });

  it("takes decimals for a continuous response, warning past its reporting precision", () => {
    expect(checkResultValue(slumpLike, "-3.5")).toEqual({ status: "ok", value: -3.5, warning: "The study reports spread to 0 decimal places." });
    expect(checkResultValue({ ...slumpLike, decimals: 1 }, "410.5")).toEqual({ status: "ok", value: 410.5 });
  });

  it("checks test dates against the calendar and today", () => {
    const today = new Date("2026-10-20T12:00:00Z");
    expect(checkTestDate("2026-10-14", today)).toEqual({ ok: true, value: "2026-10-14" });
    expect(checkTestDate("", today)).toEqual({ ok: true, value: null });
    expect(checkTestDate("2026-02-30", today)).toEqual({ ok: false, message: "Enter the test date as YYYY-MM-DD." });
    expect(checkTestDate("14/10/2026", today)).toEqual({ ok: false, message: "Enter the test date as YYYY-MM-DD." });
    expect(checkTestDate("2026-10-23", today)).toEqual({ ok: false, message: "The test date is in the future." });
  });
});
