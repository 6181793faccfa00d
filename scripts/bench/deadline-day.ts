/**
 * The deadline-day load run: 40 lab sessions autosaving one replicate every
 * 2 s (± 0.5 s), 5 coordinators polling the study's progress every 5 s with
 * the entity tag of their last answer (as the progress panel does), and 3
 * reviewers opening the large study's review page, all at once for 60 s.
 * Each request is timed from send to last byte. Afterwards every save the
 * server acknowledged is looked up in the database.
 */
import { and, eq, inArray } from "drizzle-orm";
import { db } from "../../app/db/client.server";
import { cells, enrollments, labMembers, responses, results, users } from "../../app/db/schema";

type Kind = "autosave" | "progress poll" | "review page";
export type Timing = { kind: Kind; ms: number; status: number };

const sleep = (ms: number) => new Promise((resolve) => setTimeout(resolve, ms));

/**
 * What the result entry's autosave sends (see `draftChanges`): the replicate
 * that changed, with the version it was read at, which the server checks
 * so that two people never overwrite each other.
 */
function autosaveBody(key: string, value: string, readVersion: number) {
  const [response, replicate] = key.split(":") as [string, string];
  const row = { response, replicate: Number(replicate), value, testedOn: "", operator: "", readVersion };
  return new URLSearchParams({ intent: "draft", draft: JSON.stringify({ rows: [row], fresh: {} }) });
}

/**
 * An analyst's view of one material's replicates, keyed `response:replicate`:
 * the value and version last read (from the database to begin with, a
 * replicate not stored yet being version 0), moved on by each acknowledged save.
 */
export class ReadReplicates {
  private constructor(private readonly read: Map<string, { value: string; version: number }>) {}

  static async of(enrollmentId: number, materialId: number) {
    const stored = await db
      .select({ key: responses.key, replicate: results.replicate, value: results.value, version: results.version })
      .from(results)
      .innerJoin(cells, eq(cells.id, results.cellId))
      .innerJoin(responses, eq(responses.id, cells.responseId))
      .where(and(eq(cells.enrollmentId, enrollmentId), eq(cells.materialId, materialId)));
    return new ReadReplicates(new Map(stored.map((r) => [`${r.key}:${r.replicate}`, { value: String(r.value), version: r.version }])));
  }

  body(key: string, value: string) {
    return autosaveBody(key, value, this.read.get(key)?.version ?? 0);
  }

  /** After the server acknowledged `value`: a new value is a new version, the same value again no write at all. */
  saved(key: string, value: string) {
    const before = this.read.get(key);
    if (before?.value !== value) this.read.set(key, { value, version: (before?.version ?? 0) + 1 });
  }
}

/** The enrollment in the study of each analyst's lab, by e-mail. */
async function enrollmentsOf(studyId: number, analysts: string[]) {
  const rows = await db
    .select({ email: users.email, enrollmentId: enrollments.id })
    .from(users)
    .innerJoin(labMembers, eq(labMembers.userId, users.id))
    .innerJoin(enrollments, and(eq(enrollments.labId, labMembers.labId), eq(enrollments.studyId, studyId)))
    .where(inArray(users.email, analysts));
  return new Map(rows.map((r) => [r.email, r.enrollmentId]));
}

