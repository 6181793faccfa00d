import { eq } from "drizzle-orm";
import { beforeAll, describe, expect, it } from "vitest";
import { db } from "~/db/client.server";
import { enrollments, labs, studies, users } from "~/db/schema";
import { loadSessionUser } from "~/models/user.server";
import { createApiToken, revokeApiToken } from "~/models/api-token.server";
import { saveCellDecision } from "~/models/decisions.server";
import * as healthz from "~/routes/api/v1/healthz";
import * as precision from "~/routes/api/v1/study-precision";
import * as progress from "~/routes/api/v1/study-progress";
import * as study from "~/routes/api/v1/study";
import * as results from "~/routes/api/v1/study-results";
import * as resultsCsv from "~/routes/api/v1/study-results-csv";
import * as studyList from "~/routes/api/v1/studies";
import { DEMO_LABS } from "../../seed/demo-data";
import { demoCookie, demoStudy, useDemoDatabase } from "../support/demo";
import { call, get } from "../support/routes";

let checkingId: number;
let testingId: number;

async function userNamed(email: string) {
  const row = await db.query.users.findFirst({ where: eq(users.email, email) });
  return (await loadSessionUser(row!.id))!;
}

const bearer = (path: string, token: string, headers: Record<string, string> = {}) =>
  new Request(`http://ringbatch.test${path}`, { headers: { Authorization: `Bearer ${token}`, ...headers } });

/** A GET as `get` makes it, revalidating a stored answer. */
const revalidate = (path: string, etag: string, cookie?: string) =>
  new Request(`http://ringbatch.test${path}`, { headers: { "If-None-Match": etag, ...(cookie ? { Cookie: cookie } : {}) } });

beforeAll(async () => {
  await useDemoDatabase();
  checkingId = (await demoStudy("FF-2026-A")).id;
  testingId = (await demoStudy("FF-2026-B")).id;
});

/** The first enrolment of a demo lab, for a results:write token. */
async function firstEnrollmentOf(labName: string) {
  const [enrollment] = await db
    .select({ id: enrollments.id })
    .from(enrollments)
    .innerJoin(labs, eq(labs.id, enrollments.labId))
    .where(eq(labs.name, labName));
  return enrollment!.id;
}

describe("API authentication", () => {
  it("answers 401 in the error shape without credentials or with a bad token", async () => {
    const anonymous = await call(studyList.loader, get("/api/v1/studies"));
    expect(anonymous.status).toBe(401);
    expect(anonymous.data).toEqual({ error: { code: "unauthenticated", message: "Sign in or send a valid bearer token." } });
    const bad = await call(studyList.loader, bearer("/api/v1/studies", "rbt_not-a-real-token"));
    expect(bad.status).toBe(401);
    expect(bad.data.error.code).toBe("unauthenticated");
  });

  it("accepts a study:read token for its own study only, and stops accepting it once revoked", async () => {
    const reviewer = await userNamed("reviewer1@ringbatch.example");
    const { token, row } = await createApiToken(reviewer, { name: "committee script", scope: "study:read", studyId: checkingId });
    expect(token).toMatch(/^rbt_/);
    expect(row.tokenHash).not.toContain(token.slice(4));
    const listed = await call(studyList.loader, bearer("/api/v1/studies", token));
    expect(listed.data.studies.map((s: { code: string }) => s.code)).toEqual(["FF-2026-A"]);
    expect((await call(study.loader, bearer(`/api/v1/studies/${testingId}`, token), { studyId: String(testingId) })).status).toBe(404);
    expect((await call(study.loader, bearer(`/api/v1/studies/${checkingId}`, token), { studyId: String(checkingId) })).status).toBe(200);
    await revokeApiToken(reviewer.id, row.id);
    const revoked = await call(study.loader, bearer(`/api/v1/studies/${checkingId}`, token), { studyId: String(checkingId) });
    expect(revoked.status).toBe(401);
  });

  it("does not let a results:write token read the study", async () => {
    const analyst = await userNamed("analyst1@ringbatch.example");
    const { token } = await createApiToken(analyst, { name: "lab system", scope: "results:write", enrollmentId: await firstEnrollmentOf(DEMO_LABS[0].name) });
    const outcome = await call(study.loader, bearer(`/api/v1/studies/${checkingId}`, token), { studyId: String(checkingId) });
    expect(outcome.status).toBe(404);
  });

  it("refuses to make a token for another lab's enrollment", async () => {
    const analyst = await userNamed("analyst1@ringbatch.example");
    await expect(createApiToken(analyst, { name: "x", scope: "results:write", enrollmentId: await firstEnrollmentOf(DEMO_LABS[1].name) })).rejects.toThrow(/your lab/);
  });
});

