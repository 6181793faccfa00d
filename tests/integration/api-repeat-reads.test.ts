/**
 * Repeat precision reads answered from memory must say exactly what the route
 * would say, and never outlive a change: each case below changes one thing a
 * guard depends on and expects the memory to step aside (null), after which
 * the route decides afresh.
 */
import { createClient } from "@libsql/client";
import { eq, sql } from "drizzle-orm";
import { afterEach, beforeAll, beforeEach, describe, expect, it, vi } from "vitest";
import { db } from "~/db/client.server";
import { studies, studyReviewers, users } from "~/db/schema";
import { answerRepeatPrecisionRead } from "~/server/api-repeat-reads.server";
import { currentAccessVersion } from "~/server/guards.server";
import { SECURITY_HEADERS } from "~/server/security-headers.server";
import { endAllSessions } from "~/server/session.server";
import { createApiToken, revokeApiToken } from "~/models/api-token.server";
import { loadSessionUser } from "~/models/user.server";
import * as precision from "~/routes/api/v1/study-precision";
import { seedDemo } from "../../seed/seed";
import { useFreshDatabase } from "../support/database";
import { demoCookie } from "../support/demo";

let databaseUrl: string;
let checkingId: number;
let testingId: number;

const ORIGIN = "http://ringbatch.test";
const pathOf = (studyId: number, query = "") => `/api/v1/studies/${studyId}/precision${query}`;

/** The route's own answer, through its loader with a real Request. */
async function fromRoute(path: string, headers: Record<string, string>) {
  const studyId = /studies\/(\d+)/.exec(path)![1]!;
  const response = (await precision.loader({ request: new Request(ORIGIN + path, { headers }), params: { studyId }, context: {} } as never)) as Response;
  return { status: response.status, contentType: response.headers.get("Content-Type"), body: Buffer.from(await response.arrayBuffer()) };
}

const fromMemory = (path: string, headers: Record<string, string>, method = "GET") =>
  answerRepeatPrecisionRead(method, path, Object.fromEntries(Object.entries(headers).map(([k, v]) => [k.toLowerCase(), v])));

async function userId(email: string) {
  return (await db.query.users.findFirst({ where: eq(users.email, email) }))!.id;
}

beforeAll(async () => {
  databaseUrl = await useFreshDatabase();
  await seedDemo(db);
  checkingId = (await db.query.studies.findFirst({ where: eq(studies.code, "FF-2026-A") }))!.id;
  testingId = (await db.query.studies.findFirst({ where: eq(studies.code, "FF-2026-B") }))!.id;
});

beforeEach(() => vi.stubEnv("API_RATE_LIMIT_PER_MINUTE", "100000"));
afterEach(() => {
  vi.useRealTimers();
  vi.unstubAllEnvs();
});

