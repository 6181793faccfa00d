import { and, eq } from "drizzle-orm";
import { beforeAll, describe, expect, it } from "vitest";
import { db } from "~/db/client.server";
import { amendments, auditEvents, cells, labs, materials, results, studies } from "~/db/schema";
import * as labStudy from "~/routes/lab/study/tasks";
import * as labStudyFrame from "~/routes/lab/study/layout";
import * as entry from "~/routes/lab/study/result-entry";
import * as studyResults from "~/routes/studies/study/results";
import { DEMO_LABS } from "../../seed/demo-data";
import { demoCookie, demoEnrollment, useDemoStudyInTesting } from "../support/demo";
import { entryChanges } from "../support/entry-draft";
import { call, get, post } from "../support/routes";
import { errorsOf, toastOf } from "../support/replies";

let studyId: string;
let f1: string;
let f2: string;

beforeAll(async () => {
  ({ studyId, f1, f2 } = await useDemoStudyInTesting());
});

/** The changes the page would send for these edits, read as `cookie` from material `materialId`. */
const draftOf = async (cookie: string, materialId: string, values: Record<string, string>, extra: Partial<Record<"testedOn" | "operator", Record<string, string>>> = {}) =>
  (await entryChanges(cookie, studyId, materialId, { values, ...extra })).changes;

const enrollmentOf = (labIndex: number) => demoEnrollment(Number(studyId), labIndex);

async function storedValues(labIndex: number, materialId: string) {
  const enrollment = await enrollmentOf(labIndex);
  return db
    .select({ replicate: results.replicate, value: results.value, responseId: cells.responseId, version: cells.version, status: cells.status })
    .from(results)
    .innerJoin(cells, eq(cells.id, results.cellId))
    .where(and(eq(cells.enrollmentId, enrollment.id), eq(cells.materialId, Number(materialId))));
}

