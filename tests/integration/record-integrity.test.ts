/**
 * The study record cannot be changed behind anyone's back: drafts of two
 * people never erase each other, implausible values and dates get a second
 * look or a refusal beside their field, a receipt is corrected only until
 * the first result, and after testing a lab corrects a cell only through the
 * coordinator's correction query. All through the route modules.
 */
import { and, eq } from "drizzle-orm";
import { beforeAll, describe, expect, it } from "vitest";
import { db } from "~/db/client.server";
import { amendments, auditEvents, batches, cells, enrollments, labMembers, responses, results, shipments, studies, studyReviewers, users } from "~/db/schema";
import { hashPassword } from "~/models/user.server";
import * as analysisPage from "~/routes/studies/study/analysis";
import * as ballotPage from "~/routes/review/study/ballot";
import * as queriesPage from "~/routes/studies/study/queries";
import * as receiptPage from "~/routes/lab/study/receipt";
import * as entry from "~/routes/lab/study/result-entry";
import * as setupPage from "~/routes/studies/study/setup";
import { seedDemo } from "../../seed/seed";
import { createTestingStudy, type TestingStudy } from "../security/support";
import { useFreshDatabase } from "../support/database";
import { demoCookie } from "../support/demo";
import { entryChanges } from "../support/entry-draft";
import { errorsOf, toastOf } from "../support/replies";
import { call, get, post, sessionCookieFor } from "../support/routes";

let study: TestingStudy;
let first: string; // the lab's first analyst
let second: string; // a colleague in the same lab
let coordinator: string;
let m1: string;
let m2: string;

beforeAll(async () => {
  await useFreshDatabase();
  await seedDemo(db);
  study = await createTestingStudy({ code: "INTEG-1", materialCount: 3, replicates: 3, labCount: 1 });
  const lab = study.labs[0]!;
  const firstUser = (await db.query.users.findFirst({ where: eq(users.email, lab.email) }))!;
  const enrollment = (await db.query.enrollments.findFirst({ where: eq(enrollments.id, lab.enrollmentId) }))!;
  const [colleague] = await db.insert(users).values({ email: "noor-haddad@ringbatch.example", name: "Noor Haddad", role: "analyst", passwordHash: await hashPassword("colleague-password") }).returning();
  await db.insert(labMembers).values({ labId: enrollment.labId, userId: colleague!.id });
  first = await sessionCookieFor(firstUser.id);
  second = await sessionCookieFor(colleague!.id);
  coordinator = await demoCookie("coordinator@ringbatch.example");
  m1 = String(study.materials[0]!.id);
  m2 = String(study.materials[1]!.id);
});

const entryPath = (materialId: string) => `/lab/studies/${study.studyId}/results/${materialId}`;
const params = (materialId: string) => ({ studyId: String(study.studyId), materialId });
const form = (fields: Record<string, string>) => {
  const data = new FormData();
  for (const [k, v] of Object.entries(fields)) data.set(k, v);
  return data;
};
const postMultipart = (path: string, fields: Record<string, string>, cookie: string) =>
  new Request(`http://ringbatch.test${path}`, { method: "POST", headers: { Cookie: cookie, Origin: "http://ringbatch.test" }, body: form(fields) });
const save = (materialId: string, cookie: string, draft: string, intent = "draft", extra: Record<string, string> = {}) =>
  call(entry.action, postMultipart(entryPath(materialId), { intent, draft, ...extra }, cookie), params(materialId));
async function storedValue(materialId: string, key: string, replicate: number) {
  const [row] = await db
    .select({ value: results.value })
    .from(results)
    .innerJoin(cells, eq(cells.id, results.cellId))
    .innerJoin(responses, eq(responses.id, cells.responseId))
    .where(and(eq(cells.enrollmentId, study.labs[0]!.enrollmentId), eq(cells.materialId, Number(materialId)), eq(responses.key, key), eq(results.replicate, replicate)));
  return row?.value ?? null;
}

