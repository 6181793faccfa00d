/**
 * Over a thousand generated malformed CSV files and JSON bodies (see
 * bad-input.cases.ts) go to the lab's import page and to the results API of
 * the demo's testing study. Each must be refused with a 4xx and a message that
 * names its problem; none may reach a 5xx; afterwards every table holds
 * exactly the rows it held before. The same generator's clean inputs are then
 * accepted, so the refusals are the defects' doing.
 */
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { databaseFingerprint } from "~/db/backup.server";
import { db } from "~/db/client.server";
import { createApiToken } from "~/models/api-token.server";
import { loadSessionUser } from "~/models/user.server";
import * as resultsApi from "~/routes/api/v1/enrollment-results";
import * as importPage from "~/routes/lab/study/import";
import { seedDemo } from "../../seed/seed";
import { useFreshDatabase } from "../support/database";
import { demoCookie } from "../support/demo";
import { postMultipart } from "../support/coordinator";
import { call, type RouteOutcome } from "../support/routes";
import { toastOf } from "../support/replies";
import { CSV_DEFECT_NAMES, csvCases, type Frame, JSON_DEFECT_NAMES, jsonCases, type Sender, validBody, validCsv } from "./bad-input.cases";
import { recordFigure } from "./figures";
import { demoStudyId, enrollmentOf, randomSource } from "./support";

const CSV_CASES = 650;
const JSON_CASES = 550;
const SEED = 20261201;

type Lab = { cookie: string; enrollmentId: number; token?: string };

let studyId: number;
let frame: Frame;
let labs: Record<Sender, Lab>;

beforeAll(async () => {
  await useFreshDatabase();
  await seedDemo(db);
  studyId = await demoStudyId("FF-2026-B");
  const study = await db.query.studies.findFirst({ where: (s, { eq }) => eq(s.id, studyId) });
  frame = {
    materials: (await db.query.materials.findMany({ where: (m, { eq }) => eq(m.studyId, studyId) })).map((m) => m.code),
    responses: (await db.query.responses.findMany({ where: (r, { eq }) => eq(r.studyId, studyId) })).map((r) => r.key),
    replicates: study!.replicatesPerCell,
  };
  // analyst7's lab has entered nothing yet; analyst1's lab has submitted every cell.
  const fresh = await enrollmentOf(studyId, "analyst7@ringbatch.example");
  const submitted = await enrollmentOf(studyId, "analyst1@ringbatch.example");
  const analyst7User = await db.query.users.findFirst({ where: (u, { eq }) => eq(u.email, "analyst7@ringbatch.example") });
  const analyst7 = (await loadSessionUser(analyst7User!.id))!;
  const { token } = await createApiToken(analyst7, { name: "bad-input suite", scope: "results:write", enrollmentId: fresh.id });
  labs = {
    fresh: { cookie: await demoCookie("analyst7@ringbatch.example"), enrollmentId: fresh.id, token },
    submitted: { cookie: await demoCookie("analyst1@ringbatch.example"), enrollmentId: submitted.id },
  };
  // Every case must meet the route's checks, not the API's per-minute limit.
  process.env.API_RATE_LIMIT_PER_MINUTE = "1000000";
});

afterAll(() => {
  delete process.env.API_RATE_LIMIT_PER_MINUTE;
});

/** The import page's check of a file (intent "preview"), or its confirmation with what the check sent back. */
function importCsv(bytes: Uint8Array, lab: Lab, confirm?: { digest: string; seen: string }) {
  const form = new FormData();
  form.set("intent", confirm ? "import" : "preview");
  if (confirm) for (const [key, value] of Object.entries(confirm)) form.set(key, value);
  form.set("file", new File([bytes as BlobPart], "results.csv", { type: "text/csv" }));
  return call(importPage.action, postMultipart(`/lab/studies/${studyId}/import`, form, lab.cookie), { studyId: String(studyId) });
}

/** Session cookie for some cases, the lab's bearer token for others: both callers meet the same checks. */
function postJson(body: Uint8Array, lab: Lab, useToken: boolean, enrollmentParam = String(lab.enrollmentId)) {
  const auth: Record<string, string> = useToken && lab.token ? { Authorization: `Bearer ${lab.token}` } : { Cookie: lab.cookie };
  const request = new Request(`http://ringbatch.test/api/v1/enrollments/${encodeURIComponent(enrollmentParam)}/results`, {
    method: "POST",
    headers: { "Content-Type": "application/json", ...auth },
    body: body as BlobPart,
  });
  return call(resultsApi.action, request, { enrollmentId: enrollmentParam });
}

