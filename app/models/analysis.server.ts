/**
 * Feeds a study's submitted results and the coordinator's cell decisions to
 * the precision engine. Results are identified by blind lab codes only, so
 * the same figures can go to coordinators and reviewers alike.
 */
import { and, asc, eq, ne, sql } from "drizzle-orm";
import { LRUCache } from "lru-cache";
import { db, type Transaction } from "~/db/client.server";
import { cellDecisions, cells, enrollments, labs, materials, responses, results, studies, type Study } from "~/db/schema";
import { cellNames, withCellContext } from "~/models/cell-context.server";
import { analyzeStudy, type ExcludedCell, type StudyAnalysis } from "~/lib/precision";
import type { MaterialResults } from "~/lib/review/what-if";


export type StudyResultRow = {
  cellId: number;
  labCode: string;
  labName: string;
  material: string;
  response: string;
  replicate: number;
  value: number;
  testedOn: string | null;
  operator: string;
  status: "draft" | "submitted";
  amended: boolean;
  /** The stored replicate's version, which a writer names to refuse overwriting a later value. */
  version: number;
};

/**
 * Every result of the study in long form, ordered by lab code, material,
 * response and replicate; `withoutWithdrawn` leaves out labs withdrawn from
 * the study (their results are kept, but no longer analysed); `enrollmentId`
 * keeps one lab's.
 */
export async function studyResultRows(
  studyId: number,
  { submittedOnly = false, withoutWithdrawn = false, enrollmentId, material }: { submittedOnly?: boolean; withoutWithdrawn?: boolean; enrollmentId?: number; material?: string } = {},
): Promise<StudyResultRow[]> {
  const rows = await withCellContext(
    db
      .select({
        cellId: cells.id,
        labCode: enrollments.labCode,
        labName: labs.name,
        material: materials.code,
        response: responses.key,
        replicate: results.replicate,
        value: results.value,
        testedOn: results.testedOn,
        operator: results.operator,
        status: cells.status,
        amended: cells.amended,
        version: results.version,
      })
      .from(results)
      .innerJoin(cells, eq(cells.id, results.cellId))
      .$dynamic(),
  )
    .innerJoin(labs, eq(labs.id, enrollments.labId))
    .where(
      and(
        eq(enrollments.studyId, studyId),
        submittedOnly ? eq(cells.status, "submitted") : undefined,
        withoutWithdrawn ? ne(enrollments.state, "withdrawn") : undefined,
        enrollmentId === undefined ? undefined : eq(enrollments.id, enrollmentId),
        material === undefined ? undefined : eq(materials.code, material),
      ),
    )
    .orderBy(asc(enrollments.labCode), asc(materials.sortOrder), asc(responses.sortOrder), asc(results.replicate));
  return rows.map((r) => ({ ...r, labCode: r.labCode ?? "—" }));
}

/** Lab codes of the labs withdrawn from the study, whose results the analysis leaves out. */
export async function withdrawnLabCodes(studyId: number) {
  const rows = await db
    .select({ code: enrollments.labCode })
    .from(enrollments)
    .where(and(eq(enrollments.studyId, studyId), eq(enrollments.state, "withdrawn")))
    .orderBy(asc(enrollments.labCode));
  return rows.flatMap((r) => (r.code ? [r.code] : []));
}

/** The study's excluded cells, by lab code, as the engine takes them. */
export async function excludedCells(studyId: number): Promise<ExcludedCell[]> {
  const rows = await withCellContext(
    db
      .select({ ...cellNames, reason: cellDecisions.reason })
      .from(cellDecisions)
      .innerJoin(cells, eq(cells.id, cellDecisions.cellId))
      .$dynamic(),
  )
    .where(and(eq(enrollments.studyId, studyId), eq(cellDecisions.decision, "excluded")));
  return rows.map((r) => ({ ...r, lab: r.lab ?? "—" }));
}

/**
 * Moves the study's data version on, inside the transaction of a write that
 * changes what the analysis reads (results, cell decisions, a withdrawn lab).
 */
export function bumpDataVersion(tx: Transaction, studyId: number) {
  return tx.update(studies).set({ dataVersion: sql`${studies.dataVersion} + 1` }).where(eq(studies.id, studyId));
}

async function studyResponseKinds(studyId: number) {
  const kinds = await db.select({ key: responses.key, kind: responses.kind }).from(responses).where(eq(responses.studyId, studyId));
  return Object.fromEntries(kinds.map((k) => [k.key, k.kind]));
}

/**
 * What the analysis reads of one material, for the page to preview an
 * exclusion itself: the same rows, kinds and significance level as the server's
 * analysis (see `materialWhatIf`).
 */
export async function materialResults(study: Study, material: string, alpha: number): Promise<MaterialResults> {
  const [rows, responseKinds] = await Promise.all([
    studyResultRows(study.id, { submittedOnly: true, withoutWithdrawn: true, material }),
    studyResponseKinds(study.id),
  ]);
  return { material, alpha, responseKinds, results: rows.map((r) => ({ lab: r.labCode, response: r.response, replicate: r.replicate, value: r.value })) };
}

// Analyses are pure functions of (data version, alpha, exclusions): cache them by that key, with
// their JSON. A stale entry can never be served: any change of results or decisions bumps data_version,
// so the saved decisions need no lookup on a hit.
type CachedAnalysis = { analysis: StudyAnalysis; json?: string };
const cache = new LRUCache<string, CachedAnalysis>({ max: 50 });

function cacheKey(study: Study, options: { alpha?: number; exclusions?: ExcludedCell[] }) {
  const whatIf = options.exclusions?.map((e) => [e.lab, e.material, e.response]) ?? "saved";
  return JSON.stringify([study.id, study.dataVersion, options.alpha ?? study.significanceLevel, whatIf]);
}

async function cachedAnalysis(study: Study, options: { alpha?: number; exclusions?: ExcludedCell[] }) {
  const alpha = options.alpha ?? study.significanceLevel;
  const key = cacheKey(study, options);
  const hit = cache.get(key);
  if (hit) return hit;
  const [rows, responseKinds, exclusions] = await Promise.all([
    studyResultRows(study.id, { submittedOnly: true, withoutWithdrawn: true }),
    studyResponseKinds(study.id),
    options.exclusions ?? excludedCells(study.id),
  ]);
  const analysis = analyzeStudy(
    rows.map((r) => ({ lab: r.labCode, material: r.material, response: r.response, replicate: r.replicate, value: r.value })),
    { alpha, excludedCells: exclusions, responseKinds },
  );
  const entry: CachedAnalysis = { analysis };
  cache.set(key, entry);
  return entry;
}

/**
 * The precision analysis of a study's submitted results with its decisions
 * applied, or with `exclusions` instead (a what-if before a decision is saved).
 */
export async function studyAnalysis(study: Study, options: { alpha?: number; exclusions?: ExcludedCell[] } = {}) {
  return (await cachedAnalysis(study, options)).analysis;
}

/** The same analysis as JSON text, serialised once per cache entry (the API sends it as is). */
export async function studyAnalysisJson(study: Study, options: { alpha?: number; exclusions?: ExcludedCell[] } = {}) {
  const entry = await cachedAnalysis(study, options);
  entry.json ??= JSON.stringify(entry.analysis);
  return entry.json;
}