describe("two people of one lab on the same material", () => {
  it("never erase each other: the later save of a value read earlier is refused, naming the cell and the other value", async () => {
    // Both open the page while holes, replicate 1 is empty.
    const readByFirst = await entryChanges(first, study.studyId, m1, { values: { "holes:1": "12" } });
    const readBySecond = await entryChanges(second, study.studyId, m1, { values: { "holes:1": "14", "surface:2": "20" } });
    const saved = await save(m1, first, readByFirst.changes);
    expect(saved.status).toBe(200);
    expect(saved.data.conflicts).toEqual({});

    const late = await save(m1, second, readBySecond.changes);
    expect(late.status).toBe(200);
    expect(Object.keys(late.data.conflicts)).toEqual(["holes:1"]);
    expect(late.data.conflicts["holes:1"]).toMatch(/^T001, passes to close the preformed holes, replicate 1: Analyst 1 of INTEG-1 saved 12 after you opened the page, so your 14 was not saved\./);
    expect(await storedValue(m1, "holes", 1)).toBe(12);
    // What did not conflict was saved, and the answer carries the server's draft for the page to show.
    expect(await storedValue(m1, "surface", 2)).toBe(20);
    expect(JSON.parse(late.data.stamp).values["holes:1"]).toBe("12");
  });

  it("behaves the same for two tabs of one person", async () => {
    const tabA = await entryChanges(first, study.studyId, m1, { values: { "holes:2": "9" } });
    const tabB = await entryChanges(first, study.studyId, m1, { values: { "holes:2": "11" } });
    expect((await save(m1, first, tabA.changes)).data.conflicts).toEqual({});
    const stale = await save(m1, first, tabB.changes);
    expect(stale.data.conflicts["holes:2"]).toMatch(/saved 9 after you opened the page, so your 11 was not saved/);
    expect(await storedValue(m1, "holes", 2)).toBe(9);
  });

  it("lets the later person overwrite once they have seen the newer value", async () => {
    const fresh = await entryChanges(second, study.studyId, m1, { values: { "holes:1": "14" } });
    expect((await save(m1, second, fresh.changes)).data.conflicts).toEqual({});
    expect(await storedValue(m1, "holes", 1)).toBe(14);
  });
});

describe("a second look where a slip is likely", () => {
  it("lists values outside the plausible range (1–40 passes) and submits them only when confirmed", async () => {
    const values: Record<string, string> = {};
    for (const r of [1, 2, 3]) {
      values[`holes:${r}`] = r === 2 ? "1000" : "12";
      values[`surface:${r}`] = "18";
    }
    const day = { 1: "2026-11-02", 2: "2026-11-02", 3: "2026-11-02" };
    const who = { 1: "T. Ferrow", 2: "T. Ferrow", 3: "T. Ferrow" };
    const { changes } = await entryChanges(first, study.studyId, m2, { values, testedOn: day, operator: who });
    const unconfirmed = await save(m2, first, changes, "submit");
    expect(unconfirmed.status).toBe(400);
    expect(unconfirmed.data.unusualValues).toEqual([{ response: "Passes to close the preformed holes", replicate: 2, value: 1000, range: "1 to 40 passes" }]);
    const [cell] = await db.select().from(cells).where(and(eq(cells.enrollmentId, study.labs[0]!.enrollmentId), eq(cells.materialId, Number(m2))));
    expect(cell!.status).toBe("draft");

    const { changes: nothingNew } = await entryChanges(first, study.studyId, m2, {});
    const confirmed = await save(m2, first, nothingNew, "submit", { confirmUnusual: "yes" });
    expect(await toastOf(confirmed)).toBe("T002 is submitted. Thank you.");
    const [event] = await db.select().from(auditEvents).where(eq(auditEvents.action, "results.submitted"));
    expect((event!.after as { confirmedUnusual: unknown[] }).confirmedUnusual).toHaveLength(1);
  });
});

