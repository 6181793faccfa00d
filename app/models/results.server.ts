/**
 * A lab's results: draft saves, import, submission and amendments. Every
 * function takes the enrollment from the access guard, never from a form, so
 * an analyst reaches only their own lab's cells. Each write records its audit
 * event and bumps the study's data version in the same transaction.
 */
import { and, asc, desc, eq, inArray, min, sql } from "drizzle-orm";
import { db, type Transaction } from "~/db/client.server";
import { amendments, auditEvents, batches, cells, enrollments, labs, materials, queries, responses, results, shipments, studies, users, type Study } from "~/db/schema";
import { recordAudit } from "~/server/audit.server";
import type { TemplateRow } from "~/lib/results/results-template";
import { cellKey, type ResolvedRow, resolveResultRows, type ResultInputRow, type RowProblem } from "~/lib/results/rows";
import { cellStatusOf } from "~/lib/cell-status";
import { shownMaterial } from "~/lib/shown-material";
import { countOf } from "~/lib/format";
import { checkResultValue, outsidePlausibleRange } from "~/lib/results/values";
import { PHOTO_MAX_BYTES } from "~/lib/results/entry-forms";
import { enrollmentRefusal, writeRefusal } from "~/lib/write-rules";
import { IMAGE_TYPES, storeUpload, UploadError } from "~/server/uploads.server";
import { bumpDataVersion, studyResultRows } from "~/models/analysis.server";

export type Enrollment = typeof enrollments.$inferSelect;
type Actor = { id: number };

/** A refusal with a message for the person, shown beside the form. */
export class ResultsError extends Error {}

/** When a lab's results may change (~/lib/write-rules): the study's state allows it, and the lab is still in it. */
export function assertResultsEditable(study: Pick<Study, "state">, enrollment: Pick<Enrollment, "state">, kind: "results" | "corrections" = "results") {
  const refusal = writeRefusal(kind, study.state) ?? enrollmentRefusal(enrollment.state);
  if (refusal) throw new ResultsError(refusal);
}

/**
 * The correction query that lets a lab amend a submitted cell after testing:
 * raised by the coordinator asking for a correction, and not yet closed.
 * While testing no query is needed (null); after testing without one, refused.
 */
export async function correctionQueryFor(study: Pick<Study, "state">, cellId: number): Promise<number | null> {
  if (study.state === "testing") return null;
  const [open] = await db
    .select({ id: queries.id })
    .from(queries)
    .where(and(eq(queries.cellId, cellId), eq(queries.asksCorrection, true), inArray(queries.state, ["open", "answered"])))
    .orderBy(desc(queries.id))
    .limit(1);
  if (!open) throw new ResultsError("Testing is over: a submitted result can be corrected only while the coordinator's correction query on this cell is open.");
  return open.id;
}

export type { ResultInputRow, RowField, RowProblem } from "~/lib/results/rows";

async function studyFrame(studyId: number) {
  const [study, studyMaterials, studyResponses] = await Promise.all([
    db.query.studies.findFirst({ where: eq(studies.id, studyId) }),
    db.select().from(materials).where(eq(materials.studyId, studyId)).orderBy(asc(materials.sortOrder), asc(materials.code)),
    db.select().from(responses).where(eq(responses.studyId, studyId)).orderBy(asc(responses.sortOrder)),
  ]);
  if (!study) throw new ResultsError("The study no longer exists.");
  return { study, materials: studyMaterials, responses: studyResponses };
}

/** The first day the lab received materials of the study; tests are not dated before it. */
export async function receivedOnOf(enrollmentId: number) {
  const [first] = await db
    .select({ on: min(shipments.receivedOn) })
    .from(shipments)
    .where(and(eq(shipments.enrollmentId, enrollmentId), eq(shipments.status, "received")));
  return first?.on ?? null;
}
type StudyFrame = Awaited<ReturnType<typeof studyFrame>>;

async function enrollmentCells(executor: Pick<typeof db, "select">, enrollmentId: number) {
  const rows = await executor.select().from(cells).where(eq(cells.enrollmentId, enrollmentId));
  return new Map(rows.map((c) => [cellKey(c.materialId, c.responseId), c]));
}

/** Checks rows against the study and the lab's cells; rows with a problem are left out of `resolved`. */
function resolveRows(frame: StudyFrame & { receivedOn: string | null }, existingCells: Map<string, typeof cells.$inferSelect>, rows: ResultInputRow[], options: { valueRequired: boolean }) {
  const submittedCells = new Set([...existingCells].filter(([, c]) => c.status === "submitted").map(([key]) => key));
  return resolveResultRows(
    {
      replicatesPerCell: frame.study.replicatesPerCell,
      materials: frame.materials,
      responses: frame.responses,
      submittedCells,
      receivedOn: frame.receivedOn,
      studyEnd: frame.study.resultsDue,
    },
    rows,
    options,
  );
}