describe("repeat precision reads", () => {
  it("answer a remembered caller with the route's exact bytes, type and security headers", async () => {
    const headers = { Cookie: await demoCookie("coordinator@ringbatch.example") };
    expect(await fromMemory(pathOf(checkingId), headers)).toBeNull();
    const full = await fromRoute(pathOf(checkingId), headers);
    expect(full.status).toBe(200);
    const repeat = (await fromMemory(pathOf(checkingId), headers))!;
    expect(repeat.status).toBe(200);
    expect(repeat.body.equals(full.body)).toBe(true);
    expect(repeat.headers["Content-Type"]).toBe(full.contentType);
    expect(repeat.headers["Content-Length"]).toBe(full.body.length);
    for (const [name, value] of Object.entries(SECURITY_HEADERS)) expect(repeat.headers[name]).toBe(value);
  });

  it("remember nothing for a caller the route refused, another study, another method or another significance level", async () => {
    const analyst = { Cookie: await demoCookie("analyst1@ringbatch.example") };
    expect((await fromRoute(pathOf(checkingId), analyst)).status).toBe(404);
    expect(await fromMemory(pathOf(checkingId), analyst)).toBeNull();

    const coordinator = { Cookie: await demoCookie("coordinator@ringbatch.example") };
    await fromRoute(pathOf(checkingId), coordinator);
    expect(await fromMemory(pathOf(testingId), coordinator)).toBeNull();
    expect(await fromMemory(pathOf(checkingId), coordinator, "POST")).toBeNull();
    expect(await fromMemory(pathOf(checkingId, "?alpha=0.05"), coordinator)).toBeNull();
    expect(await fromMemory(pathOf(checkingId, "?alpha=0.2"), coordinator)).toBeNull();
    // The same level, once the route has computed it, is remembered like the default.
    const full = await fromRoute(pathOf(checkingId, "?alpha=0.05"), coordinator);
    expect((await fromMemory(pathOf(checkingId, "?alpha=0.05"), coordinator))!.body.equals(full.body)).toBe(true);
  });

  it("step aside after a sign-out everywhere, and the route then answers 401", async () => {
    const headers = { Cookie: await demoCookie("coordinator@ringbatch.example") };
    await fromRoute(pathOf(checkingId), headers);
    expect(await fromMemory(pathOf(checkingId), headers)).not.toBeNull();
    await endAllSessions(await userId("coordinator@ringbatch.example"));
    expect(await fromMemory(pathOf(checkingId), headers)).toBeNull();
    expect((await fromRoute(pathOf(checkingId), headers)).status).toBe(401);
  });

  it("step aside when a reviewer is taken off the study, and the route then answers 404", async () => {
    const headers = { Cookie: await demoCookie("reviewer1@ringbatch.example") };
    expect((await fromRoute(pathOf(checkingId), headers)).status).toBe(200);
    expect(await fromMemory(pathOf(checkingId), headers)).not.toBeNull();
    await db.delete(studyReviewers).where(eq(studyReviewers.userId, await userId("reviewer1@ringbatch.example")));
    expect(await fromMemory(pathOf(checkingId), headers)).toBeNull();
    expect((await fromRoute(pathOf(checkingId), headers)).status).toBe(404);
  });

  it("step aside when another process commits to the database (an account disabled from outside)", async () => {
    const headers = { Cookie: await demoCookie("admin@ringbatch.example") };
    await fromRoute(pathOf(checkingId), headers);
    expect(await fromMemory(pathOf(checkingId), headers)).not.toBeNull();
    // A second client stands for another process writing the same file.
    const outside = createClient({ url: databaseUrl });
    await outside.execute({ sql: "update users set disabled_at = ? where email = ?", args: [Date.now(), "admin@ringbatch.example"] });
    outside.close();
    expect(await fromMemory(pathOf(checkingId), headers)).toBeNull();
    expect((await fromRoute(pathOf(checkingId), headers)).status).toBe(401);
  });

  it("step aside once the session has ended, even with nothing written", async () => {
    const headers = { Cookie: await demoCookie("coordinator@ringbatch.example") };
    await fromRoute(pathOf(checkingId), headers);
    expect(await fromMemory(pathOf(checkingId), headers)).not.toBeNull();
    vi.useFakeTimers({ toFake: ["Date"] });
    vi.setSystemTime(Date.now() + 13 * 60 * 60 * 1000); // sessions last 12 hours
    expect(await fromMemory(pathOf(checkingId), headers)).toBeNull();
  });

  it("serve a study:read token until it is revoked or due for its last-use record", async () => {
    const reviewer = (await loadSessionUser(await userId("reviewer2@ringbatch.example")))!;
    const { token, row } = await createApiToken(reviewer, { name: "committee script", scope: "study:read", studyId: checkingId });
    const headers = { Authorization: `Bearer ${token}` };
    // The first use records the last use (a write), so the second is the first one remembered.
    await fromRoute(pathOf(checkingId), headers);
    expect(await fromMemory(pathOf(checkingId), headers)).toBeNull();
    await fromRoute(pathOf(checkingId), headers);
    expect(await fromMemory(pathOf(checkingId), headers)).not.toBeNull();

    vi.useFakeTimers({ toFake: ["Date"] });
    vi.setSystemTime(Date.now() + 61_000); // the last use is recorded to the minute
    expect(await fromMemory(pathOf(checkingId), headers)).toBeNull();
    vi.useRealTimers();

    await fromRoute(pathOf(checkingId), headers);
    await fromRoute(pathOf(checkingId), headers);
    expect(await fromMemory(pathOf(checkingId), headers)).not.toBeNull();
    await revokeApiToken(reviewer.id, row.id);
    expect(await fromMemory(pathOf(checkingId), headers)).toBeNull();
    expect((await fromRoute(pathOf(checkingId), headers)).status).toBe(401);
  });

  it("count against the caller's rate limit and answer 429 in the API's error shape", async () => {
    vi.stubEnv("API_RATE_LIMIT_PER_MINUTE", "3");
    const headers = { Cookie: await demoCookie("reviewer3@ringbatch.example") };
    expect((await fromRoute(pathOf(checkingId), headers)).status).toBe(200);
    expect((await fromMemory(pathOf(checkingId), headers))!.status).toBe(200);
    expect((await fromMemory(pathOf(checkingId), headers))!.status).toBe(200);
    const limited = (await fromMemory(pathOf(checkingId), headers))!;
    expect(limited.status).toBe(429);
    expect(JSON.parse(limited.body.toString()).error.code).toBe("rate_limited");
  });
});

// Last: these rows are changed and removed for good.
describe("the access version", () => {
  it.each(["users", "sessions", "api_tokens", "lab_members", "studies", "study_coordinators", "study_reviewers", "enrollments"])(
    "moves on with an insert, update or delete in %s",
    async (table) => {
      // The demo has no co-coordinator: give the first study one, so there is a row to change.
      if (table === "study_coordinators") {
        await db.run(sql`insert into study_coordinators (study_id, user_id) select min(id), (select id from users where email = 'admin@ringbatch.example') from studies`);
      }
      // Deletes cascade to other guarded tables, so a step may move the version more than once.
      const before = (await currentAccessVersion())!;
      await db.run(sql.raw(`update ${table} set rowid = rowid where rowid = (select min(rowid) from ${table})`));
      const updated = (await currentAccessVersion())!;
      expect(updated).toBe(before + 1);
      const row = (await db.get<Record<string, unknown>>(sql.raw(`select * from ${table} order by rowid desc limit 1`)))!;
      await db.run(sql.raw(`delete from ${table} where rowid = (select max(rowid) from ${table})`));
      const deleted = (await currentAccessVersion())!;
      expect(deleted).toBeGreaterThan(updated);
      const columns = Object.keys(row);
      await db.run(sql`insert into ${sql.identifier(table)} (${sql.join(columns.map((c) => sql.identifier(c)), sql`, `)}) values (${sql.join(columns.map((c) => sql`${row[c]}`), sql`, `)})`);
      expect(await currentAccessVersion()).toBeGreaterThan(deleted);
    },
  );
});
