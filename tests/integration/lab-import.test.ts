import { and, eq } from "drizzle-orm";
import ExcelJS from "exceljs";
import { beforeAll, describe, expect, it } from "vitest";
import { db } from "~/db/client.server";
import { auditEvents, cells, enrollments, labs, materials, responses, results, studies, users } from "~/db/schema";
import { saveDraftResults } from "~/models/results.server";
import * as importPage from "~/routes/lab/study/import";
import * as templateRoute from "~/routes/lab/study/results-template";
import { DEMO_LABS } from "../../seed/demo-data";
import { seedDemo } from "../../seed/seed";
import { useFreshDatabase } from "../support/database";
import { demoCookie } from "../support/demo";
import { call, get } from "../support/routes";
import { errorsOf, toastOf } from "../support/replies";

let studyId: string;

beforeAll(async () => {
  await useFreshDatabase();
  await seedDemo(db);
  studyId = String((await db.query.studies.findFirst({ where: eq(studies.code, "FF-2026-B") }))!.id);
});

function upload(csv: string | Uint8Array, cookie: string, name = "results.csv", fields: Record<string, string> = { intent: "preview" }) {
  const form = new FormData();
  for (const [key, value] of Object.entries(fields)) form.set(key, value);
  form.set("file", new File([csv as BlobPart], name, { type: name.endsWith(".xlsx") ? "application/vnd.openxmlformats-officedocument.spreadsheetml.sheet" : "text/csv" }));
  return new Request(`http://ringbatch.test/lab/studies/${studyId}/import`, { method: "POST", headers: { Origin: "http://ringbatch.test", Cookie: cookie }, body: form });
}

/** Checks the file as the page does, then confirms the import with what the check sent back. */
async function importFile(body: string | Uint8Array, cookie: string, name = "results.csv") {
  const preview = await call(importPage.action, upload(body, cookie, name), { studyId });
  const confirm = preview.data?.report?.confirm;
  if (!confirm) return { preview, outcome: preview };
  const outcome = await call(importPage.action, upload(body, cookie, name, { intent: "import", digest: confirm.digest, seen: confirm.seen }), { studyId });
  return { preview, outcome };
}

async function storedCount(labIndex: number, materialCode: string) {
  const lab = await db.query.labs.findFirst({ where: eq(labs.name, DEMO_LABS[labIndex]!.name) });
  const material = await db.query.materials.findFirst({ where: and(eq(materials.studyId, Number(studyId)), eq(materials.code, materialCode)) });
  const rows = await db
    .select({ id: results.id })
    .from(results)
    .innerJoin(cells, eq(cells.id, results.cellId))
    .innerJoin(enrollments, eq(enrollments.id, cells.enrollmentId))
    .where(and(eq(enrollments.labId, lab!.id), eq(enrollments.studyId, Number(studyId)), eq(cells.materialId, material!.id)));
  return rows.length;
}

async function enrollmentOf(labIndex: number) {
  const lab = await db.query.labs.findFirst({ where: eq(labs.name, DEMO_LABS[labIndex]!.name) });
  return (await db.query.enrollments.findFirst({ where: and(eq(enrollments.labId, lab!.id), eq(enrollments.studyId, Number(studyId))) }))!;
}

async function template(cookie: string, format: "csv" | "xlsx") {
  const outcome = await call(templateRoute.loader, get(`/lab/studies/${studyId}/import/template.${format}`, cookie), { studyId });
  expect(outcome.status).toBe(200);
  return { headers: outcome.headers, bytes: outcome.bytes! };
}

const HEADER = "material,response,replicate,value,tested_on,operator";
const goodRows = ["F2,holes,1,9,2026-10-15,Mireille Akande", "F2,holes,2,10,2026-10-15,Mireille Akande", "F2,holes,3,9,2026-10-15,Mireille Akande", "F2,surface,1,15,2026-10-15,Mireille Akande", "F2,surface,2,16,2026-10-15,Mireille Akande", "F2,surface,3,14,2026-10-15,Mireille Akande"];