describe("plausible dates", () => {
  let shipmentId: number;
  const receipt = (fields: Record<string, string>) =>
    call(receiptPage.action, postMultipart(`/lab/studies/${study.studyId}/receipt`, { shipmentId: String(shipmentId), condition: "good", receiptNotes: "", ...fields }, first), { studyId: String(study.studyId) });

  beforeAll(async () => {
    const [shipment] = await db.insert(shipments).values({ enrollmentId: study.labs[0]!.enrollmentId, status: "shipped", note: "T003 constituents", shippedOn: "2026-10-20" }).returning();
    shipmentId = shipment!.id;
  });

  it("refuses a receipt dated in the future or before the shipment left, beside the date", async () => {
    const future = await receipt({ receivedOn: "2099-01-01" });
    expect(future.status).toBe(400);
    expect(errorsOf(future).receivedOn).toBe("The date of receipt is in the future.");
    const early = await receipt({ receivedOn: "2026-10-19" });
    expect(errorsOf(early).receivedOn).toBe("The materials left on 2026-10-20; they cannot have arrived before that.");
    expect((await db.query.shipments.findFirst({ where: eq(shipments.id, shipmentId) }))!.status).toBe("shipped");
  });

  it("asks for the condition rather than assuming it", async () => {
    const none = await call(receiptPage.action, postMultipart(`/lab/studies/${study.studyId}/receipt`, { shipmentId: String(shipmentId), receivedOn: "2026-10-22", receiptNotes: "" }, first), { studyId: String(study.studyId) });
    expect(errorsOf(none).condition).toMatch(/good condition or damaged/);
  });

  it("refuses a test dated before the receipt", async () => {
    expect((await receipt({ receivedOn: "2026-10-22" })).status).toBe(302);
    const m3 = String(study.materials[2]!.id);
    const { changes } = await entryChanges(first, study.studyId, m3, { values: { "holes:1": "10" }, testedOn: { 1: "2026-10-21" } });
    const early = await save(m3, first, changes);
    expect(early.data.problems["testedOn:1"]).toBe("Your lab received the materials on 2026-10-22; a test cannot be dated before that.");
    expect(await storedValue(m3, "holes", 1)).toBeNull();
  });

  it("lets the lab correct the receipt only until it has recorded results, keeping the change in the audit trail", async () => {
    // This lab already has results (above): the receipt is fixed.
    const late = await receipt({ receivedOn: "2026-10-21" });
    expect(late.status).toBe(400);
    expect(errorsOf(late).form).toMatch(/can no longer be corrected/);
    // A lab without results corrects its receipt.
    const other = await createTestingStudy({ code: "INTEG-2", materialCount: 1, replicates: 2, labCount: 1 });
    const [shipment] = await db.insert(shipments).values({ enrollmentId: other.labs[0]!.enrollmentId, status: "received", note: "T001", shippedOn: "2026-10-20", receivedOn: "2026-10-23", condition: "good" }).returning();
    const analyst = await sessionCookieFor((await db.query.users.findFirst({ where: eq(users.email, other.labs[0]!.email) }))!.id);
    const corrected = await call(
      receiptPage.action,
      postMultipart(`/lab/studies/${other.studyId}/receipt`, { shipmentId: String(shipment!.id), receivedOn: "2026-10-21", condition: "damaged", receiptNotes: "One cement bag split." }, analyst),
      { studyId: String(other.studyId) },
    );
    expect(corrected.status).toBe(302);
    expect(await toastOf(corrected)).toBe("Receipt corrected; the earlier entry stays in the audit trail.");
    expect((await db.query.shipments.findFirst({ where: eq(shipments.id, shipment!.id) }))).toMatchObject({ receivedOn: "2026-10-21", condition: "damaged" });
    const [event] = await db.select().from(auditEvents).where(eq(auditEvents.action, "shipment_receipt_corrected"));
    expect(event).toMatchObject({ before: expect.objectContaining({ receivedOn: "2026-10-23", condition: "good" }) });
  });
});