async function entryFrame(enrollment: Enrollment) {
  const [frame, receivedOn] = await Promise.all([studyFrame(enrollment.studyId), receivedOnOf(enrollment.id)]);
  return { ...frame, receivedOn };
}

type Change = { material: string; response: string; replicate: number; before: number | null; after: number | null };

/** A draft save that found the replicate changed by someone else since it was read: nothing of it was written. */
export type DraftConflict = {
  row: number;
  material: string;
  response: string;
  replicate: number;
  theirValue: number | null;
  /** The stored replicate's version now (0: none stored), for a writer to read again and resend. */
  currentVersion: number;
  by: string;
  yourValue: number | null;
  message: string;
};

type StoredResult = typeof results.$inferSelect;

/** The lab's cells and their stored replicates, keyed for the rows that name them. */
async function storedResults(executor: Pick<typeof db, "select">, enrollmentId: number) {
  const cellByKey = await enrollmentCells(executor, enrollmentId);
  const cellIds = [...cellByKey.values()].map((c) => c.id);
  const stored = cellIds.length ? await executor.select().from(results).where(inArray(results.cellId, cellIds)) : [];
  const storedByKey = new Map(stored.map((r) => [`${r.cellId}:${r.replicate}`, r]));
  return (row: Pick<ResolvedRow, "materialId" | "responseId" | "replicate">) => {
    const cell = cellByKey.get(cellKey(row.materialId, row.responseId));
    return { cell, before: cell && storedByKey.get(`${cell.id}:${row.replicate}`) };
  };
}

/** Whether the row would change the stored replicate, and whether that replicate moved on from the version the row was read at. */
function compareWithStored(row: ResolvedRow, before: StoredResult | undefined) {
  const unchanged = before ? before.value === row.value && before.testedOn === row.testedOn && before.operator === row.operator : row.value === null;
  const conflict = !unchanged && row.readVersion !== undefined && row.readVersion !== (before?.version ?? 0);
  return { unchanged, conflict };
}

/** Where a conflict's message says the row was read, and what to do now. */
export type ConflictWording = { since: string; outcome: string };

const PAGE_CONFLICT: ConflictWording = {
  since: "after you opened the page",
  outcome: "was not saved. The page now shows their value; enter yours again if it is the right one.",
};

async function conflictOf(executor: Pick<typeof db, "query">, row: ResolvedRow, before: StoredResult | undefined, responseName: string, wording: ConflictWording): Promise<DraftConflict> {
  const by = before?.updatedBy ? ((await executor.query.users.findFirst({ where: eq(users.id, before.updatedBy), columns: { name: true } }))?.name ?? "someone") : "someone";
  const theirValue = before?.value ?? null;
  const where = `${row.materialCode}, ${responseName.toLowerCase()}, replicate ${row.replicate}`;
  const theirs = theirValue === null ? "cleared it" : `saved ${theirValue}`;
  const yours = row.value === null ? "clearing it" : `your ${row.value}`;
  const message = `${where}: ${by} ${theirs} ${wording.since}, so ${yours} ${wording.outcome}`;
  return { row: row.row, material: row.materialCode, response: row.responseKey, replicate: row.replicate, theirValue, currentVersion: before?.version ?? 0, by, yourValue: row.value, message };
}

/**
 * Writes resolved rows (an empty value clears a draft replicate); returns what
 * actually changed. A row that names the version it read is written only if
 * the stored replicate is still at that version; otherwise it is returned as
 * a conflict with the other person's value, and nothing of it is written.
 */
async function writeRows(tx: Transaction, enrollment: Enrollment, rows: ResolvedRow[], user: Actor, responseNames: Map<number, string> = new Map(), wording = PAGE_CONFLICT) {
  const existing = await enrollmentCells(tx, enrollment.id);
  const missing = [...new Set(rows.filter((r) => r.value !== null).map((r) => cellKey(r.materialId, r.responseId)))].filter((k) => !existing.has(k));
  if (missing.length > 0) {
    await tx
      .insert(cells)
      .values(missing.map((k) => ({ enrollmentId: enrollment.id, materialId: Number(k.split(":")[0]), responseId: Number(k.split(":")[1]) })))
      .onConflictDoNothing();
  }
  const find = await storedResults(tx, enrollment.id);

  const changes: Change[] = [];
  const conflicts: DraftConflict[] = [];
  const touchedCells = new Set<number>();
  for (const row of rows) {
    const { cell, before } = find(row);
    const { unchanged, conflict } = compareWithStored(row, before);
    if (unchanged) continue;
    if (conflict) {
      conflicts.push(await conflictOf(tx, row, before, responseNames.get(row.responseId) ?? row.responseKey, wording));
      continue;
    }
    if (!cell || (row.value === null && !before)) continue;
    if (row.value === null) {
      await tx.delete(results).where(eq(results.id, before!.id));
    } else {
      const fields = { value: row.value, testedOn: row.testedOn, operator: row.operator, updatedAt: new Date(), updatedBy: user.id };
      await tx
        .insert(results)
        .values({ cellId: cell.id, replicate: row.replicate, ...fields })
        .onConflictDoUpdate({ target: [results.cellId, results.replicate], set: { ...fields, version: sql`${results.version} + 1` } });
    }
    touchedCells.add(cell.id);
    changes.push({ material: row.materialCode, response: row.responseKey, replicate: row.replicate, before: before?.value ?? null, after: row.value });
  }
  if (touchedCells.size > 0) {
    await tx.update(cells).set({ version: sql`${cells.version} + 1` }).where(inArray(cells.id, [...touchedCells]));
    await bumpDataVersion(tx, enrollment.studyId);
  }
  return { changes, conflicts };
}

