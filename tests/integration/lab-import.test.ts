import { and, eq } from "drizzle-orm";
import { beforeAll, describe, expect, it } from "vitest";
import { db } from "~/db/client.server";
import { auditEvents, cells, enrollments, labs, materials, results, studies } from "~/db/schema";
import * as importPage from "~/routes/lab/study/import";
import { DEMO_LABS } from "../../seed/demo-data";
import { seedDemo } from "../../seed/seed";
import { useFreshDatabase } from "../support/database";
import { demoCookie } from "../support/demo";
import { call } from "../support/routes";
import { errorsOf, toastOf } from "../support/replies";

let studyId: string;

beforeAll(async () => {
  await useFreshDatabase();
  await seedDemo(db);
  studyId = String((await db.query.studies.findFirst({ where: eq(studies.code, "FF-2026-B") }))!.id);
});

function upload(csv: string | Uint8Array, cookie: string, name = "results.csv") {
  const form = new FormData();
  form.set("file", new File([csv as BlobPart], name, { type: "text/csv" }));
  return new Request(`http://ringbatch.test/lab/studies/${studyId}/import`, { method: "POST", headers: { Origin: "http://ringbatch.test", Cookie: cookie }, body: form });
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

const HEADER = "material,response,replicate,value,tested_on,operator";
const goodRows = ["F2,holes,1,9,2026-10-15,Mireille Akande", "F2,holes,2,10,2026-10-15,Mireille Akande", "F2,holes,3,9,2026-10-15,Mireille Akande", "F2,surface,1,15,2026-10-15,Mireille Akande", "F2,surface,2,16,2026-10-15,Mireille Akande", "F2,surface,3,14,2026-10-15,Mireille Akande"];

describe("CSV import of a lab's results", () => {
  it("imports a good file, all rows, with an audit event", async () => {
    const cookie = await demoCookie("analyst6@ringbatch.example"); // lab index 5: a draft of F1 only
    expect(await storedCount(5, "F2")).toBe(0);
    const outcome = await call(importPage.action, upload([HEADER, ...goodRows].join("\n"), cookie), { studyId });
    expect(outcome.status).toBe(302);
    expect(await toastOf(outcome)).toBe("Imported 6 results as drafts. Check them on each material's result page, then submit.");
    expect(await storedCount(5, "F2")).toBe(6);
    const events = await db.select().from(auditEvents).where(eq(auditEvents.action, "results.imported"));
    expect(events).toHaveLength(1);
    expect(events[0]!.reason).toBe("CSV import of results.csv (6 rows)");
  });

  it("imports nothing from a file with one bad row, and names that row", async () => {
    const cookie = await demoCookie("analyst7@ringbatch.example"); // lab index 6: not started
    const rows = goodRows.map((r) => r.replace("Mireille Akande", "Bo Lindqvar"));
    rows[3] = "F2,surface,1,-4,2026-10-15,Bo Lindqvar"; // file row 5 (the header is row 1)
    const outcome = await call(importPage.action, upload([HEADER, ...rows].join("\r\n"), cookie), { studyId });
    expect(outcome.status).toBe(400);
    expect(outcome.data.problems).toEqual([{ row: 5, field: "value", message: "A count cannot be negative." }]);
    expect(await storedCount(6, "F2")).toBe(0);
  });

  it("refuses a row naming a material or a response the study does not have, with its row number", async () => {
    const cookie = await demoCookie("analyst7@ringbatch.example");
    const csv = ["material,response,replicate,value", "F2,holes,1,9", "F9,holes,1,9", "F2,gloss,1,9"].join("\n");
    const outcome = await call(importPage.action, upload(csv, cookie), { studyId });
    expect(outcome.status).toBe(400);
    expect(outcome.data.problems).toEqual([
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
    expect(outcome.status).toBe(400);
    expect(outcome.data.problems[0]).toMatchObject({ row: 2, message: "F1 · holes · replicate 2 is already submitted; change it with an amendment (with a reason) on the result entry page." });
    expect(await storedCount(0, "F1")).toBe(before);
  });

  it("names a missing column, and a file that is not text", async () => {
    const cookie = await demoCookie("analyst7@ringbatch.example");
    const noValue = await call(importPage.action, upload("material,response,replicate\nF2,holes,1", cookie), { studyId });
    expect(noValue.data.fileProblems[0]).toMatch(/no “value” column/);
    const binary = await call(importPage.action, upload(new Uint8Array([0x89, 0x50, 0x4e, 0x47, 0, 0, 0]), cookie), { studyId });
    expect(errorsOf(binary).file).toBe("This is not a CSV text file.");
  });

  it("answers 404 to someone whose lab is not in the study", async () => {
    const reviewer = await demoCookie("reviewer1@ringbatch.example");
    expect((await call(importPage.loader, new Request(`http://ringbatch.test/lab/studies/${studyId}/import`, { headers: { Cookie: reviewer } }), { studyId })).status).toBe(404);
  });
});