describe("result entry of the lab's own cells", () => {
  it("saves a draft idempotently: the same draft twice changes nothing the second time", async () => {
    const cookie = await demoCookie("analyst7@ringbatch.example"); // lab index 6, not started
    const params = { studyId, materialId: f2 };
    const path = `/lab/studies/${studyId}/results/${f2}`;
    const draft = await draftOf(cookie, f2, { "holes:1": "9", "surface:1": "15" }, { testedOn: { 1: "2026-10-12" }, operator: { 1: "Bo Lindqvar" } });
    const first = await call(entry.action, post(path, { intent: "draft", draft }, cookie), params);
    expect(first.status).toBe(200);
    expect(first.data.problems).toEqual({});
    const afterFirst = await storedValues(6, f2);
    const events = (await db.select().from(auditEvents).where(eq(auditEvents.action, "results.draft_saved"))).length;
    const second = await call(entry.action, post(path, { intent: "draft", draft }, cookie), params);
    expect(second.data.problems).toEqual({});
    expect(await storedValues(6, f2)).toEqual(afterFirst);
    expect((await db.select().from(auditEvents).where(eq(auditEvents.action, "results.draft_saved"))).length).toBe(events);
    expect(afterFirst.map((r) => r.value).sort()).toEqual([15, 9]);
  });

  it("refuses an impossible count beside its field and keeps the right ones", async () => {
    const cookie = await demoCookie("analyst7@ringbatch.example");
    const params = { studyId, materialId: f2 };
    const draft = await draftOf(cookie, f2, { "holes:1": "9", "holes:2": "-3", "surface:2": "4.5", "surface:3": "16" });
    const outcome = await call(entry.action, post(`/lab/studies/${studyId}/results/${f2}`, { intent: "draft", draft }, cookie), params);
    expect(outcome.data.problems).toEqual({ "holes:2": "A count cannot be negative.", "surface:2": "A count is a whole number, such as 12." });
    expect((await storedValues(6, f2)).some((r) => r.value === 16 && r.replicate === 3)).toBe(true);
  });

  it("submits a complete material, locks it, and then takes changes only as amendments with a reason", async () => {
    const cookie = await demoCookie("analyst8@ringbatch.example"); // lab index 7, not started
    const params = { studyId, materialId: f1 };
    const path = `/lab/studies/${studyId}/results/${f1}`;
    const values: Record<string, string> = {};
    for (const r of [1, 2, 3]) {
      values[`holes:${r}`] = String(9 + r);
      values[`surface:${r}`] = String(15 + r);
    }
    const dates = { 1: "2026-10-12", 2: "2026-10-12", 3: "2026-10-12" };
    const operators = { 1: "Rosalind Quennel", 2: "Rosalind Quennel", 3: "Rosalind Quennel" };

    const incomplete = await call(entry.action, post(path, { intent: "submit", draft: await draftOf(cookie, f1, values, { testedOn: dates }) }, cookie), params);
    expect(incomplete.status).toBe(400);
    expect(incomplete.data.result.error[""]).toContain("Passes to close the preformed holes, replicate 1: enter the test date and the operator.");

    const submitted = await call(entry.action, post(path, { intent: "submit", draft: await draftOf(cookie, f1, values, { testedOn: dates, operator: operators }) }, cookie), params);
    expect(await toastOf(submitted)).toBe("F1 is submitted. Thank you.");
    const stored = await storedValues(7, f1);
    expect(stored.every((r) => r.status === "submitted")).toBe(true);

    // A draft save into the submitted cells is refused with a pointer to amendments.
    const enrollment = await enrollmentOf(7);
    const { saveDraftResults } = await import("~/models/results.server");
    const refused = await saveDraftResults(enrollment, [{ material: "F1", response: "holes", replicate: 1, value: "30" }], { id: 1 });
    expect(refused.problems[0]!.message).toMatch(/already submitted; change it with an amendment/);

    const page = await call(entry.loader, get(path, cookie), params);
    const holes = page.data.responses.find((r: { key: string }) => r.key === "holes");
    const amend = (fields: Record<string, string>) =>
      call(entry.action, post(path, { intent: "amend", responseId: String(holes.id), replicate: "2", version: String(holes.cell.version), ...fields }, cookie), params);

    const noReason = await amend({ value: "12", reason: "" });
    expect(noReason.status).toBe(400);
    expect(errorsOf(noReason).reason).toBe("Give the reason for the change (at least 5 characters).");

    const amended = await amend({ value: "12", reason: "Transcription slip: the sheet says 12" });
    expect(amended.status).toBe(302);
    const [amendment] = await db.select().from(amendments).where(eq(amendments.replicate, 2));
    expect(amendment).toMatchObject({ oldValue: 11, newValue: 12, reason: "Transcription slip: the sheet says 12" });
    const trail = await db.select().from(auditEvents).where(eq(auditEvents.action, "result.amended"));
    expect(trail.at(-1)).toMatchObject({ before: { material: "F1", response: "holes", replicate: 2, value: 11 }, after: { value: 12 }, reason: "Transcription slip: the sheet says 12" });

    // The same stale version again: a conflict, and the stored value stays 12.
    const stale = await amend({ value: "13", reason: "Second thoughts on the sheet" });
    expect(stale.status).toBe(409);
    expect(errorsOf(stale).form).toMatch(/Someone changed this result/);
    expect((await storedValues(7, f1)).find((r) => r.responseId === holes.id && r.replicate === 2)!.value).toBe(12);

    // The coordinator sees the amendment with old value, new value and reason.
    const coordinator = await call(studyResults.loader, get(`/studies/${studyId}/results`, await demoCookie("coordinator@ringbatch.example")), { studyId });
    const row = coordinator.data.rows.find((r: { enrollmentId: number; materialCode: string }) => r.enrollmentId === enrollment.id && r.materialCode === "F1");
    expect(row.amendments[0]).toMatchObject({ oldValue: 11, newValue: 12, reason: "Transcription slip: the sheet says 12", responseKey: "holes" });
    expect(coordinator.data.audit.events.some((e: { action: string }) => e.action === "result.amended")).toBe(true);
  });

  it("keeps an out-of-tolerance slump and marks it for the coordinator", async () => {
    const cookie = await demoCookie("analyst7@ringbatch.example");
    const { changes: draft } = await entryChanges(cookie, studyId, f2, { fresh: { slump: "120", air_content: "6.5", unit_weight: "9999" }, batchedAt: "2026-10-12T09:30" });
    const saved = await call(entry.action, post(`/lab/studies/${studyId}/results/${f2}`, { intent: "draft", draft }, cookie), { studyId, materialId: f2 });
    expect(saved.data.problems).toEqual({ "fresh:unit_weight": "Unit weight must be between 500 and 4000 kg/m³." });
    const coordinator = await call(studyResults.loader, get(`/studies/${studyId}/results?material=F2`, await demoCookie("coordinator@ringbatch.example")), { studyId });
    const enrollment = await enrollmentOf(6);
    const row = coordinator.data.rows.find((r: { enrollmentId: number; materialCode: string }) => r.enrollmentId === enrollment.id && r.materialCode === "F2");
    // The seeded study targets slump 75 ± 25 mm and air 6 ± 1.5 %: 120 mm is outside, 6.5 % within.
    expect(row.fresh).toEqual([
      { property: "slump", label: "Slump", unit: "mm", value: 120, outside: true },
      { property: "air_content", label: "Air content", unit: "%", value: 6.5, outside: false },
    ]);
  });

  it("bumps the study's data version with every change of results", async () => {
    const before = (await db.query.studies.findFirst({ where: eq(studies.id, Number(studyId)) }))!.dataVersion;
    const cookie = await demoCookie("analyst7@ringbatch.example");
    await call(entry.action, post(`/lab/studies/${studyId}/results/${f2}`, { intent: "draft", draft: await draftOf(cookie, f2, { "holes:3": "11" }) }, cookie), { studyId, materialId: f2 });
    expect((await db.query.studies.findFirst({ where: eq(studies.id, Number(studyId)) }))!.dataVersion).toBe(before + 1);
  });
});