export async function deadlineDay(options: {
  url: string;
  studyId: number;
  materialIds: number[];
  reviewStudyId: number;
  analysts: string[];
  coordinators: string[];
  reviewers: string[];
  signIn: (email: string) => Promise<string>;
  seconds?: number;
}) {
  const { url, studyId, materialIds, seconds = 60 } = options;
  const [analystCookies, coordinatorCookies, reviewerCookies] = await Promise.all([
    Promise.all(options.analysts.map(options.signIn)),
    Promise.all(options.coordinators.map(options.signIn)),
    Promise.all(options.reviewers.map(options.signIn)),
  ]);
  const timings: Timing[] = [];
  const failures: string[] = [];
  const timed = async (kind: Kind, send: () => Promise<Response>) => {
    const start = performance.now();
    try {
      const response = await send();
      const body = await response.text();
      timings.push({ kind, ms: performance.now() - start, status: response.status });
      if (!response.ok && response.status !== 304) failures.push(`${kind}: ${response.status} ${body.slice(0, 120)}`);
      return response;
    } catch (error) {
      timings.push({ kind, ms: performance.now() - start, status: 0 });
      failures.push(`${kind}: ${String(error)}`);
      return null;
    }
  };
  const end = performance.now() + seconds * 1000;
  const running = () => performance.now() < end;

  /** What each analyst's last acknowledged save held: email → material → "response:replicate" → value. */
  const acknowledged = new Map<string, { materialId: number; values: Record<string, string> }>();
  const enrollmentOf = await enrollmentsOf(studyId, options.analysts);
  const analyst = async (cookie: string, index: number) => {
    const materialId = materialIds[index % materialIds.length]!;
    const values: Record<string, string> = {};
    const replicates = await ReadReplicates.of(enrollmentOf.get(options.analysts[index]!)!, materialId);
    let step = 0;
    await sleep(Math.random() * 2000);
    while (running()) {
      // One more replicate typed (or retyped) per save: both responses, replicates 1–5 in turn.
      const key = `${step % 2 === 0 ? "holes" : "surface"}:${(Math.floor(step / 2) % 5) + 1}`;
      const value = String(8 + ((index + step) % 9));
      step++;
      const response = await timed("autosave", () =>
        fetch(`${url}/lab/studies/${studyId}/results/${materialId}.data`, {
          method: "POST",
          headers: { Cookie: cookie, Origin: url, "Content-Type": "application/x-www-form-urlencoded" },
          body: replicates.body(key, value),
        }),
      );
      if (response?.ok) {
        replicates.saved(key, value);
        values[key] = value;
        acknowledged.set(options.analysts[index]!, { materialId, values: { ...values } });
      }
      await sleep(1500 + Math.random() * 1000);
    }
  };
  let polls = 0;
  let notModified = 0;
  const coordinator = async (cookie: string) => {
    let etag: string | null = null;
    await sleep(Math.random() * 5000);
    while (running()) {
      const response = await timed("progress poll", () =>
        fetch(`${url}/api/v1/studies/${studyId}/progress`, { headers: { Cookie: cookie, ...(etag ? { "If-None-Match": etag } : {}) } }),
      );
      polls++;
      if (response?.status === 304) notModified++;
      etag = response?.headers.get("ETag") ?? etag;
      await sleep(5000);
    }
  };
  const reviewer = async (cookie: string) => {
    await sleep(Math.random() * 10_000);
    while (running()) {
      await timed("review page", () => fetch(`${url}/review/${options.reviewStudyId}`, { headers: { Cookie: cookie, "Accept-Encoding": "gzip" } }));
      await sleep(20_000);
    }
  };
  await Promise.all([...analystCookies.map(analyst), ...coordinatorCookies.map(coordinator), ...reviewerCookies.map(reviewer)]);

  // Every acknowledged save, looked up where the server keeps it.
  let checked = 0;
  const missing: string[] = [];
  for (const [email, enrollmentId] of enrollmentOf) {
    const saved = acknowledged.get(email);
    if (!saved) continue;
    const stored = await db
      .select({ key: responses.key, replicate: results.replicate, value: results.value })
      .from(results)
      .innerJoin(cells, eq(cells.id, results.cellId))
      .innerJoin(responses, eq(responses.id, cells.responseId))
      .where(and(eq(cells.enrollmentId, enrollmentId), eq(cells.materialId, saved.materialId)));
    const storedValues = new Map(stored.map((r) => [`${r.key}:${r.replicate}`, r.value]));
    for (const [key, value] of Object.entries(saved.values)) {
      checked++;
      if (storedValues.get(key) !== Number(value)) missing.push(`${email} ${key}: saved ${value}, stored ${storedValues.get(key) ?? "nothing"}`);
    }
  }
  return { timings, failures, checked, missing, polls, notModified };
}
