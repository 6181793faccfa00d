/**
 * Study setup: the study itself, its responses, fresh-property targets,
 * protocol, co-coordinators, reviewers and materials. Each change is one
 * transaction with its audit event.
 */
import { and, asc, count, eq, gt, inArray, isNull, ne, notInArray } from "drizzle-orm";
import type { z } from "zod";
import { db } from "~/db/client.server";
import {
  cells,
  enrollments,
  freshPropertyTargets,
  labMembers,
  labs,
  materials,
  mixtureConstituents,
  responses,
  results,
  studies,
  studyCoordinators,
  studyReviewers,
  users,
  type Study,
} from "~/db/schema";
import { recordAudit } from "~/server/audit.server";
import { FieldRefusal } from "~/lib/field-refusal";
import { AIR_CONTENT_TOLERANCE_POINTS, type Constituent, inToMm, slumpTolerance } from "~/lib/batching";
import { type freshTargetsSchema, type materialSchema, type newStudySchema, replicatesProblem, type responseSchema, type studyFields } from "~/lib/study-forms";
import { type WriteKind, writeRefusal } from "~/lib/write-rules";
import { FLOAT_FINISHING_TEMPLATE } from "~/lib/study-templates";
import { insertStudy } from "~/models/study.server";
import { holdsRole, loadSessionUser, normaliseEmail } from "~/models/user.server";

type StudyInput = z.infer<typeof studyFields>;

/** A refusal the page shows beside the named field. */
export class SetupError extends FieldRefusal {}

/** Refuses the write, beside `field`, unless the study's state allows this kind of change (~/lib/write-rules). */
function assertWritable(kind: WriteKind, study: Pick<Study, "state">, field = "form") {
  const refusal = writeRefusal(kind, study.state);
  if (refusal) throw new SetupError(field, refusal);
}

const assertSetupEditable = (study: Pick<Study, "state">, field = "form") => assertWritable("design", study, field);

/** A response or material that already has cells (results) would orphan them if removed. */
async function assertNoCells(column: typeof cells.responseId | typeof cells.materialId, id: number, what: string) {
  const [row] = await db.select({ n: count() }).from(cells).where(eq(column, id));
  if ((row?.n ?? 0) > 0) throw new SetupError("form", `Results are stored for this ${what}; it cannot be removed.`);
}

async function assertCodeFree(code: string, exceptStudyId?: number) {
  const taken = await db.query.studies.findFirst({
    where: exceptStudyId ? and(eq(studies.code, code), ne(studies.id, exceptStudyId)) : eq(studies.code, code),
  });
  if (taken) throw new SetupError("code", "Another study already has this code.");
}

export async function createStudy(ownerId: number, input: z.infer<typeof newStudySchema>) {
  await assertCodeFree(input.code);
  const { template, ...fields } = input;
  if (template === "custom" && fields.testMethod === FLOAT_FINISHING_TEMPLATE.testMethod) {
    throw new SetupError("testMethod", "A custom study needs its own test method name; choose the float finishing template for the float finishing test.");
  }
  return db.transaction(async (tx) => {
    const study = await insertStudy(tx, { ...fields, ownerId });
    if (template === "float_finishing") {
      await tx.insert(responses).values(FLOAT_FINISHING_TEMPLATE.responses.map((r, i) => ({ ...r, studyId: study.id, sortOrder: i })));
      await tx.insert(freshPropertyTargets).values(FLOAT_FINISHING_TEMPLATE.freshTargets.map((t) => ({ ...t, studyId: study.id })));
    }
    await recordAudit({ actorUserId: ownerId, action: "study_created", entityType: "study", entityId: study.id, studyId: study.id, after: input }, tx);
    return study;
  });
}

/**
 * Saves the study's details. Replicates per cell follow the design rule and
 * the significance level the analysis rule; a lower replicate count is
 * refused while any stored result has a higher replicate number.
 */
export async function updateStudy(study: Study, input: StudyInput, actorUserId: number) {
  assertWritable("details", study);
  if (input.replicatesPerCell !== study.replicatesPerCell) {
    assertWritable("design", study, "replicatesPerCell");
    const unsuited = replicatesProblem(study.kind, input.replicatesPerCell);
    if (unsuited) throw new SetupError("replicatesPerCell", unsuited);
    const [beyond] = await db
      .select({ n: count() })
      .from(results)
      .innerJoin(cells, eq(cells.id, results.cellId))
      .innerJoin(materials, eq(materials.id, cells.materialId))
      .where(and(eq(materials.studyId, study.id), gt(results.replicate, input.replicatesPerCell)));
    if ((beyond?.n ?? 0) > 0) throw new SetupError("replicatesPerCell", `${beyond!.n} stored results have a replicate number above ${input.replicatesPerCell}; they would be orphaned.`);
  }
  if (input.significanceLevel !== study.significanceLevel) assertWritable("analysisSettings", study, "significanceLevel");
  await assertCodeFree(input.code, study.id);
  await db.transaction(async (tx) => {
    await tx.update(studies).set(input).where(eq(studies.id, study.id));
    await recordAudit({ actorUserId, action: "study_updated", entityType: "study", entityId: study.id, studyId: study.id, before: study, after: input }, tx);
  });
}