describe("API endpoints by role", () => {
  it("lists each role's studies", async () => {
    const list = async (email: string) => (await call(studyList.loader, get("/api/v1/studies", await demoCookie(email)))).data.studies.map((s: { code: string }) => s.code);
    const rounds = ["PT-2025-2", "PT-2026-1", "PT-2026-2"];
    expect(await list("admin@ringbatch.example")).toEqual(["FF-2025-D", "FF-2026-A", "FF-2026-B", ...rounds, "RG-2026-1"]);
    expect(await list("coordinator@ringbatch.example")).toEqual(["FF-2025-D", "FF-2026-A", "FF-2026-B", ...rounds, "RG-2026-1"]);
    expect(await list("analyst3@ringbatch.example")).toEqual(["FF-2025-D", "FF-2026-A", "FF-2026-B", ...rounds]);
    expect(await list("reviewer2@ringbatch.example")).toEqual(["FF-2025-D", "FF-2026-A", "FF-2026-B"]);
  });

  it("describes a study blinded by role: names for the coordinator, codes for reviewers, only its own lab for an analyst", async () => {
    const params = { studyId: String(checkingId) };
    const path = `/api/v1/studies/${checkingId}`;
    const coordinator = (await call(study.loader, get(path, await demoCookie("coordinator@ringbatch.example")), params)).data;
    expect(coordinator.labs).toHaveLength(8);
    expect(coordinator.labs.map((l: { name: string }) => l.name)).toContain(DEMO_LABS[4].name);
    expect(coordinator.materials.map((m: { code: string }) => m.code)).toEqual(["M1", "M2", "M3", "M4"]);
    expect(coordinator.responses.map((r: { key: string }) => r.key)).toEqual(["holes", "surface"]);
    const reviewer = await call(study.loader, get(path, await demoCookie("reviewer1@ringbatch.example")), params);
    const reviewerText = JSON.stringify(reviewer.data);
    for (const lab of DEMO_LABS) expect(reviewerText).not.toContain(lab.name);
    expect(reviewer.data.labs).toHaveLength(8);
    const analyst = await call(study.loader, get(path, await demoCookie("analyst1@ringbatch.example")), params);
    expect(analyst.data.labs).toEqual([expect.objectContaining({ name: DEMO_LABS[0].name })]);
    const analystText = JSON.stringify(analyst.data);
    for (const lab of DEMO_LABS.slice(1)) expect(analystText).not.toContain(lab.name);
  });

  it("gives results to coordinators and reviewers (blinded) but not to analysts", async () => {
    const params = { studyId: String(checkingId) };
    const path = `/api/v1/studies/${checkingId}/results`;
    const coordinator = await call(results.loader, get(path, await demoCookie("coordinator@ringbatch.example")), params);
    // 8 labs × 4 materials × 2 responses × 3 replicates, all submitted in the demo.
    expect(coordinator.data.results).toHaveLength(192);
    expect(coordinator.data.results[0]).toHaveProperty("labName");
    const reviewer = await call(results.loader, get(path, await demoCookie("reviewer3@ringbatch.example")), params);
    expect(reviewer.data.results).toHaveLength(192);
    expect(Object.keys(reviewer.data.results[0]).sort()).toEqual(["decision", "decisionReason", "lab", "material", "replicate", "response", "testedOn", "value"]);
    expect((await call(results.loader, get(path, await demoCookie("analyst1@ringbatch.example")), params)).status).toBe(404);
  });

  it("exports the results as CSV with the same rows", async () => {
    const params = { studyId: String(checkingId) };
    const outcome = await call(resultsCsv.loader, get(`/api/v1/studies/${checkingId}/results.csv`, await demoCookie("reviewer1@ringbatch.example")), params);
    expect(outcome.status).toBe(200);
    expect(outcome.headers.get("Content-Type")).toMatch(/text\/csv/);
    expect(outcome.headers.get("Content-Disposition")).toContain("FF-2026-A-results-blinded.csv");
  });

  it("returns the precision engine's figures, flagging the demo's planted outliers", async () => {
    const params = { studyId: String(checkingId) };
    const outcome = await call(precision.loader, get(`/api/v1/studies/${checkingId}/precision`, await demoCookie("reviewer1@ringbatch.example")), params);
    expect(outcome.status).toBe(200);
    const flagged = outcome.data.groups.flatMap((g: { material: string; response: string; labs: { lab: string; flags: string[] }[] }) =>
      g.labs.filter((l) => l.flags.length).map((l) => `${g.material}/${g.response}/${l.lab}/${l.flags.join("")}`),
    );
    // The seed plants exactly these two (seed/demo-data.ts): L08 high on M2's surface, L01 scattered on M3's holes.
    expect(flagged.sort()).toEqual(["M2/surface/L08/h", "M3/holes/L01/k"]);
    const badAlpha = await call(precision.loader, get(`/api/v1/studies/${checkingId}/precision?alpha=0.2`, await demoCookie("coordinator@ringbatch.example")), params);
    expect(badAlpha.status).toBe(422);
    expect((await call(precision.loader, get("/", await demoCookie("analyst2@ringbatch.example")), params)).status).toBe(404);
  });

  it("gives progress to the coordinator (every lab) and to an analyst's study:read token (its own lab only)", async () => {
    const params = { studyId: String(testingId) };
    const path = `/api/v1/studies/${testingId}/progress`;
    const coordinator = await call(progress.loader, get(path, await demoCookie("coordinator@ringbatch.example")), params);
    expect(coordinator.data.labs).toHaveLength(8);
    const analyst = await userNamed("analyst2@ringbatch.example");
    const { token } = await createApiToken(analyst, { name: "dashboard", scope: "study:read", studyId: testingId });
    const own = await call(progress.loader, bearer(path, token), params);
    expect(own.status).toBe(200);
    expect(own.data.labs.map((l: { labName: string }) => l.labName)).toEqual([DEMO_LABS[1].name]);
    expect((await call(progress.loader, get(path), params)).status).toBe(401);
    expect((await call(progress.loader, get(path, await demoCookie("reviewer1@ringbatch.example")), params)).status).toBe(404);
  });

  it("reports health", async () => {
    expect((await call(healthz.loader, get("/api/v1/healthz"))).data.status).toBe("ok");
  });
});