const changeTrail = (changes: Change[]) => ({
  before: changes.map(({ before, after: _after, ...where }) => ({ ...where, value: before })),
  after: changes.map(({ after, before: _before, ...where }) => ({ ...where, value: after })),
});

export type DraftSaveOutcome = { saved: number; problems: RowProblem[]; conflicts: DraftConflict[] };

/**
 * Saves draft results; saving the same rows twice changes nothing. Rows with
 * a problem are refused one by one (returned with their row number), the rest
 * are saved, so a half-typed form never blocks the fields already right.
 */
export async function saveDraftResults(enrollment: Enrollment, rows: ResultInputRow[], user: Actor): Promise<DraftSaveOutcome> {
  const frame = await entryFrame(enrollment);
  assertResultsEditable(frame.study, enrollment);
  return db.transaction(async (tx) => {
    const { problems, resolved } = resolveRows(frame, await enrollmentCells(tx, enrollment.id), rows, { valueRequired: false });
    const { changes, conflicts } = await writeRows(tx, enrollment, resolved, user, new Map(frame.responses.map((r) => [r.id, r.name])));
    if (changes.length > 0) {
      await recordAudit(
        { actorUserId: user.id, action: "results.draft_saved", entityType: "enrollment", entityId: enrollment.id, studyId: enrollment.studyId, ...changeTrail(changes) },
        tx,
      );
    }
    return { saved: changes.length, problems, conflicts };
  });
}

/** Where the versions an import checks come from: the file's version column (the template's), or the preview of a file without one. */
export type ImportReadFrom = "template" | "preview" | "api";

const IMPORT_CONFLICT: Record<ImportReadFrom, ConflictWording> = {
  template: {
    since: "after this file's template was downloaded",
    outcome: "cannot be imported over it. Download a fresh template (it has their value), and enter yours there if it is the right one.",
  },
  preview: {
    since: "after the preview of this file",
    outcome: "cannot be imported over it. Choose the file again to see the value stored now, and change the file if yours is the right one.",
  },
  api: {
    since: "after the version you read",
    outcome: "was not written. Read the results again and resend.",
  },
};

/** One row of an import's preview: what the row would change. */
export type PreviewRow = { row: number; storedValue: number | null; readVersion: number; warning?: string };

export type ImportPreview = {
  problems: RowProblem[];
  conflicts: DraftConflict[];
  rows: PreviewRow[];
};

/**
 * What an import of these rows would do, without writing: the problems of
 * each row, the conflicts of rows whose file version is not the stored one,
 * and the version of every replicate as read now, for the confirmation to
 * check when the file carries no versions of its own.
 */
export async function previewImport(enrollment: Enrollment, rows: ResultInputRow[], readFrom: ImportReadFrom): Promise<ImportPreview> {
  const frame = await entryFrame(enrollment);
  const { problems, resolved } = resolveRows(frame, await enrollmentCells(db, enrollment.id), rows, { valueRequired: true });
  const find = await storedResults(db, enrollment.id);
  const names = new Map(frame.responses.map((r) => [r.id, r.name]));
  const conflicts: DraftConflict[] = [];
  const previewRows: PreviewRow[] = [];
  for (const row of resolved) {
    const { before } = find(row);
    if (compareWithStored(row, before).conflict) conflicts.push(await conflictOf(db, row, before, names.get(row.responseId) ?? row.responseKey, IMPORT_CONFLICT[readFrom]));
    previewRows.push({ row: row.row, storedValue: before?.value ?? null, readVersion: before?.version ?? 0, ...(row.warning ? { warning: row.warning } : {}) });
  }
  return { problems, conflicts, rows: previewRows };
}

export type ImportOutcome =
  | { ok: true; imported: number; changed: number; materialIds: number[] }
  | { ok: false; problems: RowProblem[]; conflicts: DraftConflict[] };

/** Unwinds an import's transaction when a row meets a conflict, so nothing of the file is written. */
class ImportConflicts extends Error {
  constructor(readonly conflicts: DraftConflict[]) {
    super("import conflicts");
  }
}

