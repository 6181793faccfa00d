/**
 * The results and analysis downloads (CSV and .xlsx) from the results,
 * analysis and review pages: status, type, file name, the columns each role
 * gets, and what comes back when the workbook is read with exceljs.
 */
import { eq } from "drizzle-orm";
import ExcelJS from "exceljs";
import Papa from "papaparse";
import { beforeAll, describe, expect, it } from "vitest";
import { db } from "~/db/client.server";
import { amendments, results, users } from "~/db/schema";
import { findCellId, saveCellDecision } from "~/models/decisions.server";
import * as analysisCsv from "~/routes/api/v1/study-analysis-csv";
import * as analysisXlsx from "~/routes/api/v1/study-analysis-xlsx";
import * as precision from "~/routes/api/v1/study-precision";
import * as resultsJson from "~/routes/api/v1/study-results";
import * as resultsCsv from "~/routes/api/v1/study-results-csv";
import * as resultsXlsx from "~/routes/api/v1/study-results-xlsx";
import { DEMO_LABS } from "../../seed/demo-data";
import { demoCookie, demoStudy, useDemoDatabase } from "../support/demo";
import { call, get, type RouteOutcome } from "../support/routes";

const XLSX_TYPE = "application/vnd.openxmlformats-officedocument.spreadsheetml.sheet";

let studyId: number;
const params = () => ({ studyId: String(studyId) });
const path = (file: string, query = "") => `/api/v1/studies/${studyId}/${file}${query}`;

async function download(loader: Parameters<typeof call>[0], file: string, email: string, query = "") {
  return call(loader, get(path(file, query), await demoCookie(email)), params());
}

const csvRows = (outcome: RouteOutcome) => Papa.parse<string[]>(new TextDecoder().decode(outcome.bytes), { skipEmptyLines: true }).data;

async function workbook(outcome: RouteOutcome) {
  const book = new ExcelJS.Workbook();
  await book.xlsx.load(outcome.bytes!.buffer as ArrayBuffer);
  return book;
}

/** A sheet's rows as arrays of cell values (exceljs numbers its columns from 1). */
const sheetRows = (sheet: ExcelJS.Worksheet) => {
  const rows: unknown[][] = [];
  sheet.eachRow((row) => rows.push((row.values as unknown[]).slice(1)));
  return rows;
};

/** One cell of the study by lab code, material and response. */
const cellOf = async (lab: string, material: string, response: string) => (await findCellId(studyId, { lab, material, response }))!;

/** A download's status, type and file name. */
function expectDownload(outcome: RouteOutcome, contentType: string, fileName: string) {
  expect(outcome.status).toBe(200);
  expect(outcome.headers.get("Content-Type")).toBe(contentType);
  expect(outcome.headers.get("Content-Disposition")).toBe(`attachment; filename="${fileName}"`);
}

beforeAll(async () => {
  await useDemoDatabase();
  const study = await demoStudy("FF-2026-A");
  studyId = study.id;
  const coordinator = (await db.query.users.findFirst({ where: eq(users.email, "coordinator@ringbatch.example") }))!;
  await saveCellDecision(study, coordinator.id, { lab: "L01", material: "M3", response: "holes", decision: "excluded", reason: "Operator error recorded on the data sheet." });
  const amendedCell = await cellOf("L02", "M1", "holes");
  await db.insert(amendments).values([
    { cellId: amendedCell, replicate: 1, oldValue: 4, newValue: 5, reason: "Transcription slip on the data sheet.", byUserId: coordinator.id },
    { cellId: amendedCell, replicate: 2, oldValue: 6, newValue: 5, reason: "Transcription slip on the data sheet.", byUserId: coordinator.id },
  ]);
});