// Conditional requests as RFC 9110 defines them: a strong entity tag (§8.8.3), If-None-Match answered
// with 304 Not Modified (§13.1.2, §15.4.5); Cache-Control: private, no-cache as RFC 9111 §5.2.2.
describe("API reads and their entity tags", () => {
  const precisionPath = () => `/api/v1/studies/${checkingId}/precision`;
  const params = () => ({ studyId: String(checkingId) });

  it("answer 304 with no body to a matching If-None-Match, and 200 with the same tag otherwise", async () => {
    const cookie = await demoCookie("coordinator@ringbatch.example");
    const first = await call(precision.loader, get(precisionPath(), cookie), params());
    expect(first.status).toBe(200);
    const etag = first.headers.get("ETag")!;
    expect(etag).toMatch(/^"[A-Za-z0-9_-]+"$/); // strong: no W/ prefix
    expect(first.headers.get("Cache-Control")).toBe("private, no-cache");
    const again = await call(precision.loader, revalidate(precisionPath(), etag, cookie), params());
    expect(again.status).toBe(304);
    expect(again.headers.get("ETag")).toBe(etag);
    expect(again.data).toBeNull();
    // A weak form of the same tag, or the tag among others, matches as well (weak comparison, RFC 9110 §13.1.2).
    expect((await call(precision.loader, revalidate(precisionPath(), `"other", W/${etag}`, cookie), params())).status).toBe(304);
    // A tag from elsewhere does not: the full answer comes, with the current tag.
    const stale = await call(precision.loader, revalidate(precisionPath(), '"not-this-one"', cookie), params());
    expect(stale.status).toBe(200);
    expect(stale.headers.get("ETag")).toBe(etag);
    expect(stale.data).toEqual(first.data);
  });

  it("give each role its own tag, even where the figures are the same", async () => {
    const coordinator = await call(precision.loader, get(precisionPath(), await demoCookie("coordinator@ringbatch.example")), params());
    const reviewer = await call(precision.loader, get(precisionPath(), await demoCookie("reviewer1@ringbatch.example")), params());
    expect(reviewer.data).toEqual(coordinator.data);
    expect(reviewer.headers.get("ETag")).not.toBe(coordinator.headers.get("ETag"));
    // The reviewer's stored answer is no good for the coordinator.
    const crossed = await call(precision.loader, revalidate(precisionPath(), reviewer.headers.get("ETag")!, await demoCookie("coordinator@ringbatch.example")), params());
    expect(crossed.status).toBe(200);
  });

  it("change the tag when another significance level is asked for", async () => {
    const cookie = await demoCookie("coordinator@ringbatch.example");
    const own = await call(precision.loader, get(precisionPath(), cookie), params());
    const other = await call(precision.loader, get(`${precisionPath()}?alpha=0.01`, cookie), params());
    expect(other.status).toBe(200);
    expect(other.headers.get("ETag")).not.toBe(own.headers.get("ETag"));
  });

  it("check access before answering 304: 401 without credentials, 404 for a caller outside, 401 for a revoked token", async () => {
    const reviewer = await userNamed("reviewer1@ringbatch.example");
    const { token, row } = await createApiToken(reviewer, { name: "poller", scope: "study:read", studyId: checkingId });
    const first = await call(precision.loader, bearer(precisionPath(), token), params());
    expect(first.status).toBe(200);
    const etag = first.headers.get("ETag")!;
    expect((await call(precision.loader, bearer(precisionPath(), token, { "If-None-Match": etag }), params())).status).toBe(304);
    expect((await call(precision.loader, revalidate(precisionPath(), etag), params())).status).toBe(401);
    expect((await call(precision.loader, revalidate(precisionPath(), etag, await demoCookie("analyst1@ringbatch.example")), params())).status).toBe(404);
    await revokeApiToken(reviewer.id, row.id);
    expect((await call(precision.loader, bearer(precisionPath(), token, { "If-None-Match": etag }), params())).status).toBe(401);
  });

  it("change the tag when a decision changes the figures, and the old tag then gets the new figures", async () => {
    const cookie = await demoCookie("coordinator@ringbatch.example");
    const before = await call(precision.loader, get(precisionPath(), cookie), params());
    const etag = before.headers.get("ETag")!;
    const checking = (await db.query.studies.findFirst({ where: eq(studies.id, checkingId) }))!;
    const coordinator = await userNamed("coordinator@ringbatch.example");
    // L01's scattered M3 holes cell (planted by the seed) is left out of the analysis.
    await saveCellDecision(checking, coordinator.id, { lab: "L01", material: "M3", response: "holes", decision: "excluded", reason: "Operator error recorded on the data sheet." });
    const after = await call(precision.loader, revalidate(precisionPath(), etag, cookie), params());
    expect(after.status).toBe(200);
    expect(after.headers.get("ETag")).not.toBe(etag);
    expect(after.data).not.toEqual(before.data);
    expect((await call(precision.loader, revalidate(precisionPath(), after.headers.get("ETag")!, cookie), params())).status).toBe(304);
  });

  it("tag the reads that have no version of their own by what they send", async () => {
    const cookie = await demoCookie("coordinator@ringbatch.example");
    const path = `/api/v1/studies/${checkingId}`;
    const first = await call(study.loader, get(path, cookie), params());
    expect(first.headers.get("Cache-Control")).toBe("private, no-cache");
    expect((await call(study.loader, revalidate(path, first.headers.get("ETag")!, cookie), params())).status).toBe(304);
    const list = await call(studyList.loader, get("/api/v1/studies", cookie));
    expect((await call(studyList.loader, revalidate("/api/v1/studies", list.headers.get("ETag")!, cookie))).status).toBe(304);
    // A study's new title is a new answer.
    await db.update(studies).set({ title: "Float finishing, checking round (renamed)" }).where(eq(studies.id, checkingId));
    expect((await call(study.loader, revalidate(path, first.headers.get("ETag")!, cookie), params())).status).toBe(200);
    expect((await call(studyList.loader, revalidate("/api/v1/studies", list.headers.get("ETag")!, cookie))).status).toBe(200);
  });
});