/**
 * Checks every row first; imports all of them in one transaction, or none when
 * any row has a problem or meets a value changed since the version it was read
 * at. Importing the same rows again changes nothing, and records nothing.
 */
export async function importResults(
  enrollment: Enrollment,
  rows: ResultInputRow[],
  user: Actor,
  { fileName = "", readFrom = "template" }: { fileName?: string; readFrom?: ImportReadFrom } = {},
): Promise<ImportOutcome> {
  const frame = await entryFrame(enrollment);
  assertResultsEditable(frame.study, enrollment);
  if (rows.length === 0) return { ok: false, problems: [{ row: 1, field: "value", message: "The file has no result rows with a value." }], conflicts: [] };
  try {
    return await db.transaction(async (tx) => {
      const { problems, resolved } = resolveRows(frame, await enrollmentCells(tx, enrollment.id), rows, { valueRequired: true });
      if (problems.length > 0) return { ok: false as const, problems, conflicts: [] };
      const { changes, conflicts } = await writeRows(tx, enrollment, resolved, user, new Map(frame.responses.map((r) => [r.id, r.name])), IMPORT_CONFLICT[readFrom]);
      if (conflicts.length > 0) throw new ImportConflicts(conflicts);
      const materialIds = [...new Set(resolved.map((r) => r.materialId))];
      if (changes.length === 0) return { ok: true as const, imported: rows.length, changed: 0, materialIds };
      await recordAudit(
        {
          actorUserId: user.id,
          action: "results.imported",
          entityType: "enrollment",
          entityId: enrollment.id,
          studyId: enrollment.studyId,
          ...changeTrail(changes),
          reason: `Import${fileName ? ` of ${fileName}` : ""} (${countOf(rows.length, "row")})`,
        },
        tx,
      );
      return { ok: true as const, imported: rows.length, changed: changes.length, materialIds };
    });
  } catch (error) {
    if (error instanceof ImportConflicts) return { ok: false, problems: [], conflicts: error.conflicts };
    throw error;
  }
}

/** A lab's own stored results with the version of each replicate, for a writer (the API) to name what it read. */
export async function enrollmentResults(enrollment: Enrollment) {
  const rows = await studyResultRows(enrollment.studyId, { enrollmentId: enrollment.id });
  return rows.map(({ material, response, replicate, value, testedOn, operator, version, status }) => ({ material, response, replicate, value, testedOn, operator, version, cellStatus: status }));
}

/** The lab's results template: every replicate of the cells still in draft, with the drafts stored now and their versions. */
export async function resultsTemplate(enrollment: Enrollment): Promise<{ studyCode: string; labCode: string | null; rows: TemplateRow[] }> {
  const frame = await studyFrame(enrollment.studyId);
  const labCells = await enrollmentCells(db, enrollment.id);
  const find = await storedResults(db, enrollment.id);
  const rows: TemplateRow[] = [];
  for (const material of frame.materials) {
    for (const response of frame.responses) {
      if (labCells.get(cellKey(material.id, response.id))?.status === "submitted") continue;
      for (let replicate = 1; replicate <= frame.study.replicatesPerCell; replicate++) {
        const { before } = find({ materialId: material.id, responseId: response.id, replicate });
        rows.push({ material: material.code, response: response.key, replicate, value: before?.value ?? null, testedOn: before?.testedOn ?? null, operator: before?.operator || null, version: before?.version ?? 0 });
      }
    }
  }
  return { studyCode: frame.study.code, labCode: enrollment.labCode, rows };
}

/** What a lab sees on one material's result entry page: its own cells only. */
export async function materialEntry(enrollment: Enrollment, materialId: number) {
  if (!Number.isSafeInteger(materialId)) return null;
  const material = await db.query.materials.findFirst({ where: and(eq(materials.id, materialId), eq(materials.studyId, enrollment.studyId)) });
  if (!material) return null;
  const studyResponses = await db.select().from(responses).where(eq(responses.studyId, enrollment.studyId)).orderBy(asc(responses.sortOrder));
  const materialCells = await db.select().from(cells).where(and(eq(cells.enrollmentId, enrollment.id), eq(cells.materialId, materialId)));
  const cellIds = materialCells.map((c) => c.id);
  const [cellResults, cellAmendments] = cellIds.length
    ? await Promise.all([
        db.select().from(results).where(inArray(results.cellId, cellIds)).orderBy(asc(results.replicate)),
        db
          .select({ id: amendments.id, cellId: amendments.cellId, replicate: amendments.replicate, oldValue: amendments.oldValue, newValue: amendments.newValue, reason: amendments.reason, byName: users.name, createdAt: amendments.createdAt })
          .from(amendments)
          .innerJoin(users, eq(users.id, amendments.byUserId))
          .where(inArray(amendments.cellId, cellIds))
          .orderBy(desc(amendments.createdAt)),
      ])
    : [[], []];
  return {
    material,
    responses: studyResponses.map((response) => {
      const cell = materialCells.find((c) => c.responseId === response.id) ?? null;
      return {
        ...response,
        cell: cell && { id: cell.id, status: cell.status, version: cell.version, amended: cell.amended, submittedAt: cell.submittedAt },
        results: cell ? cellResults.filter((r) => r.cellId === cell.id) : [],
        amendments: cell ? cellAmendments.filter((a) => a.cellId === cell.id) : [],
      };
    }),
  };
}