export async function addResponse(study: Study, input: z.infer<typeof responseSchema>, actorUserId: number) {
  assertSetupEditable(study, "key");
  const existing = await db.select().from(responses).where(eq(responses.studyId, study.id));
  if (existing.some((r) => r.key === input.key)) throw new SetupError("key", "This study already has a response with this key.");
  await db.transaction(async (tx) => {
    const [row] = await tx.insert(responses).values({ ...input, studyId: study.id, sortOrder: existing.length }).returning();
    await recordAudit({ actorUserId, action: "response_added", entityType: "response", entityId: row!.id, studyId: study.id, after: input }, tx);
  });
}

export function removeResponse(study: Study, responseId: number, actorUserId: number) {
  return removeDesignPart(study, "response", responseId, actorUserId);
}

/**
 * Stores the slump (in mm) and air targets; a blank tolerance takes the usual
 * one for the target (ASTM C94, from memory — see ~/lib/batching/tolerance).
 */
export async function setFreshTargets(study: Study, input: z.infer<typeof freshTargetsSchema>, actorUserId: number) {
  assertSetupEditable(study, "slumpTarget");
  const rows: (typeof freshPropertyTargets.$inferInsert)[] = [];
  if (input.slumpTarget !== null) {
    const tolerance = input.slumpTolerance ?? slumpTolerance(input.slumpTarget, input.slumpUnit);
    const toMm = (v: number) => (input.slumpUnit === "in" ? inToMm(v) : v);
    rows.push({ studyId: study.id, property: "slump", target: toMm(input.slumpTarget), tolerance: toMm(tolerance) });
  }
  if (input.airTarget !== null) {
    rows.push({ studyId: study.id, property: "air_content", target: input.airTarget, tolerance: input.airTolerance ?? AIR_CONTENT_TOLERANCE_POINTS });
  }
  await db.transaction(async (tx) => {
    await tx.delete(freshPropertyTargets).where(and(eq(freshPropertyTargets.studyId, study.id), inArray(freshPropertyTargets.property, ["slump", "air_content"])));
    if (rows.length) await tx.insert(freshPropertyTargets).values(rows);
    await recordAudit({ actorUserId, action: "fresh_targets_set", entityType: "study", entityId: study.id, studyId: study.id, after: rows }, tx);
  });
}

export async function setProtocol(study: Study, attachmentId: number, actorUserId: number) {
  assertWritable("protocol", study, "protocol");
  await db.transaction(async (tx) => {
    await tx.update(studies).set({ protocolAttachmentId: attachmentId }).where(eq(studies.id, study.id));
    await recordAudit(
      { actorUserId, action: "protocol_attached", entityType: "study", entityId: study.id, studyId: study.id, before: { attachmentId: study.protocolAttachmentId }, after: { attachmentId } },
      tx,
    );
  });
}

const PEOPLE = {
  coordinator: { table: studyCoordinators, roles: ["coordinator", "admin"] as const, what: "a coordinator", rule: "coordinators" },
  reviewer: { table: studyReviewers, roles: ["reviewer"] as const, what: "a committee reviewer", rule: "reviewers" },
} as const;

/** The study's owner adds a co-coordinator or assigns a reviewer by e-mail. */
export async function addPerson(study: Study, kind: keyof typeof PEOPLE, email: string, actorUserId: number) {
  const { table, roles, what, rule } = PEOPLE[kind];
  assertWritable(rule, study, "email");
  const user = await db.query.users.findFirst({ where: eq(users.email, normaliseEmail(email)) });
  if (!user || user.disabledAt) throw new SetupError("email", "No active account has this e-mail.");
  const held = await loadSessionUser(user.id);
  if (!held?.roles.some((r) => (roles as readonly string[]).includes(r))) throw new SetupError("email", `This account is not ${what}.`);
  if (user.id === study.ownerId) throw new SetupError("email", "The owner already coordinates this study.");
  if (kind === "reviewer") {
    const [conflict] = await participatingLabsOf(study.id, [user.id]);
    if (conflict) throw new SetupError("email", `${user.name} works at a participating lab (${conflict.labName}): a reviewer never reviews a study their own lab takes part in.`);
  }
  await db.transaction(async (tx) => {
    const added = await tx.insert(table).values({ studyId: study.id, userId: user.id }).onConflictDoNothing().returning();
    if (added.length === 0) throw new SetupError("email", `This person is already ${what} of the study.`);
    await recordAudit({ actorUserId, action: `${kind}_assigned`, entityType: "user", entityId: user.id, studyId: study.id }, tx);
  });
}