describe("CSV import of a lab's results", () => {
  it("imports a good file, all rows, with an audit event", async () => {
    const cookie = await demoCookie("analyst6@ringbatch.example"); // lab index 5: a draft of F1 only
    expect(await storedCount(5, "F2")).toBe(0);
    const checked = await call(importPage.action, upload([HEADER, ...goodRows].join("\n"), cookie), { studyId });
    expect(checked.data.report.reading).toBe("Read as comma-separated.");
    expect(await storedCount(5, "F2")).toBe(0); // the check stores nothing
    const { outcome } = await importFile([HEADER, ...goodRows].join("\n"), cookie);
    expect(outcome.status).toBe(302);
    expect(await toastOf(outcome)).toBe("Imported 6 results as drafts. Check them on each material's result page, then submit.");
    const f2 = await db.query.materials.findFirst({ where: and(eq(materials.studyId, Number(studyId)), eq(materials.code, "F2")) });
    expect(outcome.headers.get("Location")).toBe(`/lab/studies/${studyId}/import?imported=${f2!.id}`);
    expect(await storedCount(5, "F2")).toBe(6);
    const events = await db.select().from(auditEvents).where(eq(auditEvents.action, "results.imported"));
    expect(events).toHaveLength(1);
    expect(events[0]!.reason).toBe("Import of results.csv (6 rows)");
    // The page after the import links to the material's entry page.
    const page = await call(importPage.loader, get(outcome.headers.get("Location")!, cookie), { studyId });
    expect(page.data.imported).toEqual([{ id: f2!.id, code: "F2" }]);
  });

  it("imports nothing from a file with one bad row, and names that row", async () => {
    const cookie = await demoCookie("analyst7@ringbatch.example"); // lab index 6: not started
    const rows = goodRows.map((r) => r.replace("Mireille Akande", "Bo Lindqvar"));
    rows[3] = "F2,surface,1,-4,2026-10-15,Bo Lindqvar"; // file row 5 (the header is row 1)
    const preview = await call(importPage.action, upload([HEADER, ...rows].join("\r\n"), cookie), { studyId });
    expect(preview.data.report.problems).toEqual([{ row: 5, field: "value", message: "A count cannot be negative." }]);
    expect(preview.data.report.confirm).toBeUndefined();
    // Confirming anyway (a hand-made request) is refused whole, with the same row named.
    const seen = JSON.stringify(Object.fromEntries([2, 3, 4, 5, 6, 7].map((row) => [row, 0])));
    const { createHash } = await import("node:crypto");
    const body = [HEADER, ...rows].join("\r\n");
    const digest = createHash("sha256").update(body).digest("hex");
    const outcome = await call(importPage.action, upload(body, cookie, "results.csv", { intent: "import", digest, seen }), { studyId });
    expect(outcome.status).toBe(400);
    expect(outcome.data.report.problems).toEqual([{ row: 5, field: "value", message: "A count cannot be negative." }]);
    expect(await storedCount(6, "F2")).toBe(0);
  });

  it("refuses a row naming a material or a response the study does not have, with its row number", async () => {
    const cookie = await demoCookie("analyst7@ringbatch.example");
    const csv = ["material,response,replicate,value", "F2,holes,1,9", "F9,holes,1,9", "F2,gloss,1,9"].join("\n");
    const outcome = await call(importPage.action, upload(csv, cookie), { studyId });
    expect(outcome.data.report.problems).toEqual([
      { row: 3, field: "material", message: "The study has no material “F9” (it has F1, F2)." },
      { row: 4, field: "response", message: "The study has no response “gloss” (it has holes, surface)." },
    ]);
    expect(await storedCount(6, "F2")).toBe(0);
  });

  it("refuses a 3 MB file before reading it", async () => {
    const cookie = await demoCookie("analyst7@ringbatch.example");
    const line = "F2,holes,1,9,2026-10-15,Bo Lindqvar\n";
    const big = HEADER + "\n" + line.repeat(Math.ceil((3 * 1024 * 1024) / line.length));
    expect(big.length).toBeGreaterThan(3 * 1024 * 1024);
    const outcome = await call(importPage.action, upload(big, cookie), { studyId });
    expect(outcome.status).toBe(413);
    expect(errorsOf(outcome).file).toBe("The file is larger than 2 MB; split it into smaller files.");
    expect(await storedCount(6, "F2")).toBe(0);
  });

  it("refuses to import into submitted cells and points to amendments", async () => {
    const cookie = await demoCookie("analyst1@ringbatch.example"); // lab index 0: submitted
    const before = await storedCount(0, "F1");
    const outcome = await call(importPage.action, upload(["material,response,replicate,value", "F1,holes,2,30"].join("\n"), cookie), { studyId });
    expect(outcome.data.report.problems[0]).toMatchObject({ row: 2, message: "F1 · holes · replicate 2 is already submitted; change it with an amendment (with a reason) on the result entry page." });
    expect(await storedCount(0, "F1")).toBe(before);
  });

  it("names a missing column, and a file that is not text", async () => {
    const cookie = await demoCookie("analyst7@ringbatch.example");
    const noValue = await call(importPage.action, upload("material,response,replicate\nF2,holes,1", cookie), { studyId });
    expect(noValue.status).toBe(400);
    expect(noValue.data.report.fileProblems[0]).toMatch(/no “value” column/);
    const binary = await call(importPage.action, upload(new Uint8Array([0x89, 0x50, 0x4e, 0x47, 0, 0, 0]), cookie), { studyId });
    expect(errorsOf(binary).file).toBe("This is not a CSV text file or an .xlsx workbook.");
    const notAWorkbook = await call(importPage.action, upload(new Uint8Array([0x50, 0x4b, 0x03, 0x04, 1, 2, 3]), cookie, "broken.xlsx"), { studyId });
    expect(errorsOf(notAWorkbook).file).toMatch(/could not be read as an .xlsx workbook/);
  });

  it("answers 404 to someone whose lab is not in the study", async () => {
    const reviewer = await demoCookie("reviewer1@ringbatch.example");
    expect((await call(importPage.loader, new Request(`http://ringbatch.test/lab/studies/${studyId}/import`, { headers: { Cookie: reviewer } }), { studyId })).status).toBe(404);
  });
});