/** A stored value outside its response's plausible range, listed for the person to confirm before submitting. */
export type UnusualValue = { response: string; replicate: number; value: number; range: string };

export type SubmitOutcome = { ok: true } | { ok: false; problems: string[]; unusual?: UnusualValue[] };

const rangeText = (r: { plausibleMin: number | null; plausibleMax: number | null; unit: string }) => `${r.plausibleMin ?? "…"} to ${r.plausibleMax ?? "…"}${r.unit ? ` ${r.unit}` : ""}`;

/**
 * Submits every response of one material: each needs all its replicates, a
 * test date and an operator. A value outside its plausible range is
 * submitted only with `confirmedUnusual`; otherwise the values are listed
 * back for a second look and nothing is submitted.
 */
export async function submitMaterial(enrollment: Enrollment, materialId: number, user: Actor, { confirmedUnusual = false } = {}): Promise<SubmitOutcome> {
  const frame = await studyFrame(enrollment.studyId);
  assertResultsEditable(frame.study, enrollment);
  const material = frame.materials.find((m) => m.id === materialId);
  if (!material) throw new ResultsError("The study has no such material.");
  return db.transaction(async (tx) => {
    const cellByKey = await enrollmentCells(tx, enrollment.id);
    const problems: string[] = [];
    const toSubmit: { cellId: number; values: number[] }[] = [];
    const unusual: UnusualValue[] = [];
    for (const response of frame.responses) {
      const cell = cellByKey.get(cellKey(material.id, response.id));
      if (cell?.status === "submitted") continue;
      const stored = cell ? await tx.select().from(results).where(eq(results.cellId, cell.id)).orderBy(asc(results.replicate)) : [];
      for (let replicate = 1; replicate <= frame.study.replicatesPerCell; replicate++) {
        const result = stored.find((r) => r.replicate === replicate);
        if (!result) problems.push(`${response.name}, replicate ${replicate}: no value yet.`);
        else if (!result.testedOn || !result.operator) problems.push(`${response.name}, replicate ${replicate}: enter the test date and the operator.`);
        if (result && outsidePlausibleRange(response, result.value)) unusual.push({ response: response.name, replicate, value: result.value, range: rangeText(response) });
      }
      if (cell) toSubmit.push({ cellId: cell.id, values: stored.map((r) => r.value) });
    }
    if (problems.length > 0) return { ok: false as const, problems };
    if (toSubmit.length === 0) return { ok: false as const, problems: [`${material.code} is already submitted.`] };
    if (unusual.length > 0 && !confirmedUnusual) {
      return { ok: false as const, problems: ["Some values are outside their plausible range: check them, then confirm to submit."], unusual };
    }
    const now = new Date();
    await tx
      .update(cells)
      .set({ status: "submitted", submittedAt: now, submittedBy: user.id, version: sql`${cells.version} + 1` })
      .where(inArray(cells.id, toSubmit.map((c) => c.cellId)));
    await bumpDataVersion(tx, enrollment.studyId);
    await recordAudit(
      {
        actorUserId: user.id,
        action: "results.submitted",
        entityType: "enrollment",
        entityId: enrollment.id,
        studyId: enrollment.studyId,
        after: { material: material.code, cells: toSubmit, ...(unusual.length ? { confirmedUnusual: unusual } : {}) },
      },
      tx,
    );
    return { ok: true as const };
  });
}

export type AmendmentInput = { responseId: number; replicate: number; value: string; reason: string; expectedVersion: number; confirmedUnusual?: boolean };
export type AmendmentOutcome = { ok: true } | { ok: false; field: "value" | "reason" | "form"; message: string; unusual?: true };

/**
 * Changes one submitted replicate, with its reason. While testing, any
 * submitted cell; after testing, only a cell with an open correction query,
 * which the amendment names. The cell's version must still be the one the
 * analyst saw: if someone changed it meanwhile, nothing is overwritten and
 * the analyst is told to reload. A value outside the plausible range needs
 * `confirmedUnusual`.
 */