/** Every message the import page shows: the file field's error, its shape problems, and each row's. */
const importMessages = (data: any): string[] => [
  ...(data?.result?.error?.file ?? []),
  ...(data?.report?.fileProblems ?? []),
  ...(data?.report?.problems ?? []).map((p: { message: string }) => p.message),
];

type Failure = { name: string; status: number; reply: string };

/** How often each kind of defect was drawn: every kind must be tried, alone and in combinations. */
function defectCounts(cases: { name: string }[], names: string[]) {
  return Object.fromEntries(names.map((name) => [name, cases.filter((c) => c.name.split(" + ").includes(name)).length]));
}

function judge(name: string, outcome: RouteOutcome, messages: string[], replyText: string, expected: RegExp[], failures: Failure[]) {
  const clear = messages.some((m) => typeof m === "string" && m.trim().length > 0);
  const named = expected.some((pattern) => pattern.test(replyText));
  if (outcome.status < 400 || outcome.status >= 500 || outcome.status === 429 || !clear || !named) {
    failures.push({ name, status: outcome.status, reply: replyText.slice(0, 300) });
  }
}

describe("generated malformed input", () => {
  let tried = 0;
  let before: Awaited<ReturnType<typeof databaseFingerprint>>;

  beforeAll(async () => {
    before = await databaseFingerprint(db);
  });

  it(`refuses ${CSV_CASES} malformed CSV files with a 4xx that names the problem`, async () => {
    const failures: Failure[] = [];
    const cases = csvCases(randomSource(SEED), frame, CSV_CASES);
    expect(Object.entries(defectCounts(cases, CSV_DEFECT_NAMES)).filter(([, n]) => n < 3)).toEqual([]);
    for (const c of cases) {
      const outcome = await importCsv(c.bytes, labs[c.sender]);
      const messages = importMessages(outcome.data);
      judge(c.name, outcome, messages, messages.join("\n"), c.expect, failures);
      tried++;
    }
    expect(failures.slice(0, 10)).toEqual([]);
  }, 120_000);

  it(`refuses ${JSON_CASES} malformed JSON bodies with a 4xx that names the problem`, async () => {
    const failures: Failure[] = [];
    const cases = jsonCases(randomSource(SEED + 1), frame, JSON_CASES);
    expect(Object.entries(defectCounts(cases, JSON_DEFECT_NAMES)).filter(([, n]) => n < 3)).toEqual([]);
    for (const [i, c] of cases.entries()) {
      const outcome = await postJson(c.body, labs[c.sender], i % 3 === 0, c.enrollmentParam);
      const error = outcome.data?.error;
      judge(c.name, outcome, [error?.message], JSON.stringify(outcome.data), c.expect, failures);
      tried++;
    }
    expect(failures.slice(0, 10)).toEqual([]);
    // A `__proto__` key in a body must not have reached any object's prototype.
    expect(({} as Record<string, unknown>).polluted).toBeUndefined();
  }, 120_000);

  it("leaves every table as it was, row for row", async () => {
    // The rate limiter counts every API request, refused or not, in `rate_limits`; those counters are not stored data.
    const withoutCounters = ({ counts: { rate_limits: _, ...counts }, resultsDigest }: typeof before) => ({ counts, resultsDigest });
    before = withoutCounters(before);
    const after = withoutCounters(await databaseFingerprint(db));
    const lost = Object.keys(before.counts).reduce((sum, table) => sum + Math.abs((after.counts[table] ?? 0) - before.counts[table]!), 0);
    recordFigure("bad-input", "badInputs", tried);
    recordFigure("bad-input", "rowsLost", lost);
    expect(tried).toBe(CSV_CASES + JSON_CASES);
    expect(after).toEqual(before);
  });
});

describe("the same generator's clean inputs", () => {
  it("are imported from CSV, every row", async () => {
    const random = randomSource(SEED + 2);
    for (let i = 0; i < 25; i++) {
      const { bytes, rows } = validCsv(random, frame);
      const checked = await importCsv(bytes, labs.fresh);
      const outcome = await importCsv(bytes, labs.fresh, checked.data?.report?.confirm);
      expect(await toastOf(outcome), new TextDecoder().decode(bytes).slice(0, 300)).toBe(`Imported ${rows} results as drafts. Check them on each material's result page, then submit.`);
    }
  });

  it("are accepted by the API, every row", async () => {
    const random = randomSource(SEED + 3);
    for (let i = 0; i < 25; i++) {
      const { body, rows } = validBody(random, frame);
      const outcome = await postJson(new TextEncoder().encode(body), labs.fresh, i % 2 === 0);
      expect(outcome.status, body.slice(0, 300)).toBe(200);
      expect(outcome.data.received).toBe(rows);
    }
  });
});