export async function removePerson(study: Study, kind: keyof typeof PEOPLE, userId: number, actorUserId: number) {
  const { table, rule } = PEOPLE[kind];
  assertWritable(rule, study);
  await db.transaction(async (tx) => {
    const removed = await tx.delete(table).where(and(eq(table.studyId, study.id), eq(table.userId, userId))).returning();
    if (removed.length === 0) throw new SetupError("form", "That person is not assigned to this study.");
    await recordAudit({ actorUserId, action: `${kind}_unassigned`, entityType: "user", entityId: userId, studyId: study.id }, tx);
  });
}

export async function addMaterial(study: Study, input: z.infer<typeof materialSchema>, actorUserId: number) {
  assertSetupEditable(study, "code");
  const existing = await db.select({ code: materials.code }).from(materials).where(eq(materials.studyId, study.id));
  if (existing.some((m) => m.code === input.code)) throw new SetupError("code", "This study already has a material with this code.");
  return db.transaction(async (tx) => {
    const [row] = await tx.insert(materials).values({ ...input, studyId: study.id, sortOrder: existing.length }).returning();
    await recordAudit({ actorUserId, action: "material_added", entityType: "material", entityId: row!.id, studyId: study.id, after: input }, tx);
    return row!;
  });
}

export function removeMaterial(study: Study, materialId: number, actorUserId: number) {
  return removeDesignPart(study, "material", materialId, actorUserId);
}

/** The parts of a study's design that setup removes, with the cell column that points at each. */
const DESIGN_PARTS = {
  response: { table: responses, cellColumn: cells.responseId },
  material: { table: materials, cellColumn: cells.materialId },
} as const;

async function removeDesignPart(study: Study, part: keyof typeof DESIGN_PARTS, id: number, actorUserId: number) {
  const { table, cellColumn } = DESIGN_PARTS[part];
  assertSetupEditable(study);
  await assertNoCells(cellColumn, id, part);
  await db.transaction(async (tx) => {
    const removed = await tx.delete(table).where(and(eq(table.id, id), eq(table.studyId, study.id))).returning();
    if (removed.length === 0) throw new SetupError("form", `That ${part} is not part of this study.`);
    await recordAudit({ actorUserId, action: `${part}_removed`, entityType: part, entityId: id, studyId: study.id, before: removed[0] }, tx);
  });
}

/** Labs taking part in the study (invited or enrolled) that these people belong to. */
async function participatingLabsOf(studyId: number, userIds: number[]) {
  if (userIds.length === 0) return [];
  return db
    .select({ userId: labMembers.userId, labName: labs.name })
    .from(labMembers)
    .innerJoin(labs, eq(labs.id, labMembers.labId))
    .innerJoin(enrollments, and(eq(enrollments.labId, labMembers.labId), eq(enrollments.studyId, studyId)))
    .where(and(inArray(labMembers.userId, userIds), inArray(enrollments.state, ["invited", "accepted"])));
}

/**
 * Who the reviewer picker offers: active reviewers not yet assigned, less
 * those who work at a lab taking part in the study, who are listed with why.
 */
export async function reviewerCandidates(study: Study) {
  const assigned = db.select({ id: studyReviewers.userId }).from(studyReviewers).where(eq(studyReviewers.studyId, study.id));
  const reviewers = await db
    .select({ id: users.id, name: users.name, email: users.email })
    .from(users)
    .where(
      and(
        isNull(users.disabledAt),
        notInArray(users.id, assigned),
        holdsRole("reviewer"),
      ),
    )
    .orderBy(asc(users.name));
  const conflicts = await participatingLabsOf(study.id, reviewers.map((r) => r.id));
  return {
    offered: reviewers.filter((r) => !conflicts.some((c) => c.userId === r.id)),
    leftOut: reviewers.flatMap((r) => conflicts.filter((c) => c.userId === r.id).map((c) => ({ ...r, labName: c.labName }))),
  };
}