export async function amendResult(enrollment: Enrollment, materialId: number, input: AmendmentInput, user: Actor): Promise<AmendmentOutcome> {
  const frame = await studyFrame(enrollment.studyId);
  assertResultsEditable(frame.study, enrollment, "corrections");
  const response = frame.responses.find((r) => r.id === input.responseId);
  const material = frame.materials.find((m) => m.id === materialId);
  if (!response || !material) throw new ResultsError("The study has no such material or response.");
  const reason = input.reason.trim();
  if (reason.length < 5) return { ok: false, field: "reason", message: "Give the reason for the change (at least 5 characters)." };
  if (reason.length > 1000) return { ok: false, field: "reason", message: "Keep the reason to 1000 characters or fewer." };
  const check = checkResultValue(response, input.value);
  if (check.status === "empty") return { ok: false, field: "value", message: "Enter the corrected value." };
  if (check.status === "refused") return { ok: false, field: "value", message: check.message };
  if (outsidePlausibleRange(response, check.value) && !input.confirmedUnusual) {
    return { ok: false, field: "value", unusual: true, message: `${check.value} is outside the plausible ${rangeText(response)}. Check it, then confirm the amendment.` };
  }
  const existing = (await enrollmentCells(db, enrollment.id)).get(cellKey(materialId, response.id));
  const queryId = existing ? await correctionQueryFor(frame.study, existing.id) : null;
  return db.transaction(async (tx) => {
    const cell = (await enrollmentCells(tx, enrollment.id)).get(cellKey(materialId, response.id));
    if (!cell || cell.status !== "submitted") return { ok: false as const, field: "form" as const, message: "Only submitted results are amended; edit a draft directly." };
    const before = await tx.query.results.findFirst({ where: and(eq(results.cellId, cell.id), eq(results.replicate, input.replicate)) });
    if (!before) return { ok: false as const, field: "form" as const, message: "That replicate has no submitted value." };
    if (before.value === check.value) return { ok: false as const, field: "value" as const, message: "The new value is the same as the submitted one." };
    const bumped = await tx
      .update(cells)
      .set({ version: sql`${cells.version} + 1`, amended: true })
      .where(and(eq(cells.id, cell.id), eq(cells.version, input.expectedVersion)))
      .returning({ id: cells.id });
    if (bumped.length === 0) {
      return {
        ok: false as const,
        field: "form" as const,
        message: "Someone changed this result after you opened the page. Reload to see the current value, then amend again if still needed.",
      };
    }
    await tx.update(results).set({ value: check.value, updatedAt: new Date(), updatedBy: user.id, version: sql`${results.version} + 1` }).where(eq(results.id, before.id));
    await tx.insert(amendments).values({ cellId: cell.id, replicate: input.replicate, oldValue: before.value, newValue: check.value, reason, queryId, byUserId: user.id });
    await bumpDataVersion(tx, enrollment.studyId);
    const where = { material: material.code, response: response.key, replicate: input.replicate };
    await recordAudit(
      { actorUserId: user.id, action: "result.amended", entityType: "cell", entityId: cell.id, studyId: enrollment.studyId, before: { ...where, value: before.value }, after: { ...where, value: check.value, ...(queryId ? { queryId } : {}) }, reason },
      tx,
    );
    return { ok: true as const };
  });
}

/** Stores a surface photo (type judged from its bytes) and links it to every result of that replicate. */
export async function attachReplicatePhoto(enrollment: Enrollment, materialId: number, replicate: number, file: File, user: Actor) {
  const frame = await studyFrame(enrollment.studyId);
  assertResultsEditable(frame.study, enrollment);
  const materialCells = await db.select().from(cells).where(and(eq(cells.enrollmentId, enrollment.id), eq(cells.materialId, materialId)));
  if (materialCells.some((c) => c.status === "submitted")) throw new ResultsError("This material is submitted; its photos are locked with its results.");
  const cellIds = materialCells.map((c) => c.id);
  const replicateResults = cellIds.length
    ? await db.select({ id: results.id }).from(results).where(and(inArray(results.cellId, cellIds), eq(results.replicate, replicate)))
    : [];
  if (replicateResults.length === 0) throw new ResultsError(`Enter a result of replicate ${replicate} before adding its photo.`);
  const attachment = await storeUpload(file, { allowed: IMAGE_TYPES, maxBytes: PHOTO_MAX_BYTES, uploadedBy: user.id });
  await db.transaction(async (tx) => {
    await tx.update(results).set({ photoAttachmentId: attachment.id }).where(inArray(results.id, replicateResults.map((r) => r.id)));
    const materialCode = frame.materials.find((m) => m.id === materialId)?.code;
    await recordAudit(
      { actorUserId: user.id, action: "result.photo_added", entityType: "enrollment", entityId: enrollment.id, studyId: enrollment.studyId, after: { material: materialCode, replicate, attachmentId: attachment.id, contentType: attachment.contentType } },
      tx,
    );
  });
  return attachment;
}

/** Stores the photo, or says why not (study closed, material submitted, not an image), to show beside its replicate. */
export async function attachReplicatePhotoOrRefusal(enrollment: Enrollment, materialId: number, replicate: number, file: File, user: Actor) {
  try {
    await attachReplicatePhoto(enrollment, materialId, replicate, file, user);
    return null;
  } catch (error) {
    if (error instanceof ResultsError || error instanceof UploadError) return error.message;
    throw error;
  }
}

