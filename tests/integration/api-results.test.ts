import { and, count, eq } from "drizzle-orm";
import { beforeAll, describe, expect, it } from "vitest";
import { db } from "~/db/client.server";
import { auditEvents, cells, enrollments, labs, results, studies } from "~/db/schema";
import { createApiToken, revokeApiToken } from "~/models/api-token.server";
import { loadSessionUser } from "~/models/user.server";
import * as post from "~/routes/api/v1/enrollment-results";
import { DEMO_LABS } from "../../seed/demo-data";
import { seedDemo } from "../../seed/seed";
import { useFreshDatabase } from "../support/database";
import { demoCookie } from "../support/demo";
import { call } from "../support/routes";

/** Lab index 6 (analyst7) has not started the testing study FF-2026-B; lab index 0 (analyst1) has submitted. */
let freshEnrollment: number;
let submittedEnrollment: number;
let studyId: number;

async function enrollmentOf(labIndex: number) {
  const [row] = await db
    .select({ id: enrollments.id })
    .from(enrollments)
    .innerJoin(labs, eq(labs.id, enrollments.labId))
    .where(and(eq(enrollments.studyId, studyId), eq(labs.name, DEMO_LABS[labIndex]!.name)));
  return row!.id;
}

function getResults(enrollmentId: number, headers: Record<string, string>) {
  return call(post.loader, new Request(`http://ringbatch.test/api/v1/enrollments/${enrollmentId}/results`, { headers }), { enrollmentId: String(enrollmentId) });
}

function postResults(enrollmentId: number, body: string, headers: Record<string, string>) {
  return call(post.action, new Request(`http://ringbatch.test/api/v1/enrollments/${enrollmentId}/results`, { method: "POST", headers: { "Content-Type": "application/json", ...headers }, body }), { enrollmentId: String(enrollmentId) });
}

const rowsCount = async () => (await db.select({ n: count() }).from(results))[0]!.n;

const GOOD = JSON.stringify({
  results: [
    { material: "F1", response: "holes", replicate: 1, value: 10, testedOn: "2026-11-20", operator: "Bo Lindqvar" },
    { material: "F1", response: "holes", replicate: 2, value: 11 },
    { material: "F1", response: "surface", replicate: 1, value: 17 },
  ],
});

beforeAll(async () => {
  await useFreshDatabase();
  await seedDemo(db);
  studyId = (await db.query.studies.findFirst({ where: eq(studies.code, "FF-2026-B") }))!.id;
  freshEnrollment = await enrollmentOf(6);
  submittedEnrollment = await enrollmentOf(0);
});

