/**
 * Writers at the same moment: twenty labs submitting a material at once
 * through the real built server, and two amendments of one cell racing each
 * other. Nobody may meet a database-busy error or a 5xx, every submitted value
 * must be stored, and of two racing amendments exactly one wins while the
 * other is told, so nothing is silently overwritten.
 */
import { and, eq } from "drizzle-orm";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { db } from "~/db/client.server";
import { amendments, cells, materials, responses, results } from "~/db/schema";
import { amendResult } from "~/models/results.server";
import { seedDemo } from "../../seed/seed";
import { useFreshDatabase } from "../support/database";
import { type RunningServer, startServer } from "../support/server";
import { DATA_REDIRECT_STATUS, demoStudyId, enrollmentOf, prepareDatabaseFile, randomSource, signInOverHttp, TEST_PASSWORD, createTestingStudy, type TestingStudy } from "./support";

const LABS = 20;

describe("twenty labs submitting at the same moment", () => {
  let server: RunningServer;
  let study: TestingStudy;

  beforeAll(async () => {
    const prepared = await prepareDatabaseFile(() => createTestingStudy({ code: "CONC-20", materialCount: 1, replicates: 3, labCount: LABS }));
    study = prepared;
    server = await startServer({}, { databaseUrl: prepared.databaseUrl });
  });

  afterAll(() => server?.stop());

  it("stores every result of every lab, and every answer sends the page on", async () => {
    const random = randomSource(2020);
    const material = study.materials[0]!;
    const labs = await Promise.all(
      study.labs.map(async (lab, i) => {
        const values: Record<string, string> = {};
        for (const key of study.responseKeys) for (let replicate = 1; replicate <= study.replicates; replicate++) values[`${key}:${replicate}`] = String(random.int(2, 30));
        const rows = Object.entries(values).map(([key, value]) => {
          const [response, replicate] = key.split(":");
          return { response: response!, replicate: Number(replicate), value, testedOn: "2026-11-20", operator: `Operator ${i + 1}`, readVersion: 0 };
        });
        const draft = { rows, fresh: {} };
        return { ...lab, values, draft, cookie: await signInOverHttp(server.url, lab.email, TEST_PASSWORD) };
      }),
    );

    const answers = await Promise.all(
      labs.map((lab) =>
        fetch(`${server.url}/lab/studies/${study.studyId}/results/${material.id}.data`, {
          method: "POST",
          headers: { "Content-Type": "application/x-www-form-urlencoded", Origin: server.url, Cookie: lab.cookie },
          body: new URLSearchParams({ intent: "submit", draft: JSON.stringify(lab.draft) }),
        }).then(async (response) => ({ status: response.status, body: await response.text() })),
      ),
    );
    expect(answers.map((a) => a.status)).toEqual(labs.map(() => DATA_REDIRECT_STATUS));
    expect(answers.every((a) => a.body.includes(`/lab/studies/${study.studyId}/results/${material.id}`))).toBe(true);
    expect(server.output()).not.toMatch(/SQLITE_BUSY|database is locked/);

    const studyResponses = await db.select().from(responses).where(eq(responses.studyId, study.studyId));
    for (const lab of labs) {
      const labCells = await db.select().from(cells).where(eq(cells.enrollmentId, lab.enrollmentId));
      expect(labCells.map((c) => c.status)).toEqual(study.responseKeys.map(() => "submitted"));
      const stored = await db
        .select({ cellId: results.cellId, replicate: results.replicate, value: results.value })
        .from(results)
        .innerJoin(cells, eq(cells.id, results.cellId))
        .where(eq(cells.enrollmentId, lab.enrollmentId));
      const storedValues = Object.fromEntries(
        stored.map((r) => {
          const responseId = labCells.find((c) => c.id === r.cellId)!.responseId;
          return [`${studyResponses.find((x) => x.id === responseId)!.key}:${r.replicate}`, String(r.value)];
        }),
      );
      expect(storedValues).toEqual(lab.values);
    }
  }, 60_000);
});

describe("two amendments of one cell at the same moment", () => {
  beforeAll(async () => {
    await useFreshDatabase();
    await seedDemo(db);
  });

  it("lets exactly one win; the other is told someone changed it, and the stored value is the winner's", async () => {
    const studyId = await demoStudyId("FF-2026-B");
    const enrollment = await enrollmentOf(studyId, "analyst1@ringbatch.example"); // every cell submitted
    const material = (await db.query.materials.findFirst({ where: and(eq(materials.studyId, studyId), eq(materials.code, "F1")) }))!;
    const response = (await db.query.responses.findFirst({ where: and(eq(responses.studyId, studyId), eq(responses.key, "holes")) }))!;
    const cell = (await db.query.cells.findFirst({ where: and(eq(cells.enrollmentId, enrollment.id), eq(cells.materialId, material.id), eq(cells.responseId, response.id)) }))!;
    const before = (await db.query.results.findFirst({ where: and(eq(results.cellId, cell.id), eq(results.replicate, 1)) }))!;
    const analyst = (await db.query.users.findFirst({ where: (u, { eq }) => eq(u.email, "analyst1@ringbatch.example") }))!;
    const [first, second] = [before.value + 5, before.value + 6];

    const outcomes = await Promise.all(
      [first, second].map((value) =>
        amendResult(enrollment, material.id, { responseId: response.id, replicate: 1, value: String(value), reason: "Transcription error on the sheet", expectedVersion: cell.version }, analyst),
      ),
    );

    const winners = outcomes.flatMap((o, i) => (o.ok ? [[first, second][i]!] : []));
    expect(winners).toHaveLength(1);
    const loser = outcomes.find((o) => !o.ok)!;
    expect(loser).toEqual({ ok: false, field: "form", message: expect.stringMatching(/^Someone changed this result after you opened the page/) });
    const after = (await db.query.results.findFirst({ where: eq(results.id, before.id) }))!;
    expect(after.value).toBe(winners[0]);
    const trail = await db.select().from(amendments).where(eq(amendments.cellId, cell.id));
    expect(trail.map((a) => [a.oldValue, a.newValue])).toEqual([[before.value, winners[0]]]);
    expect((await db.query.cells.findFirst({ where: eq(cells.id, cell.id) }))!.version).toBe(cell.version + 1);
  });
});