export const RESULTS_LABS_PER_PAGE = 10;

function groupBy<T, K>(items: T[], keyOf: (item: T) => K) {
  const groups = new Map<K, T[]>();
  for (const item of items) {
    const key = keyOf(item);
    const group = groups.get(key);
    if (group) group.push(item);
    else groups.set(key, [item]);
  }
  return groups;
}

/**
 * The coordinator's view: the study's results by lab and material, with cell
 * status and amendments, ten labs a page of one material (the requested one,
 * or the first), so the page stays light as a study grows.
 */
export async function studyResults(studyId: number, labsPage = 1, requestedMaterial: string | null = null) {
  const frame = await studyFrame(studyId);
  const material = shownMaterial(requestedMaterial, frame.materials);
  const shownMaterials = frame.materials.filter((m) => m.code === material);
  const allEnrollments = await db
    .select({ id: enrollments.id, labCode: enrollments.labCode, labName: labs.name, state: enrollments.state })
    .from(enrollments)
    .innerJoin(labs, eq(labs.id, enrollments.labId))
    .where(eq(enrollments.studyId, studyId))
    .orderBy(asc(enrollments.labCode));
  const pageCount = Math.max(1, Math.ceil(allEnrollments.length / RESULTS_LABS_PER_PAGE));
  const page = Number.isSafeInteger(labsPage) ? Math.min(Math.max(1, labsPage), pageCount) : 1;
  const pageEnrollments = allEnrollments.slice((page - 1) * RESULTS_LABS_PER_PAGE, page * RESULTS_LABS_PER_PAGE);
  const studyCells = pageEnrollments.length
    ? await db
        .select()
        .from(cells)
        .where(and(inArray(cells.enrollmentId, pageEnrollments.map((e) => e.id)), inArray(cells.materialId, shownMaterials.map((m) => m.id))))
    : [];
  const cellIds = studyCells.map((c) => c.id);
  const [cellResults, cellAmendments] = cellIds.length
    ? await Promise.all([
        db.select().from(results).where(inArray(results.cellId, cellIds)).orderBy(asc(results.replicate)),
        db
          .select({ cellId: amendments.cellId, replicate: amendments.replicate, oldValue: amendments.oldValue, newValue: amendments.newValue, reason: amendments.reason, byName: users.name, createdAt: amendments.createdAt })
          .from(amendments)
          .innerJoin(users, eq(users.id, amendments.byUserId))
          .where(inArray(amendments.cellId, cellIds))
          .orderBy(desc(amendments.createdAt)),
      ])
    : [[], []];
  const cellByKey = new Map(studyCells.map((c) => [`${c.enrollmentId}:${c.materialId}:${c.responseId}`, c]));
  const resultsByCell = groupBy(cellResults, (r) => r.cellId);
  const amendmentsByCell = groupBy(cellAmendments, (a) => a.cellId);
  const rows = pageEnrollments.flatMap((enrollment) =>
    shownMaterials.map((material) => {
      const materialCells = frame.responses.map((response) => ({ response, cell: cellByKey.get(`${enrollment.id}:${material.id}:${response.id}`) }));
      return {
        enrollmentId: enrollment.id,
        materialId: material.id,
        labCode: enrollment.labCode,
        labName: enrollment.labName,
        withdrawn: enrollment.state === "withdrawn",
        materialCode: material.code,
        cells: materialCells.map(({ response, cell }) => ({
          responseKey: response.key,
          status: cellStatusOf(cell),
          values: cell ? (resultsByCell.get(cell.id) ?? []).map((r) => ({ replicate: r.replicate, value: r.value })) : [],
        })),
        amendments: materialCells.flatMap(({ response, cell }) => (cell ? (amendmentsByCell.get(cell.id) ?? []) : []).map((a) => ({ ...a, responseKey: response.key }))),
      };
    }),
  );
  return { study: frame.study, materials: frame.materials, material, responses: frame.responses, rows, labsPage: page, labsPageCount: pageCount };
}

export const AUDIT_PAGE_SIZE = 25;