describe("POST /api/v1/enrollments/:id/results", () => {
  it("writes draft results for the token's enrollment, and a second identical request changes nothing", async () => {
    const analyst = (await loadSessionUser((await db.query.users.findFirst({ where: (u, { eq }) => eq(u.email, "analyst7@ringbatch.example") }))!.id))!;
    const { token } = await createApiToken(analyst, { name: "lab system", scope: "results:write", enrollmentId: freshEnrollment });
    const before = await rowsCount();
    const first = await postResults(freshEnrollment, GOOD, { Authorization: `Bearer ${token}` });
    expect(first.status).toBe(200);
    expect(first.data).toEqual({ received: 3, changed: 3 });
    expect(await rowsCount()).toBe(before + 3);
    const audits = (await db.select({ n: count() }).from(auditEvents))[0]!.n;
    const second = await postResults(freshEnrollment, GOOD, { Authorization: `Bearer ${token}` });
    expect(second.data).toEqual({ received: 3, changed: 0 });
    expect(await rowsCount()).toBe(before + 3);
    expect((await db.select({ n: count() }).from(auditEvents))[0]!.n).toBe(audits);
    const stored = await db.select().from(cells).where(eq(cells.enrollmentId, freshEnrollment));
    expect(stored.every((c) => c.status === "draft")).toBe(true);
  });

  it("works with the browser session too", async () => {
    const outcome = await postResults(freshEnrollment, GOOD, { Cookie: await demoCookie("analyst7@ringbatch.example") });
    expect(outcome.status).toBe(200);
  });

  it("refuses all rows when one is bad, naming it, with 422", async () => {
    const before = await rowsCount();
    const body = JSON.stringify({ results: [{ material: "F2", response: "holes", replicate: 1, value: 9 }, { material: "F9", response: "holes", replicate: 1, value: 9 }] });
    const outcome = await postResults(freshEnrollment, body, { Cookie: await demoCookie("analyst7@ringbatch.example") });
    expect(outcome.status).toBe(422);
    expect(outcome.data.error.code).toBe("invalid_results");
    expect(outcome.data.error.details).toEqual([expect.objectContaining({ row: 2, field: "material" })]);
    expect(await rowsCount()).toBe(before);
  });

  it("answers 409 for rows of submitted cells", async () => {
    const body = JSON.stringify({ results: [{ material: "F1", response: "holes", replicate: 1, value: 3 }] });
    const outcome = await postResults(submittedEnrollment, body, { Cookie: await demoCookie("analyst1@ringbatch.example") });
    expect(outcome.status).toBe(409);
    expect(outcome.data.error.code).toBe("cell_submitted");
  });

  it("answers 400 for malformed JSON, 413 above 1 MB, 422 for the wrong shape", async () => {
    const cookie = await demoCookie("analyst7@ringbatch.example");
    const malformed = await postResults(freshEnrollment, "{results: [", { Cookie: cookie });
    expect(malformed.status).toBe(400);
    expect(malformed.data.error.code).toBe("malformed_json");
    const huge = await postResults(freshEnrollment, JSON.stringify({ results: [], pad: "x".repeat(1024 * 1024 + 10) }), { Cookie: cookie });
    expect(huge.status).toBe(413);
    const shape = await postResults(freshEnrollment, JSON.stringify({ results: [{ material: "F1", response: "holes", replicate: "one", value: "NaN" }] }), { Cookie: cookie });
    expect(shape.status).toBe(422);
    expect(shape.data.error.details.length).toBeGreaterThan(0);
  });

  it("answers 404 for another lab's enrollment, a token of another scope or enrollment, and 401 for a revoked token", async () => {
    expect((await postResults(submittedEnrollment, GOOD, { Cookie: await demoCookie("analyst7@ringbatch.example") })).status).toBe(404);
    expect((await postResults(freshEnrollment, GOOD, { Cookie: await demoCookie("coordinator@ringbatch.example") })).status).toBe(404);
    const analyst = (await loadSessionUser((await db.query.users.findFirst({ where: (u, { eq }) => eq(u.email, "analyst7@ringbatch.example") }))!.id))!;
    const reader = await createApiToken(analyst, { name: "reader", scope: "study:read", studyId });
    expect((await postResults(freshEnrollment, GOOD, { Authorization: `Bearer ${reader.token}` })).status).toBe(404);
    const checkingEnrollment = (await db.select({ id: enrollments.id }).from(enrollments).where(and(eq(enrollments.labId, analyst.labIds[0]!))).all()).find((e) => e.id !== freshEnrollment)!;
    const otherWriter = await createApiToken(analyst, { name: "other", scope: "results:write", enrollmentId: checkingEnrollment.id });
    expect((await postResults(freshEnrollment, GOOD, { Authorization: `Bearer ${otherWriter.token}` })).status).toBe(404);
    await revokeApiToken(analyst.id, otherWriter.row.id);
    const revoked = await postResults(checkingEnrollment.id, GOOD, { Authorization: `Bearer ${otherWriter.token}` });
    expect(revoked.status).toBe(401);
    expect(revoked.data).toEqual({ error: { code: "unauthenticated", message: "The bearer token is not valid, or it was revoked." } });
  });

  it("takes the version each replicate was read at: a stale one gets 409 naming the cell and its current value, and nothing is written", async () => {
    const cookie = await demoCookie("analyst7@ringbatch.example");
    const read = await getResults(freshEnrollment, { Cookie: cookie });
    expect(read.status).toBe(200);
    const holes1 = read.data.results.find((r: { material: string; response: string; replicate: number }) => r.material === "F1" && r.response === "holes" && r.replicate === 1);
    expect(holes1).toMatchObject({ value: 10, cellStatus: "draft" });
    const readAt = holes1.version as number;

    // Another person of the lab changes the replicate after it was read (the page's autosave, same model).
    const colleague = { material: "F1", response: "holes", replicate: 1, value: 12, readVersion: readAt };
    expect((await postResults(freshEnrollment, JSON.stringify({ results: [colleague] }), { Cookie: cookie })).data).toEqual({ received: 1, changed: 1 });

    const before = await db.select().from(results).where(eq(results.cellId, (await db.select().from(cells).where(eq(cells.enrollmentId, freshEnrollment)))[0]!.id));
    const stale = JSON.stringify({
      results: [
        { material: "F1", response: "surface", replicate: 2, value: 18, readVersion: 0 },
        { material: "F1", response: "holes", replicate: 1, value: 14, readVersion: readAt },
      ],
    });
    const refused = await postResults(freshEnrollment, stale, { Cookie: cookie });
    expect(refused.status).toBe(409);
    expect(refused.data.error.code).toBe("stale_version");
    expect(refused.data.error.message).toContain("F1 · holes · replicate 1 now holds 12");
    expect(refused.data.error.details).toEqual([
      expect.objectContaining({ row: 2, material: "F1", response: "holes", replicate: 1, currentValue: 12, currentVersion: readAt + 1, yourValue: 14 }),
    ]);
    // Neither the stale row nor the good row before it was written.
    const after = await db.select().from(results).where(eq(results.cellId, before[0]!.cellId));
    expect(after).toEqual(before);
    expect((await getResults(freshEnrollment, { Cookie: cookie })).data.results.some((r: { response: string; replicate: number }) => r.response === "surface" && r.replicate === 2)).toBe(false);

    // Resent with the current version, it is written.
    const fresh = JSON.stringify({ results: [{ material: "F1", response: "holes", replicate: 1, value: 14, readVersion: readAt + 1 }] });
    expect((await postResults(freshEnrollment, fresh, { Cookie: cookie })).data).toEqual({ received: 1, changed: 1 });
  });

  it("refuses a write to a replicate someone stored after it was read as empty (version 0)", async () => {
    const cookie = await demoCookie("analyst7@ringbatch.example");
    const body = JSON.stringify({ results: [{ material: "F1", response: "surface", replicate: 1, value: 30, readVersion: 0 }] });
    const refused = await postResults(freshEnrollment, body, { Cookie: cookie });
    expect(refused.status).toBe(409);
    expect(refused.data.error.details[0]).toMatchObject({ material: "F1", response: "surface", replicate: 1, currentValue: 17 });
  });

  it("reads only the caller's own lab's results", async () => {
    expect((await getResults(submittedEnrollment, { Cookie: await demoCookie("analyst7@ringbatch.example") })).status).toBe(404);
    expect((await getResults(freshEnrollment, { Cookie: await demoCookie("coordinator@ringbatch.example") })).status).toBe(404);
    expect((await getResults(freshEnrollment, {})).status).toBe(401);
  });
});
