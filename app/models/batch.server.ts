/**
 * A lab's batch of one material: the day's aggregate moisture and batch
 * volume that its batch sheet is computed from, and the fresh properties
 * measured on it. The arithmetic itself lives in ~/lib/batching.
 */
import { and, asc, eq } from "drizzle-orm";
import { db } from "~/db/client.server";
import { batches, cells, enrollments, freshPropertyTargets, materials, mixtureConstituents, studies } from "~/db/schema";
import { recordAudit } from "~/server/audit.server";
import { checkTolerance, mixtureDesignSchema } from "~/lib/batching";
import { checkFreshReading, FRESH_FIELDS, FRESH_PROPERTY_NAMES, type FreshProperty } from "~/lib/results/fresh";
import { assertResultsEditable, correctionQueryFor, type Enrollment, ResultsError } from "~/models/results.server";

type ConstituentRow = typeof mixtureConstituents.$inferSelect;

/** A stored constituent row in the shape the batching library checks; missing numbers stay missing so the check names them. */
function asConstituent(row: ConstituentRow): Record<string, unknown> {
  const base = { kind: row.kind, name: row.name, ...(row.lot ? { lot: row.lot } : {}) };
  const given = (value: number | null) => value ?? undefined;
  switch (row.kind) {
    case "coarse_aggregate":
    case "fine_aggregate":
      return { ...base, ssdMassKgPerM3: given(row.ssdMassKgPerM3), relativeDensity: given(row.relativeDensity), absorptionPercent: given(row.absorptionPercent) };
    case "admixture":
      return { ...base, dosagePer100kgCementitious: given(row.dosageMlPer100Kg) };
    case "fiber":
      return { ...base, volumeFractionPercent: given(row.volumeFractionPercent), fiberDensity: given(row.fiberDensityKgPerM3) };
    case "air":
      return { ...base, airContentPercent: given(row.airContentPercent) };
    default:
      return { ...base, ssdMassKgPerM3: given(row.ssdMassKgPerM3), relativeDensity: given(row.relativeDensity) };
  }
}

/** The material's mixture design, with each row's constituent id; `problem` when the coordinator's design is incomplete. */
export async function loadMixtureDesign(materialId: number, materialCode: string) {
  const rows = await db.select().from(mixtureConstituents).where(eq(mixtureConstituents.materialId, materialId)).orderBy(asc(mixtureConstituents.sortOrder), asc(mixtureConstituents.id));
  const parsed = mixtureDesignSchema.safeParse({ name: materialCode, constituents: rows.map(asConstituent) });
  return {
    constituentIds: rows.map((r) => r.id),
    design: parsed.success ? parsed.data : null,
    problem: parsed.success ? null : `The mixture design of ${materialCode} is incomplete (${parsed.error.issues[0]?.message}); ask the coordinator.`,
  };
}

/** A material of the study, or undefined (a material id from another study is not found). */
export async function findStudyMaterial(studyId: number, materialId: number) {
  if (!Number.isSafeInteger(materialId)) return undefined;
  return db.query.materials.findFirst({ where: and(eq(materials.id, materialId), eq(materials.studyId, studyId)) });
}

export async function getBatch(enrollmentId: number, materialId: number) {
  return (await db.query.batches.findFirst({ where: and(eq(batches.enrollmentId, enrollmentId), eq(batches.materialId, materialId)) })) ?? null;
}

/**
 * Stores the day's moisture contents (% of oven-dry mass) and batch volume, and
 * the lab's mixer capacity for its next sheets too; all checked by the caller's schema.
 */
export async function saveBatchInputs(
  enrollment: Enrollment,
  materialId: number,
  input: { batchVolumeM3: number; moistureByConstituentId: Record<string, number>; mixerCapacityM3: number | null },
) {
  const study = await db.query.studies.findFirst({ where: eq(studies.id, enrollment.studyId) });
  assertResultsEditable(study!, enrollment);
  const fields = { batchVolumeM3: input.batchVolumeM3, aggregateMoisture: input.moistureByConstituentId };
  await db.transaction(async (tx) => {
    await tx
      .insert(batches)
      .values({ enrollmentId: enrollment.id, materialId, ...fields })
      .onConflictDoUpdate({ target: [batches.enrollmentId, batches.materialId], set: fields });
    await tx.update(enrollments).set({ mixerCapacityM3: input.mixerCapacityM3 }).where(eq(enrollments.id, enrollment.id));
  });
}

export async function freshTargets(studyId: number) {
  const rows = await db.select().from(freshPropertyTargets).where(eq(freshPropertyTargets.studyId, studyId));
  return Object.fromEntries(rows.map((r) => [r.property, { target: r.target, tolerance: r.tolerance }])) as Partial<Record<FreshProperty, { target: number; tolerance: number }>>;
}

export type FreshInput = Partial<Record<FreshProperty, string>> & { batchedAt?: string };
export type FreshProblems = Partial<Record<FreshProperty | "batchedAt" | "reason", string>>;