/** One page of the study's audit trail, newest first, with who did it; a page past the last shows the last. */
export async function studyAuditTrail(studyId: number, requestedPage: number) {
  const [total] = await db.select({ n: sql<number>`count(*)` }).from(auditEvents).where(eq(auditEvents.studyId, studyId));
  const pageCount = Math.max(1, Math.ceil(total!.n / AUDIT_PAGE_SIZE));
  const page = Number.isSafeInteger(requestedPage) ? Math.min(Math.max(1, requestedPage), pageCount) : 1;
  const events = await db
    .select({ id: auditEvents.id, action: auditEvents.action, entityType: auditEvents.entityType, entityId: auditEvents.entityId, before: auditEvents.before, after: auditEvents.after, reason: auditEvents.reason, createdAt: auditEvents.createdAt, actorName: users.name })
    .from(auditEvents)
    .leftJoin(users, eq(users.id, auditEvents.actorUserId))
    .where(eq(auditEvents.studyId, studyId))
    .orderBy(desc(auditEvents.createdAt), desc(auditEvents.id))
    .limit(AUDIT_PAGE_SIZE)
    .offset((page - 1) * AUDIT_PAGE_SIZE);
  const labCodes = await auditLabCodes(studyId, events);
  return { events: events.map((e) => ({ ...e, labCode: labCodes.get(`${e.entityType}:${e.entityId}`) ?? null })), total: total!.n, page, pageCount };
}

/** The blind lab code each event concerns, keyed "entityType:entityId": through its enrollment, shipment, cell or query. */
async function auditLabCodes(studyId: number, events: { entityType: string; entityId: string | null }[]) {
  const idsOf = (type: string) => [...new Set(events.filter((e) => e.entityType === type && e.entityId !== null).map((e) => Number(e.entityId)))];
  const codes = new Map<string, string | null>();
  const study = await db.select({ id: enrollments.id, labCode: enrollments.labCode }).from(enrollments).where(eq(enrollments.studyId, studyId));
  const codeOf = new Map(study.map((e) => [e.id, e.labCode]));
  for (const id of idsOf("enrollment")) codes.set(`enrollment:${id}`, codeOf.get(id) ?? null);
  const [shipmentRows, cellRows, queryRows] = await Promise.all([
    idsOf("shipment").length ? db.select({ id: shipments.id, enrollmentId: shipments.enrollmentId }).from(shipments).where(inArray(shipments.id, idsOf("shipment"))) : [],
    idsOf("cell").length ? db.select({ id: cells.id, enrollmentId: cells.enrollmentId }).from(cells).where(inArray(cells.id, idsOf("cell"))) : [],
    idsOf("query").length
      ? db.select({ id: queries.id, enrollmentId: cells.enrollmentId }).from(queries).innerJoin(cells, eq(cells.id, queries.cellId)).where(inArray(queries.id, idsOf("query")))
      : [],
  ]);
  for (const [type, rows] of [["shipment", shipmentRows], ["cell", cellRows], ["query", queryRows]] as const) {
    for (const row of rows) codes.set(`${type}:${row.id}`, codeOf.get(row.enrollmentId) ?? null);
  }
  return codes;
}

/** The lab's to-do list in one study: receipt, and per material its batch, results and open queries. */
export async function enrollmentWorklist(enrollment: Enrollment) {
  const frame = await studyFrame(enrollment.studyId);
  const [shipment, labBatches, labCells, openQueries] = await Promise.all([
    db.query.shipments.findFirst({ where: eq(shipments.enrollmentId, enrollment.id), orderBy: desc(shipments.createdAt) }),
    db.select().from(batches).where(eq(batches.enrollmentId, enrollment.id)),
    db.select().from(cells).where(eq(cells.enrollmentId, enrollment.id)),
    db
      .select({ id: queries.id, materialId: cells.materialId })
      .from(queries)
      .innerJoin(cells, eq(cells.id, queries.cellId))
      .where(and(eq(cells.enrollmentId, enrollment.id), eq(queries.state, "open"))),
  ]);
  return {
    study: frame.study,
    shipment: shipment ? { status: shipment.status, receivedOn: shipment.receivedOn, condition: shipment.condition } : null,
    materials: frame.materials.map((material) => {
      const materialCells = labCells.filter((c) => c.materialId === material.id);
      const batch = labBatches.find((b) => b.materialId === material.id);
      const submitted = materialCells.filter((c) => c.status === "submitted").length;
      const status =
        materialCells.length === 0 ? "not_started" : submitted === frame.responses.length ? (materialCells.some((c) => c.amended) ? "amended" : "submitted") : "draft";
      return {
        id: material.id,
        code: material.code,
        description: material.description,
        batchRecorded: Boolean(batch && (batch.batchedAt || batch.slumpMm !== null)),
        moistureEntered: Boolean(batch?.aggregateMoisture && Object.keys(batch.aggregateMoisture).length > 0),
        status: status as "not_started" | "draft" | "submitted" | "amended",
        openQueries: openQueries.filter((q) => q.materialId === material.id).length,
      };
    }),
  };
}

/** What the import page names: the study's materials (for links to their entry pages), responses and replicates. */
export async function importFrame(enrollment: Enrollment) {
  const frame = await studyFrame(enrollment.studyId);
  return {
    replicatesPerCell: frame.study.replicatesPerCell,
    materials: frame.materials.map((m) => ({ id: m.id, code: m.code })),
    responses: frame.responses.map((r) => ({ key: r.key, name: r.name, unit: r.unit })),
  };
}
