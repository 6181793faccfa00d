/**
 * The server killed (SIGKILL: no shutdown code runs) while it imports a large
 * results file, at moments spread over the import's duration, then started
 * again on the same database. Each time the lab's results must be all the old
 * ones or all the new ones, never a mix or a part; the file must pass SQLite's
 * integrity check, and the server must start and import again.
 */
import { createHash } from "node:crypto";
import { eq, sql } from "drizzle-orm";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { db } from "~/db/client.server";
import { cells, materials, responses, results } from "~/db/schema";
import { type RunningServer, startServer } from "../support/server";
import { recordFigure } from "./figures";
import { createTestingStudy, DATA_REDIRECT_STATUS, fullResultsCsv, prepareDatabaseFile, randomSource, signInOverHttp, TEST_PASSWORD, type TestingStudy } from "./support";

const MATERIALS = 250;
const REPLICATES = 10;
/** Kill moments as fractions of one uninterrupted import's duration. */
const KILL_AT = [0, 0.15, 0.3, 0.45, 0.55, 0.65, 0.72, 0.8, 0.87, 0.94, 1, 1.3];

let study: TestingStudy;
let databaseUrl: string;
let server: RunningServer;
let cookie: string;

beforeAll(async () => {
  const prepared = await prepareDatabaseFile(() => createTestingStudy({ code: "CRASH-1", materialCount: MATERIALS, replicates: REPLICATES, labCount: 1 }));
  ({ databaseUrl } = prepared);
  study = prepared;
  server = await startServer({}, { databaseUrl });
  cookie = await signInOverHttp(server.url, study.labs[0]!.email, TEST_PASSWORD);
});

afterAll(() => server?.stop());

/** The import's confirming post, as the page sends it after its check (this test is about atomicity, so no read versions are named). */
function sendImport(csv: string) {
  const form = new FormData();
  form.set("intent", "import");
  form.set("digest", createHash("sha256").update(csv).digest("hex"));
  form.set("seen", "{}");
  form.set("file", new File([csv], "all-results.csv", { type: "text/csv" }));
  return fetch(`${server.url}/lab/studies/${study.studyId}/import.data`, { method: "POST", headers: { Origin: server.url, Cookie: cookie }, body: form });
}

/** The lab's stored results as `material:response:replicate` → value. */
async function storedResults() {
  const rows = await db
    .select({ material: materials.code, response: responses.key, replicate: results.replicate, value: results.value })
    .from(results)
    .innerJoin(cells, eq(cells.id, results.cellId))
    .innerJoin(materials, eq(materials.id, cells.materialId))
    .innerJoin(responses, eq(responses.id, cells.responseId))
    .where(eq(cells.enrollmentId, study.labs[0]!.enrollmentId));
  return new Map(rows.map((r) => [`${r.material}:${r.response}:${r.replicate}`, r.value]));
}

/** The file's rows in the same form. */
function fileResults(csv: string) {
  return new Map(
    csv
      .trim()
      .split("\n")
      .slice(1)
      .map((line) => line.split(","))
      .map(([material, response, replicate, value]) => [`${material}:${response}:${replicate}`, Number(value)]),
  );
}

const same = (a: Map<string, number>, b: Map<string, number>) => a.size === b.size && [...a].every(([key, value]) => b.get(key) === value);

describe("a SIGKILL during a CSV import", () => {
  it("leaves the import complete or absent at every moment, and the server starts again", async () => {
    const random = randomSource(4242);
    const fullCount = MATERIALS * study.responseKeys.length * REPLICATES;
    const materialCodes = study.materials.map((m) => m.code);

    // One uninterrupted import first: it must work, and its duration spreads the kill moments over it.
    const firstCsv = fullResultsCsv(materialCodes, study.responseKeys, REPLICATES, random);
    expect(firstCsv.length).toBeLessThan(2 * 1024 * 1024);
    const started = Date.now();
    const first = await sendImport(firstCsv);
    const importMs = Date.now() - started;
    expect(first.status).toBe(DATA_REDIRECT_STATUS);
    expect((await storedResults()).size).toBe(fullCount);

    let rowsLost = 0;
    const outcomes: string[] = [];
    for (const fraction of KILL_AT) {
      const before = await storedResults();
      const csv = fullResultsCsv(materialCodes, study.responseKeys, REPLICATES, random);
      const answer = sendImport(csv).then(
        (response) => `answered ${response.status}`,
        () => "cut off",
      );
      await new Promise((resolve) => setTimeout(resolve, Math.round(fraction * importMs)));
      await server.kill();
      const reply = await answer;
      server = await startServer({}, { databaseUrl });
      expect((await fetch(`${server.url}/healthz`)).status).toBe(200);

      const after = await storedResults();
      const imported = fileResults(csv);
      const state = same(after, imported) ? "complete" : same(after, before) ? "absent" : "partial";
      if (state === "partial") rowsLost += [...imported].filter(([key, value]) => after.get(key) !== value && before.get(key) !== value).length || Math.abs(fullCount - after.size);
      outcomes.push(`${Math.round(fraction * importMs)} ms: ${state} (${reply})`);
      const [integrity] = await db.all<{ integrity_check: string }>(sql`PRAGMA integrity_check`);
      expect(integrity!.integrity_check).toBe("ok");
    }
    recordFigure("crash", "rowsLost", rowsLost);
    expect(outcomes.filter((o) => o.includes("partial"))).toEqual([]);
    expect(rowsLost).toBe(0);
    // An answered import must have been stored: a 200 followed by an absent import would be a lost write.
    expect(outcomes.filter((o) => o.includes("absent (answered 200"))).toEqual([]);

    // After the crashes the server imports as before.
    const lastCsv = fullResultsCsv(materialCodes, study.responseKeys, REPLICATES, random);
    expect((await sendImport(lastCsv)).status).toBe(DATA_REDIRECT_STATUS);
    expect(same(await storedResults(), fileResults(lastCsv))).toBe(true);
    console.info(`import of ${fullCount} rows took ${importMs} ms; kills: ${outcomes.join("; ")}`);
  }, 150_000);
});
