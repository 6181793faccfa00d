import { count, eq, sql } from "drizzle-orm";
import { beforeAll, describe, expect, it } from "vitest";
import { databaseConfig, db, synchronousLevel } from "~/db/client.server";
import { auditEvents, results, studies, users } from "~/db/schema";
import { recordAudit } from "~/server/audit.server";
import { demoDataPresent } from "~/models/first-use.server";
import { loadSessionUser } from "~/models/user.server";
import * as healthz from "~/routes/healthz";
import { seedDemo } from "../../seed/seed";
import { useFreshDatabase } from "../support/database";
import { call, get } from "../support/routes";

beforeAll(async () => {
  await useFreshDatabase();
});

describe("database", () => {
  it("seeds the demo once: a second run changes nothing", async () => {
    await seedDemo(db);
    const counts = async () => [
      (await db.select({ n: count() }).from(users))[0]!.n,
      (await db.select({ n: count() }).from(studies))[0]!.n,
      (await db.select({ n: count() }).from(results))[0]!.n,
    ];
    const first = await counts();
    await seedDemo(db);
    expect(await counts()).toEqual(first);
    // 2 staff + 12 analysts + 3 reviewers; the checking study's 8 labs × 4 materials × 2 responses × 3 replicates
    // plus the testing study's 4 submitted labs × 2 × 2 × 3 and 2 draft labs × 1 × 2 × 3, plus the published
    // study's 8 labs × 3 materials × 2 responses × 3 replicates; the ruggedness study keeps its results apart;
    // the two published rounds' 12 labs × 2 materials × 2 responses × 2 replicates each and the round in
    // testing's 6 submitted labs × 2 × 2 × 2.
    expect(first).toEqual([17, 7, 192 + 48 + 12 + 144 + 2 * 96 + 48]);
  });

  it("keeps foreign keys on and WAL for the file database", async () => {
    expect((await db.all<{ foreign_keys: number }>(sql`PRAGMA foreign_keys`))[0]!.foreign_keys).toBe(1);
    expect((await db.all<{ journal_mode: string }>(sql`PRAGMA journal_mode`))[0]!.journal_mode).toBe("wal");
    await expect(db.insert(results).values({ cellId: 999999, replicate: 1, value: 3 })).rejects.toThrow();
  });

  it("commits with synchronous NORMAL under WAL, in transactions too, unless DATABASE_SYNCHRONOUS=FULL", async () => {
    // SQLite: 1 is NORMAL, 2 is FULL (the default of a new connection).
    const inTransaction = await db.transaction(async (tx) => (await tx.all<{ synchronous: number }>(sql`PRAGMA synchronous`))[0]!.synchronous);
    expect(inTransaction).toBe(1);
    expect(synchronousLevel({})).toBe("NORMAL");
    expect(synchronousLevel({ DATABASE_SYNCHRONOUS: "full" })).toBe("FULL");
  });

  it("refuses UPDATE and DELETE on the audit trail", async () => {
    await recordAudit({ actorUserId: null, action: "test_event", entityType: "test" });
    // drizzle wraps SQLite's error; the trigger's message is on the cause.
    const refusedByTrigger = { cause: expect.objectContaining({ message: expect.stringMatching(/append-only/) }) };
    await expect(db.update(auditEvents).set({ action: "changed" })).rejects.toMatchObject(refusedByTrigger);
    await expect(db.delete(auditEvents)).rejects.toMatchObject(refusedByTrigger);
    expect((await db.select().from(auditEvents)).some((e) => e.action === "test_event")).toBe(true);
  });

  it("reads a libSQL server address and token from the environment", () => {
    expect(databaseConfig({ DATABASE_URL: "libsql://ringbatch.example.org", DATABASE_AUTH_TOKEN: "t0k" })).toEqual({
      url: "libsql://ringbatch.example.org",
      authToken: "t0k",
      isLocalFile: false,
    });
    expect(databaseConfig({}).url).toBe("file:data/ringbatch.db");
    expect(() => databaseConfig({ DATABASE_URL: "postgres://x" })).toThrow(/DATABASE_URL/);
  });

  it("reports health with the database reachable", async () => {
    const outcome = await call(healthz.loader, get("/healthz"));
    expect(outcome.status).toBe(200);
    expect(outcome.data).toEqual({ status: "ok", database: "reachable" });
  });

  // Last: it switches to another database.
  it("runs the per-request reads prepared once per connection, with each call's values, and follows a new connection", async () => {
    const [analyst] = await db.select().from(users).where(eq(users.email, "analyst1@ringbatch.example"));
    const [reviewer] = await db.select().from(users).where(eq(users.email, "reviewer1@ringbatch.example"));
    expect(await demoDataPresent()).toBe(true);
    const analystUser = await loadSessionUser(analyst!.id);
    expect(analystUser).toMatchObject({ email: "analyst1@ringbatch.example", roles: ["analyst"] });
    expect(analystUser!.labIds.length).toBeGreaterThan(0);
    expect(await loadSessionUser(reviewer!.id)).toMatchObject({ email: "reviewer1@ringbatch.example", roles: ["reviewer"], labIds: [] });
    // A new database (the old connection closed): the reads are prepared again on the new one.
    await useFreshDatabase();
    expect(await demoDataPresent()).toBe(false);
    expect(await loadSessionUser(analyst!.id)).toBeNull();
  });
});