/** Everything the setup page shows. */
export async function loadSetup(study: Study) {
  const assigned = (table: typeof studyCoordinators | typeof studyReviewers) =>
    db
      .select({ id: users.id, name: users.name, email: users.email })
      .from(table)
      .innerJoin(users, eq(users.id, table.userId))
      .where(eq(table.studyId, study.id))
      .orderBy(asc(users.name));
  const [studyResponses, targets, coordinators, reviewers, studyMaterials, owner, protocol] = await Promise.all([
    db.select().from(responses).where(eq(responses.studyId, study.id)).orderBy(asc(responses.sortOrder)),
    db.select().from(freshPropertyTargets).where(eq(freshPropertyTargets.studyId, study.id)),
    assigned(studyCoordinators),
    assigned(studyReviewers),
    db
      .select({ id: materials.id, code: materials.code, description: materials.description, constituents: count(mixtureConstituents.id) })
      .from(materials)
      .leftJoin(mixtureConstituents, eq(mixtureConstituents.materialId, materials.id))
      .where(eq(materials.studyId, study.id))
      .groupBy(materials.id)
      .orderBy(asc(materials.sortOrder), asc(materials.code)),
    db.query.users.findFirst({ where: eq(users.id, study.ownerId), columns: { id: true, name: true, email: true } }),
    study.protocolAttachmentId
      ? db.query.attachments.findFirst({ where: (a, { eq: is }) => is(a.id, study.protocolAttachmentId!), columns: { id: true, originalName: true } })
      : Promise.resolve(undefined),
  ]);
  return { responses: studyResponses, targets, coordinators, reviewers, materials: studyMaterials, owner: owner!, protocol: protocol ?? null };
}

type ConstituentRow = typeof mixtureConstituents.$inferSelect;

/** A stored row as the batching module's constituent (SI, per m³). */
export function constituentFromRow(row: ConstituentRow): Constituent {
  const base = { name: row.name, lot: row.lot || undefined };
  switch (row.kind) {
    case "admixture":
      return { ...base, kind: row.kind, dosagePer100kgCementitious: row.dosageMlPer100Kg ?? 0 };
    case "fiber":
      return { ...base, kind: row.kind, volumeFractionPercent: row.volumeFractionPercent ?? 0, fiberDensity: row.fiberDensityKgPerM3 ?? 0 };
    case "air":
      return { ...base, kind: row.kind, airContentPercent: row.airContentPercent ?? 0 };
    case "coarse_aggregate":
    case "fine_aggregate":
      return { ...base, kind: row.kind, ssdMassKgPerM3: row.ssdMassKgPerM3 ?? 0, relativeDensity: row.relativeDensity ?? 0, absorptionPercent: row.absorptionPercent ?? 0 };
    default:
      return { ...base, kind: row.kind, ssdMassKgPerM3: row.ssdMassKgPerM3 ?? 0, relativeDensity: row.relativeDensity ?? 0 };
  }
}

function rowFromConstituent(c: Constituent, materialId: number, sortOrder: number): typeof mixtureConstituents.$inferInsert {
  const row: typeof mixtureConstituents.$inferInsert = { materialId, sortOrder, kind: c.kind, name: c.name, lot: c.lot ?? "" };
  switch (c.kind) {
    case "admixture":
      return { ...row, dosageMlPer100Kg: c.dosagePer100kgCementitious };
    case "fiber":
      return { ...row, volumeFractionPercent: c.volumeFractionPercent, fiberDensityKgPerM3: c.fiberDensity };
    case "air":
      return { ...row, airContentPercent: c.airContentPercent };
    case "coarse_aggregate":
    case "fine_aggregate":
      return { ...row, ssdMassKgPerM3: c.ssdMassKgPerM3, relativeDensity: c.relativeDensity, absorptionPercent: c.absorptionPercent };
    default:
      return { ...row, ssdMassKgPerM3: c.ssdMassKgPerM3, relativeDensity: c.relativeDensity };
  }
}

export async function loadMaterial(studyId: number, materialId: number) {
  const material = await db.query.materials.findFirst({ where: and(eq(materials.id, materialId), eq(materials.studyId, studyId)) });
  if (!material) return null;
  const rows = await db.select().from(mixtureConstituents).where(eq(mixtureConstituents.materialId, materialId)).orderBy(asc(mixtureConstituents.sortOrder));
  return { material, constituents: rows.map(constituentFromRow) };
}

/** Saves the material's code, description and mixture design (all rows replaced at once). */
export async function saveMaterial(
  study: Study,
  material: typeof materials.$inferSelect,
  input: z.infer<typeof materialSchema> & { constituents: Constituent[] },
  actorUserId: number,
) {
  assertSetupEditable(study, "code");
  const clash = await db.query.materials.findFirst({
    where: and(eq(materials.studyId, study.id), eq(materials.code, input.code), ne(materials.id, material.id)),
  });
  if (clash) throw new SetupError("code", "This study already has a material with this code.");
  await db.transaction(async (tx) => {
    await tx.update(materials).set({ code: input.code, description: input.description }).where(eq(materials.id, material.id));
    await tx.delete(mixtureConstituents).where(eq(mixtureConstituents.materialId, material.id));
    if (input.constituents.length) {
      await tx.insert(mixtureConstituents).values(input.constituents.map((c, i) => rowFromConstituent(c, material.id, i)));
    }
    await recordAudit({ actorUserId, action: "mixture_design_saved", entityType: "material", entityId: material.id, studyId: study.id, after: input }, tx);
  });
}
