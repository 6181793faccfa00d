import { describe, expect, it } from "vitest";
import { grubbsDoubleCritical } from "./grubbs-double-critical";
import precomputed from "./grubbs-double-table.json";
import { ISO_5725_TABLES } from "../../../tests/fixtures/reference-tables";

// ISO 5725-2 Table 5 as typed in reference/critical-values.md (copied to tests/fixtures/iso-5725-tables.json).
const ISO_TABLE_5 = ISO_5725_TABLES.doubleGrubbs;

describe("grubbsDoubleCritical", () => {
  // The old 100 000-sample simulation missed the table by up to 0.003
  // (p = 20, 1 %: 0.3558 against 0.3585); the values must now match within ±0.0015.
  it.each(ISO_TABLE_5)("p = %i matches the published ISO 5725-2 table within ±0.0015", (p, at1, at5) => {
    const critical = grubbsDoubleCritical(p);
    expect(critical?.source).toBe("published");
    expect(Math.abs((critical?.critical1 ?? Number.NaN) - at1)).toBeLessThanOrEqual(0.0015);
    expect(Math.abs((critical?.critical5 ?? Number.NaN) - at5)).toBeLessThanOrEqual(0.0015);
  });

  it("beyond p = 20 uses the kept precomputation, precise to the fourth decimal", () => {
    expect(precomputed.rows.map((row) => row.p)).toEqual(Array.from({ length: 20 }, (_, i) => 21 + i));
    for (const row of precomputed.rows) {
      expect(row.standardError1).toBeLessThanOrEqual(1e-4);
      expect(row.standardError5).toBeLessThanOrEqual(1e-4);
      expect(grubbsDoubleCritical(row.p)).toEqual({ critical1: row.critical1, critical5: row.critical5, source: "precomputed" });
    }
  });

  it("rises with p without a step where the published table hands over to the precomputation", () => {
    let previous = grubbsDoubleCritical(4)!;
    for (let p = 5; p <= 40; p++) {
      const critical = grubbsDoubleCritical(p)!;
      expect(critical.critical1).toBeGreaterThan(previous.critical1);
      expect(critical.critical5).toBeGreaterThan(previous.critical5);
      previous = critical;
    }
    // the step from 20 to 21 is about the size of the steps around it (0.0187 from 19 to 20)
    const step = grubbsDoubleCritical(21)!.critical1 - grubbsDoubleCritical(20)!.critical1;
    expect(step).toBeGreaterThan(0.015);
    expect(step).toBeLessThan(0.019);
  });

  it("the 1 % value lies below the 5 % value", () => {
    const critical = grubbsDoubleCritical(15);
    expect(critical?.critical1).toBeLessThan(critical?.critical5 ?? 0);
  });

  it("is only given for 4 to 40 labs", () => {
    expect(grubbsDoubleCritical(3)).toBeNull();
    expect(grubbsDoubleCritical(41)).toBeNull();
  });
});
