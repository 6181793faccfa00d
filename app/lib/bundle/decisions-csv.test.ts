import { describe, expect, it } from "vitest";
import { decisionsCsv, parseDecisionsCsv } from "./decisions-csv";

describe("decisions CSV", () => {
  it("writes RFC 4180 CSV and reads back the excluded cells", () => {
    const text = decisionsCsv([
      { lab: "L03", material: "M2", response: "holes", decision: "excluded", reason: 'Specimen floated late, "by mistake", lab confirmed' },
      { lab: "L05", material: "M1", response: "surface", decision: "retained", reason: "Lab confirmed the counts" },
    ]);
    expect(text.split("\n")[0]).toBe("lab,material,response,decision,reason");
    expect(text).toContain('"Specimen floated late, ""by mistake"", lab confirmed"');
    expect(parseDecisionsCsv(text)).toEqual({
      excludedCells: [{ lab: "L03", material: "M2", response: "holes", reason: 'Specimen floated late, "by mistake", lab confirmed' }],
      problems: [],
    });
  });

  it("names the row of a bad decision and a missing reason", () => {
    const { problems } = parseDecisionsCsv("lab,material,response,decision,reason\nL01,M1,holes,dropped,x\nL02,M1,holes,excluded,\n");
    expect(problems).toEqual(['row 2: decision must be "excluded" or "retained", got "dropped"', "row 3: every decision needs its reason"]);
  });

  it("names missing columns", () => {
    expect(parseDecisionsCsv("lab,material,response\n").problems[0]).toContain('"decision", "reason"');
  });
});
