import { describe, expect, it } from "vitest";
import { parseResultsCsv } from "./csv";

describe("parseResultsCsv", () => {
  it("reads the long-form columns in any order, ignores others and numbers rows from the header", () => {
    const text = "value,replicate,note,lab,material,response\n12.5,1,ok,L01,M1,slump\n\n13,2,\"late, retested\",L01,M1,slump\n";
    const { rows, problems } = parseResultsCsv(text);
    expect(problems).toEqual([]);
    expect(rows).toEqual([
      { lab: "L01", material: "M1", response: "slump", replicate: 1, value: 12.5, row: 2 },
      { lab: "L01", material: "M1", response: "slump", replicate: 2, value: 13, row: 4 },
    ]);
  });

  it("accepts a byte-order mark, CRLF line ends, spaces and upper-case headers", () => {
    const { rows, problems } = parseResultsCsv("\uFEFFLab, Material ,Response,Replicate,Value\r\nL1, M1 ,air, 1 , 5.50 \r\n");
    expect(problems).toEqual([]);
    expect(rows).toEqual([{ lab: "L1", material: "M1", response: "air", replicate: 1, value: 5.5, row: 2 }]);
  });

  it("names every missing column and returns no rows", () => {
    const { rows, problems } = parseResultsCsv("lab,material,val\nL1,M1,3\n");
    expect(rows).toEqual([]);
    expect(problems.map((problem) => problem.code)).toEqual(["missing-column", "missing-column", "missing-column"]);
    expect(problems.map((problem) => problem.message).join(" ")).toMatch(/"response".*"replicate".*"value"/);
  });

  it("refuses a doubled column", () => {
    const { problems } = parseResultsCsv("lab,material,response,replicate,value,value\n");
    expect(problems).toMatchObject([{ code: "duplicate-column" }]);
  });

  it("reports an empty file and a file without results", () => {
    expect(parseResultsCsv("\n\n").problems).toMatchObject([{ code: "unreadable-csv" }]);
    expect(parseResultsCsv("lab,material,response,replicate,value\n").problems).toMatchObject([
      { code: "unreadable-csv", message: "the file has a header but no results" },
    ]);
  });

  it("reports rows with the wrong number of fields", () => {
    const { rows, problems } = parseResultsCsv("lab,material,response,replicate,value\nL1,M1,air,1\nL1,M1,air,2,3,4\n");
    expect(rows).toEqual([]);
    expect(problems).toMatchObject([
      { code: "malformed-row", row: 2 },
      { code: "malformed-row", row: 3 },
    ]);
  });

  it("reports broken quoting", () => {
    const { problems } = parseResultsCsv('lab,material,response,replicate,value\nL1,"M1,air,1,2\n');
    expect(problems.some((problem) => problem.code === "malformed-row")).toBe(true);
  });

  it("turns anything but a plain decimal into NaN for the analysis to report", () => {
    const text = "lab,material,response,replicate,value\n" + ["", "abc", "Infinity", "0x10", "1,5", "5.5e0"].map((v, i) => `L1,M1,air,${i + 1},"${v}"`).join("\n");
    const { rows } = parseResultsCsv(text);
    expect(rows.map((row) => row.value)).toEqual([Number.NaN, Number.NaN, Number.NaN, Number.NaN, Number.NaN, Number.NaN]);
    expect(parseResultsCsv("lab,material,response,replicate,value\nL1,M1,air,one,2\n").rows[0].replicate).toBeNaN();
  });
});