describe("the results template and spreadsheets in and out", () => {
  it("offers a CSV template of the lab's own draft cells, with the drafts and their versions", async () => {
    const cookie = await demoCookie("analyst5@ringbatch.example"); // lab index 4: a draft of F1
    const { headers, bytes } = await template(cookie, "csv");
    expect(headers.get("Content-Type")).toBe("text/csv; charset=utf-8");
    expect(headers.get("Content-Disposition")).toMatch(/^attachment; filename="FF-2026-B-L\d+-results\.csv"$/);
    const lines = new TextDecoder().decode(bytes).replace(/^\uFEFF/, "").trim().split("\r\n");
    expect(lines[0]).toBe("material,response,replicate,value,tested_on,operator,version");
    // 2 materials × 2 responses × 3 replicates, none submitted yet.
    expect(lines).toHaveLength(1 + 12);
    const enrollment = await enrollmentOf(4);
    const stored = await db
      .select({ material: materials.code, response: responses.key, replicate: results.replicate, value: results.value, version: results.version })
      .from(results)
      .innerJoin(cells, eq(cells.id, results.cellId))
      .innerJoin(materials, eq(materials.id, cells.materialId))
      .innerJoin(responses, eq(responses.id, cells.responseId))
      .where(eq(cells.enrollmentId, enrollment.id));
    expect(stored.length).toBeGreaterThan(0);
    for (const s of stored) {
      const line = lines.find((l) => l.startsWith(`${s.material},${s.response},${s.replicate},`))!;
      expect(line.split(",")[3]).toBe(String(s.value));
      expect(line.split(",").at(-1)).toBe(String(s.version));
    }
    expect(lines.filter((l) => l.startsWith("F2,"))).toEqual(expect.arrayContaining(["F2,holes,1,,,,0"]));
  });

  it("leaves submitted cells out of the template, and answers 404 outside the lab", async () => {
    const submitted = await template(await demoCookie("analyst1@ringbatch.example"), "csv"); // lab index 0: everything submitted
    expect(new TextDecoder().decode(submitted.bytes).trim().split("\r\n")).toHaveLength(1);
    const reviewer = await demoCookie("reviewer1@ringbatch.example");
    expect((await call(templateRoute.loader, get(`/lab/studies/${studyId}/import/template.csv`, reviewer), { studyId })).status).toBe(404);
  });

  // exceljs (a general-purpose spreadsheet library) stands in for the lab's spreadsheet: it opens our workbook and saves it back filled in.
  it("round-trips the .xlsx template: filled in a spreadsheet, imported whole", async () => {
    const cookie = await demoCookie("analyst8@ringbatch.example"); // lab index 7
    const { headers, bytes } = await template(cookie, "xlsx");
    expect(headers.get("Content-Type")).toBe("application/vnd.openxmlformats-officedocument.spreadsheetml.sheet");
    const workbook = new ExcelJS.Workbook();
    await workbook.xlsx.load(bytes.buffer as ArrayBuffer);
    const sheet = workbook.getWorksheet("Results")!;
    expect(sheet.getRow(1).values).toEqual([undefined, "material", "response", "replicate", "value", "tested_on", "operator", "version"]);
    const before = await storedCount(7, "F2");
    let filled = 0;
    sheet.eachRow((row, number) => {
      if (number === 1 || row.getCell(1).value !== "F2") return;
      row.getCell(4).value = 10 + filled++;
      // Typed as a date: the spreadsheet stores a date serial with a date format.
      row.getCell(5).value = new Date(Date.UTC(2026, 9, 16));
      row.getCell(5).numFmt = "yyyy-mm-dd";
      row.getCell(6).value = "Tamsin Okafor-Reyes";
    });
    expect(filled).toBeGreaterThan(0);
    const filledBytes = new Uint8Array((await workbook.xlsx.writeBuffer()) as ArrayBuffer);
    const { preview, outcome } = await importFile(filledBytes, cookie, "filled.xlsx");
    expect(preview.data.report.reading).toBe("Read as an Excel workbook (first sheet).");
    expect(preview.data.report.rows[0].testedOn).toBe("2026-10-16");
    expect(outcome.status).toBe(302);
    expect(await storedCount(7, "F2")).toBe(Math.max(before, 6));
  });

  it("reports a value someone saved after the template was downloaded as a conflict, and imports nothing", async () => {
    const cookie = await demoCookie("analyst6@ringbatch.example"); // lab index 5, F2 imported above as version 1
    const enrollment = await enrollmentOf(5);
    const csv = new TextDecoder().decode((await template(cookie, "csv")).bytes);
    // Another tab of the lab saves replicate 2 of F2's holes after the download.
    const analyst = await db.query.users.findFirst({ where: eq(users.email, "analyst6@ringbatch.example") });
    const saved = await saveDraftResults(enrollment, [{ material: "F2", response: "holes", replicate: 2, value: "11", testedOn: "2026-10-15", operator: "Mireille Akande" }], analyst!);
    expect(saved.saved).toBe(1);
    const edited = csv.replace(/^F2,holes,2,10,/m, "F2,holes,2,12,").replace(/^F2,holes,1,9,/m, "F2,holes,1,8,");
    expect(edited).not.toBe(csv);
    const preview = await call(importPage.action, upload(edited, cookie), { studyId });
    expect(preview.data.report.conflicts).toHaveLength(1);
    expect(preview.data.report.conflicts[0]).toMatchObject({ material: "F2", response: "holes", replicate: 2, theirValue: 11, yourValue: 12 });
    expect(preview.data.report.conflicts[0].message).toMatch(/^F2, passes to close the preformed holes, replicate 2: .+ saved 11 after this file's template was downloaded, so your 12 cannot be imported over it\./);
    expect(preview.data.report.confirm).toBeUndefined();
    const values = async () =>
      (await db.select({ replicate: results.replicate, value: results.value }).from(results).innerJoin(cells, eq(cells.id, results.cellId)).innerJoin(materials, eq(materials.id, cells.materialId)).innerJoin(responses, eq(responses.id, cells.responseId)).where(and(eq(cells.enrollmentId, enrollment.id), eq(materials.code, "F2"), eq(responses.key, "holes")))).sort((a, b) => a.replicate - b.replicate).map((r) => r.value);
    expect(await values()).toEqual([9, 11, 9]); // neither the conflicting row nor the good one (replicate 1 → 8) was written
  });

  it("checks a file without versions against the values its preview read", async () => {
    const cookie = await demoCookie("analyst6@ringbatch.example");
    const enrollment = await enrollmentOf(5);
    const body = "material,response,replicate,value\nF2,surface,1,17\n";
    const preview = await call(importPage.action, upload(body, cookie), { studyId });
    expect(preview.data.report.rows[0]).toMatchObject({ row: 2, value: "17", storedValue: 15 });
    const confirm = preview.data.report.confirm;
    expect(confirm).toBeDefined();
    const analyst = await db.query.users.findFirst({ where: eq(users.email, "analyst6@ringbatch.example") });
    await saveDraftResults(enrollment, [{ material: "F2", response: "surface", replicate: 1, value: "18", testedOn: "2026-10-15", operator: "Mireille Akande" }], analyst!);
    const outcome = await call(importPage.action, upload(body, cookie, "results.csv", { intent: "import", digest: confirm.digest, seen: confirm.seen }), { studyId });
    expect(outcome.status).toBe(409);
    expect(outcome.data.report.conflicts[0].message).toMatch(/saved 18 after the preview of this file, so your 17 cannot be imported over it/);
    // Another file than the one checked is refused before anything is read into the lab's cells.
    const other = await call(importPage.action, upload("material,response,replicate,value\nF2,surface,1,19\n", cookie, "results.csv", { intent: "import", digest: confirm.digest, seen: confirm.seen }), { studyId });
    expect(other.status).toBe(409);
    expect(errorsOf(other).file).toBe("This is not the file that was checked. Check it first, then import.");
  });

  it("reads a semicolon-separated file with decimal commas, says so, and imports it", async () => {
    // A continuous response, as a study of another test method has; the float test's counts take no decimals.
    await db.update(responses).set({ kind: "continuous", decimals: 1, plausibleMin: null, plausibleMax: null }).where(and(eq(responses.studyId, Number(studyId)), eq(responses.key, "surface")));
    const cookie = await demoCookie("analyst7@ringbatch.example"); // lab index 6
    const body = "material;response;replicate;value;tested_on;operator\r\nF2;surface;1;15,5;2026-10-15;Bo Lindqvar\r\nF2;surface;2;16,0;2026-10-15;Bo Lindqvar\r\nF2;holes;1;9;2026-10-15;Bo Lindqvar\r\n";
    const { preview, outcome } = await importFile(body, cookie);
    expect(preview.data.report.reading).toBe("Read as semicolon-separated with decimal commas.");
    expect(outcome.status).toBe(302);
    const enrollment = await enrollmentOf(6);
    const stored = await db.select({ value: results.value }).from(results).innerJoin(cells, eq(cells.id, results.cellId)).innerJoin(responses, eq(responses.id, cells.responseId)).where(and(eq(cells.enrollmentId, enrollment.id), eq(responses.key, "surface")));
    expect(stored.map((r) => r.value).sort()).toEqual([15.5, 16]);
  });
});