/**
 * Whether the material's results are submitted: its fresh properties then
 * change only as an amendment with a reason, like the results — while testing,
 * or after it with a correction query open on one of the material's cells.
 */
async function freshAmendmentState(study: typeof studies.$inferSelect, enrollment: Enrollment, materialId: number) {
  const materialCells = await db.select().from(cells).where(and(eq(cells.enrollmentId, enrollment.id), eq(cells.materialId, materialId)));
  const submitted = materialCells.some((c) => c.status === "submitted");
  if (!submitted) {
    assertResultsEditable(study, enrollment);
    return { submitted, queryId: null };
  }
  assertResultsEditable(study, enrollment, "corrections");
  for (const cell of materialCells) {
    const queryId = await correctionQueryFor(study, cell.id).catch((error: unknown) => {
      if (error instanceof ResultsError) return undefined;
      throw error;
    });
    if (queryId !== undefined) return { submitted, queryId };
  }
  throw new ResultsError("Testing is over: fresh properties can be corrected only while a correction query on this material is open.");
}

const DATE_TIME = /^\d{4}-\d{2}-\d{2}T\d{2}:\d{2}$/;

/**
 * Saves the batch's fresh properties. A refused reading is left as it was
 * stored and named in the problems; a reading out of the study's tolerance is
 * saved (the coordinator sees the mark), never dropped.
 */
export async function saveFreshProperties(enrollment: Enrollment, materialId: number, input: FreshInput, user: { id: number }, amendment: { reason?: string } = {}) {
  const study = await db.query.studies.findFirst({ where: eq(studies.id, enrollment.studyId) });
  const { submitted, queryId } = await freshAmendmentState(study!, enrollment, materialId);
  const reason = amendment.reason?.trim() ?? "";
  const targets = await freshTargets(enrollment.studyId);
  const problems: FreshProblems = {};
  const fields: Partial<typeof batches.$inferInsert> = {};
  for (const property of FRESH_PROPERTY_NAMES) {
    if (input[property] === undefined) continue;
    const check = checkFreshReading(property, input[property], targets[property]);
    if (check.status === "refused") problems[property] = check.message;
    else fields[FRESH_FIELDS[property].column] = check.status === "ok" ? check.value : null;
  }
  if (input.batchedAt !== undefined) {
    const text = input.batchedAt.trim();
    if (text !== "" && !DATE_TIME.test(text)) problems.batchedAt = "Enter the date and time of batching.";
    else fields.batchedAt = text || null;
  }
  const before = await getBatch(enrollment.id, materialId);
  // Only the readings that differ from what is stored count: an autosave of the same values writes nothing and logs nothing.
  const stored = (before ?? {}) as Record<string, unknown>;
  const changedKeys = Object.entries(fields)
    .filter(([key, value]) => (stored[key] ?? null) !== value)
    .map(([key]) => key);
  const changed = changedKeys.length > 0;
  if (changed && submitted && reason.length < 5) problems.reason = "The results of this material are submitted: give the reason for the change (at least 5 characters).";
  if (changed && !problems.reason) {
    await db.transaction(async (tx) => {
      await tx
        .insert(batches)
        .values({ enrollmentId: enrollment.id, materialId, ...fields })
        .onConflictDoUpdate({ target: [batches.enrollmentId, batches.materialId], set: fields });
      await recordAudit(
        {
          actorUserId: user.id,
          action: submitted ? "batch.fresh_properties_amended" : "batch.fresh_properties_saved",
          entityType: "enrollment",
          entityId: enrollment.id,
          studyId: enrollment.studyId,
          before: Object.fromEntries(changedKeys.map((k) => [k, stored[k] ?? null])),
          after: { ...Object.fromEntries(changedKeys.map((k) => [k, fields[k as keyof typeof fields]])), ...(queryId ? { queryId } : {}) },
          reason: submitted ? reason : null,
        },
        tx,
      );
    });
  }
  return { problems };
}

/**
 * Each lab batch of the study with its fresh properties, and which readings
 * fall outside the study's target ± tolerance, for the coordinator's marks.
 */
export async function studyBatchMarks(studyId: number) {
  const [targets, rows] = await Promise.all([
    freshTargets(studyId),
    db.select({ batch: batches }).from(batches).innerJoin(materials, eq(materials.id, batches.materialId)).where(eq(materials.studyId, studyId)),
  ]);
  return rows.map(({ batch }) => ({
    enrollmentId: batch.enrollmentId,
    materialId: batch.materialId,
    readings: FRESH_PROPERTY_NAMES.flatMap((property) => {
      const value = batch[FRESH_FIELDS[property].column];
      if (value === null) return [];
      const target = targets[property];
      const outside = target ? !checkTolerance(target.target, value, target.tolerance).withinTolerance : false;
      return [{ property, label: FRESH_FIELDS[property].label, unit: FRESH_FIELDS[property].unit, value, outside }];
    }),
  }));
}