describe("results download", () => {
  it("gives the coordinator every replicate with lab names, cell status, amendments and decisions, as .xlsx", async () => {
    const outcome = await download(resultsXlsx.loader, "results.xlsx", "coordinator@ringbatch.example");
    expectDownload(outcome, XLSX_TYPE, "FF-2026-A-results.xlsx");
    const sheet = (await workbook(outcome)).getWorksheet("Results")!;
    const [header, ...rows] = sheetRows(sheet);
    expect(header).toEqual(["Lab code", "Lab", "Material", "Response", "Replicate", "Value", "Test date", "Operator", "Cell status", "Amendments", "Cell decision", "Decision reason"]);
    // 8 labs × 4 materials × 2 responses × 3 replicates, all submitted in the demo.
    expect(rows).toHaveLength(192);
    expect(new Set(rows.map((r) => r[1]))).toEqual(new Set(DEMO_LABS.slice(0, 8).map((l) => l.name)));
    const excluded = rows.filter((r) => r[0] === "L01" && r[2] === "M3" && r[3] === "holes");
    expect(excluded).toHaveLength(3);
    for (const r of excluded) expect(r.slice(10)).toEqual(["excluded", "Operator error recorded on the data sheet."]);
    expect(rows.filter((r) => r[0] === "L02" && r[2] === "M1" && r[3] === "holes").map((r) => r[9])).toEqual([2, 2, 2]);
    expect(rows.filter((r) => r[0] === "L03").every((r) => r[9] === 0 && r[10] === undefined)).toBe(true);
    // Numbers stay numbers: a spreadsheet can sum them.
    expect(rows.every((r) => typeof r[5] === "number" && typeof r[4] === "number")).toBe(true);
  });

  it("gives the same rows as CSV, headed by the API's keys, and the JSON gains the decision columns", async () => {
    const outcome = await download(resultsCsv.loader, "results.csv", "admin@ringbatch.example");
    expectDownload(outcome, "text/csv; charset=utf-8", "FF-2026-A-results.csv");
    const [header, ...rows] = csvRows(outcome);
    expect(header).toEqual(["lab", "labName", "material", "response", "replicate", "value", "testedOn", "operator", "status", "amendments", "decision", "decisionReason"]);
    expect(rows).toHaveLength(192);
    const json = await call(resultsJson.loader, get(path("results"), await demoCookie("admin@ringbatch.example")), params());
    expect(json.data.results).toHaveLength(192);
    expect(json.data.results.map((r: Record<string, unknown>) => header!.map((key) => String(r[key] ?? "")))).toEqual(rows);
  });

  it("gives reviewers lab codes and submitted results only: no names, operators, status or amendments", async () => {
    for (const [loader, file] of [
      [resultsCsv.loader, "results.csv"],
      [resultsXlsx.loader, "results.xlsx"],
    ] as const) {
      const outcome = await download(loader, file, "reviewer2@ringbatch.example");
      expect(outcome.status).toBe(200);
      expect(outcome.headers.get("Content-Disposition")).toBe(`attachment; filename="FF-2026-A-results-blinded.${file.split(".")[1]}"`);
      const [header, ...rows] = file.endsWith(".csv") ? csvRows(outcome) : sheetRows((await workbook(outcome)).getWorksheet("Results")!);
      expect(header).toEqual(
        file.endsWith(".csv")
          ? ["lab", "material", "response", "replicate", "value", "testedOn", "decision", "decisionReason"]
          : ["Lab code", "Material", "Response", "Replicate", "Value", "Test date", "Cell decision", "Decision reason"],
      );
      expect(rows).toHaveLength(192);
      const text = JSON.stringify(rows);
      for (const lab of DEMO_LABS) expect(text).not.toContain(lab.name);
    }
  });

  it("refuses analysts (404), other studies' people (404) and the signed-out (401)", async () => {
    expect((await download(resultsXlsx.loader, "results.xlsx", "analyst1@ringbatch.example")).status).toBe(404);
    expect((await download(analysisCsv.loader, "analysis.csv", "analyst1@ringbatch.example")).status).toBe(404);
    expect((await call(resultsXlsx.loader, get(path("results.xlsx")), params())).status).toBe(401);
  });
});