describe("after testing", () => {
  const amend = async (materialId: string, fields: Record<string, string>) => {
    const page = await call(entry.loader, new Request(`http://ringbatch.test${entryPath(materialId)}`, { headers: { Cookie: first } }), params(materialId));
    const holes = page.data.responses.find((r: { key: string }) => r.key === "holes");
    return call(entry.action, postMultipart(entryPath(materialId), { intent: "amend", responseId: String(holes.id), version: String(holes.cell.version), ...fields }, first), params(materialId));
  };

  beforeAll(async () => {
    await db.update(studies).set({ state: "checking" }).where(eq(studies.id, study.studyId));
  });

  it("refuses lowering the replicates, and any amendment without a correction query", async () => {
    const current = (await db.query.studies.findFirst({ where: eq(studies.id, study.studyId) }))!;
    const lowered = await call(
      setupPage.action,
      post(`/studies/${study.studyId}/setup`, { intent: "study", code: current.code, title: current.title, testMethod: current.testMethod, replicatesPerCell: "2", significanceLevel: String(current.significanceLevel), targetSurfaceRating: "", enrollmentDeadline: "", shipDate: "", resultsDue: "", notes: "" }, coordinator),
      { studyId: String(study.studyId) },
    );
    expect(lowered.status).toBe(400);
    expect(errorsOf(lowered).replicatesPerCell).toBe("Replicates, responses and materials are fixed once testing starts.");
    const refused = await amend(m2, { replicate: "2", value: "10", reason: "Typed 1000 instead of 10." });
    expect(refused.status).toBe(400);
    expect(errorsOf(refused).form).toMatch(/correction query on this cell is open/);
    expect(await storedValue(m2, "holes", 2)).toBe(1000);
  });

  it("lets the lab amend the named cell while the coordinator's correction query is open, and nothing else", async () => {
    const ask = await call(
      analysisPage.action,
      post(`/studies/${study.studyId}/analysis`, { intent: "ask", lab: "L01", material: "T002", response: "holes", statistic: "", question: "Replicate 2 reads 1000 passes; please check your sheet.", asksCorrection: "on" }, coordinator),
      { studyId: String(study.studyId) },
    );
    expect(ask.status).toBe(302);
    const otherResponse = await amend(m2, { replicate: "2", value: "10", reason: "Typed 1000 instead of 10." });
    expect(otherResponse.status).toBe(302);
    expect(await storedValue(m2, "holes", 2)).toBe(10);
    const [amendment] = await db.select().from(amendments);
    expect(amendment!.queryId).not.toBeNull();
    const [trail] = await db.select().from(auditEvents).where(eq(auditEvents.action, "result.amended"));
    expect(trail!.reason).toBe("Typed 1000 instead of 10.");

    // The surface cell of the same material has no query: still closed.
    const page = await call(entry.loader, new Request(`http://ringbatch.test${entryPath(m2)}`, { headers: { Cookie: first } }), params(m2));
    const surface = page.data.responses.find((r: { key: string }) => r.key === "surface");
    expect(page.data.correctable).toEqual([page.data.responses.find((r: { key: string }) => r.key === "holes").id]);
    const surfaceTry = await call(entry.action, postMultipart(entryPath(m2), { intent: "amend", responseId: String(surface.id), replicate: "1", version: String(surface.cell.version), value: "19", reason: "Trying the other cell." }, first), params(m2));
    expect(surfaceTry.status).toBe(400);

    // Once the query is closed, the cell is closed again.
    const queryId = (await db.query.queries.findFirst({ where: (q, { eq: is }) => is(q.asksCorrection, true) }))!.id;
    expect((await call(queriesPage.action, post(`/studies/${study.studyId}/queries`, { intent: "close", queryId: String(queryId) }, coordinator), { studyId: String(study.studyId) })).status).toBe(302);
    const afterClose = await amend(m2, { replicate: "2", value: "11", reason: "One more change after the close." });
    expect(afterClose.status).toBe(400);
    expect(await storedValue(m2, "holes", 2)).toBe(10);
  });

  it("labels the amended cell \"amended after query\" for the coordinator and the committee, and no other cell", async () => {
    const reviewer = (await db.query.users.findFirst({ where: eq(users.email, "reviewer1@ringbatch.example") }))!;
    await db.insert(studyReviewers).values({ studyId: study.studyId, userId: reviewer.id });
    const amendedCell = [{ lab: "L01", material: "T002", response: "holes" }];
    const analysis = await call(analysisPage.loader, get(`/studies/${study.studyId}/analysis`, coordinator), { studyId: String(study.studyId) });
    expect(analysis.status).toBe(200);
    expect(analysis.data.amendedCells).toEqual(amendedCell);
    const ballot = await call(ballotPage.loader, get(`/review/${study.studyId}`, await demoCookie("reviewer1@ringbatch.example")), { studyId: String(study.studyId) });
    expect(ballot.status).toBe(200);
    expect(ballot.data.amendedCells).toEqual(amendedCell);
  });

  it("amends fresh properties of a submitted material only with a reason, and only with a correction query after testing", async () => {
    await db.update(studies).set({ state: "testing" }).where(eq(studies.id, study.studyId));
    await db.insert(batches).values({ enrollmentId: study.labs[0]!.enrollmentId, materialId: Number(m2), slumpMm: 40 });
    const amendFresh = (fields: Record<string, string>) => call(entry.action, postMultipart(entryPath(m2), { intent: "amend-fresh", ...fields }, first), params(m2));
    const noReason = await amendFresh({ slump: "45", reason: "" });
    expect(noReason.status).toBe(400);
    expect(errorsOf(noReason).reason).toMatch(/give the reason/);
    expect((await amendFresh({ slump: "45", reason: "Read on the wrong scale mark." })).status).toBe(302);
    const [batch] = await db.select().from(batches).where(eq(batches.materialId, Number(m2)));
    expect(batch!.slumpMm).toBe(45);
    const [event] = await db.select().from(auditEvents).where(eq(auditEvents.action, "batch.fresh_properties_amended"));
    expect(event).toMatchObject({ reason: "Read on the wrong scale mark.", before: { slumpMm: 40 }, after: { slumpMm: 45 } });
    await db.update(studies).set({ state: "checking" }).where(eq(studies.id, study.studyId));
    expect((await amendFresh({ slump: "50", reason: "No query is open for this one." })).status).toBe(400);
  });
});