describe("scope: a lab sees only its own enrollment", () => {
  it("answers 404 to an analyst on pages of a study their lab is not in, and to a coordinator on the lab pages", async () => {
    const outsider = await db.insert(labs).values({ name: "Unenrolled Test Lab" }).returning();
    const { createUser } = await import("~/models/user.server");
    await createUser({ email: "outsider@ringbatch.example", name: "Outsider", password: "outsider-password-1", roles: ["analyst"], labId: outsider[0]!.id });
    const cookie = await demoCookie("outsider@ringbatch.example");
    expect((await call(labStudy.loader, get(`/lab/studies/${studyId}`, cookie), { studyId })).status).toBe(404);
    expect((await call(entry.loader, get("/", cookie), { studyId, materialId: f1 })).status).toBe(404);
    const coordinator = await demoCookie("coordinator@ringbatch.example");
    expect((await call(labStudy.loader, get("/", coordinator), { studyId })).status).toBe(404);
  });

  it("answers 404 for a material of another study, and an analyst on the coordinator's results page", async () => {
    const cookie = await demoCookie("analyst2@ringbatch.example");
    const other = await db.query.materials.findFirst({ where: eq(materials.code, "M1") });
    expect((await call(entry.loader, get("/", cookie), { studyId, materialId: String(other!.id) })).status).toBe(404);
    expect((await call(studyResults.loader, get("/", cookie), { studyId })).status).toBe(404);
  });

  it("shows the lab's own draft and nothing of another lab", async () => {
    const cookie = await demoCookie("analyst2@ringbatch.example"); // lab index 1, submitted
    const own = await call(entry.loader, get("/", cookie), { studyId, materialId: f1 });
    expect(own.status).toBe(200);
    const ownValues = Object.values(own.data.submittedValues).sort();
    const theirs = (await storedValues(1, f1)).map((r) => r.value).sort();
    expect(ownValues).toEqual(theirs);
    const body = JSON.stringify(own.data);
    for (const [i, lab] of DEMO_LABS.entries()) if (i !== 1) expect(body).not.toContain(lab.name);
    const list = await call(labStudy.loader, get("/", cookie), { studyId });
    expect(JSON.stringify(list.data)).not.toMatch(/L0[^2]/);
    // The lab's code is shown once, by the study's frame around the lab's pages.
    const frame = await call(labStudyFrame.loader, get("/", cookie), { studyId });
    expect(JSON.stringify(frame.data)).not.toMatch(/L0[^2]/);
    expect(frame.data.labCode).toBe("L02");
  });
});