describe("analysis download", () => {
  it("gives the precision figures, the labs' statistics with flags and the excluded cells as sheets, equal to the engine's", async () => {
    const outcome = await download(analysisXlsx.loader, "analysis.xlsx", "coordinator@ringbatch.example");
    expectDownload(outcome, XLSX_TYPE, "FF-2026-A-analysis.xlsx");
    const book = await workbook(outcome);
    expect(book.worksheets.map((s) => s.name)).toEqual(["Precision", "Labs", "Excluded cells"]);
    const engine = (await call(precision.loader, get(path("precision"), await demoCookie("coordinator@ringbatch.example")), params())).data;
    const [precisionHeader, ...groups] = sheetRows(book.getWorksheet("Precision")!);
    expect(precisionHeader!.slice(0, 11)).toEqual(["Material", "Response", "p (labs)", "n (replicates)", "x̿", "s_x̄", "s_r", "s_L", "s_R", "r", "R"]);
    expect(groups).toHaveLength(engine.groups.length);
    for (const [i, g] of engine.groups.entries()) {
      expect(groups[i]!.slice(0, 11)).toEqual([g.material, g.response, g.p, g.n, g.mean, g.sx, g.sr, g.sL, g.sR, g.r, g.R]);
    }
    const [, ...labs] = sheetRows(book.getWorksheet("Labs")!);
    // The seed plants L08 high on M2's surface (h) and L01 scattered on M3's holes (k); the latter is excluded above.
    expect(labs.filter((l) => l[9]).map((l) => `${l[0]}/${l[1]}/${l[2]}/${l[9]}`)).toEqual(["M2/surface/L08/h"]);
    expect(sheetRows(book.getWorksheet("Excluded cells")!)).toEqual([
      ["Lab code", "Material", "Response", "Reason", "Results left out"],
      ["L01", "M3", "holes", "Operator error recorded on the data sheet.", 3],
    ]);
  });

  it("gives one flat CSV at the chosen significance level, one row per material × response × lab", async () => {
    const outcome = await download(analysisCsv.loader, "analysis.csv", "coordinator@ringbatch.example", "?alpha=0.05");
    expectDownload(outcome, "text/csv; charset=utf-8", "FF-2026-A-analysis.csv");
    const [header, ...rows] = csvRows(outcome);
    expect(header!.slice(0, 12)).toEqual(["material", "response", "lab", "labN", "mean", "s", "d", "h", "k", "flags", "cochran", "grubbs"]);
    // 4 materials × 2 responses × 8 labs, less the one excluded cell.
    expect(rows).toHaveLength(63);
    const alpha = header!.indexOf("alpha");
    expect(new Set(rows.map((r) => r[alpha]))).toEqual(new Set(["0.05"]));
    expect((await download(analysisCsv.loader, "analysis.csv", "coordinator@ringbatch.example", "?alpha=0.2")).status).toBe(422);
  });

  it("gives reviewers the blinded figures under a blinded file name", async () => {
    const outcome = await download(analysisXlsx.loader, "analysis.xlsx", "reviewer1@ringbatch.example");
    expect(outcome.status).toBe(200);
    expect(outcome.headers.get("Content-Disposition")).toBe('attachment; filename="FF-2026-A-analysis-blinded.xlsx"');
    const [, ...labs] = sheetRows((await workbook(outcome)).getWorksheet("Labs")!);
    expect(new Set(labs.map((l) => l[2]))).toEqual(new Set(["L01", "L02", "L03", "L04", "L05", "L06", "L07", "L08"]));
  });
});

// OWASP, "CSV Injection": a cell starting with =, +, -, @, a tab or a carriage return can run as a formula.
describe("formula-looking text in downloads", () => {
  const NASTY = ["=HYPERLINK(\"http://example.invalid\")", "+1+1", "-2+3", "@SUM(A1)", "\t=1", "\r=1", "=1+1\nsecond line"];

  beforeAll(async () => {
    const cellId = await cellOf("L03", "M1", "holes");
    const rows = await db.select().from(results).where(eq(results.cellId, cellId));
    for (const [i, row] of rows.entries()) await db.update(results).set({ operator: NASTY[i]! }).where(eq(results.id, row.id));
    const more = await cellOf("L03", "M1", "surface");
    const others = await db.select().from(results).where(eq(results.cellId, more));
    for (const [i, row] of others.entries()) await db.update(results).set({ operator: NASTY[i + 3]! }).where(eq(results.id, row.id));
    await db.update(results).set({ operator: NASTY[6]! }).where(eq(results.cellId, await cellOf("L03", "M2", "holes")));
  });

  it("escapes them in the CSV with a leading apostrophe, and leaves negative numbers alone", async () => {
    const [header, ...rows] = csvRows(await download(resultsCsv.loader, "results.csv", "coordinator@ringbatch.example"));
    const operators = new Set(rows.map((r) => r[header!.indexOf("operator")]));
    for (const text of NASTY) {
      expect(operators).toContain(`'${text}`);
      expect(operators).not.toContain(text);
    }
    const [flatHeader, ...flat] = csvRows(await download(analysisCsv.loader, "analysis.csv", "coordinator@ringbatch.example"));
    const d = flat.map((r) => r[flatHeader!.indexOf("d")]!);
    expect(d.some((v) => v.startsWith("-") && !v.startsWith("'"))).toBe(true);
  });

  it("writes them as plain string cells in the workbook, never as formulas", async () => {
    const outcome = await download(resultsXlsx.loader, "results.xlsx", "coordinator@ringbatch.example");
    const sheet = (await workbook(outcome)).getWorksheet("Results")!;
    const operatorCells: ExcelJS.Cell[] = [];
    sheet.getColumn(8).eachCell((cell, row) => row > 1 && operatorCells.push(cell));
    for (const text of NASTY) {
      // An XML reader takes a bare carriage return for a line feed (XML 1.0 §2.11, end-of-line handling).
      const cell = operatorCells.find((c) => c.value === text.replace(/\r/g, "\n"));
      expect(cell, text).toBeDefined();
      expect(cell!.type).toBe(ExcelJS.ValueType.String);
      expect(cell!.formula).toBeUndefined();
    }
    // And in the file itself: no formula element anywhere in the sheet's XML.
    const JSZip = (await import("jszip")).default;
    const zip = await JSZip.loadAsync(outcome.bytes!);
    const sheetXml = await zip.file("xl/worksheets/sheet1.xml")!.async("string");
    expect(sheetXml).not.toContain("<f>");
    expect(sheetXml).not.toContain("<f ");
  });
});
