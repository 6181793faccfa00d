/**
 * Proficiency rounds: a study of kind "proficiency" with its round settings,
 * the coordinator's choices of assigned value and σ_pt, the homogeneity and
 * stability checks, live scores while the round is checked, and the frozen
 * report and scores once it is published.
 */
import { and, asc, desc, eq, inArray, ne, or } from "drizzle-orm";
import { db } from "~/db/client.server";
import {
  cells,
  enrollments,
  freshPropertyTargets,
  labs,
  materials,
  precisionStatements,
  responses,
  results,
  roundAssignments,
  roundCheckResults,
  roundLabUncertainties,
  roundScores,
  roundSettings,
  studies,
  type Study,
  type MaterialCheck,
} from "~/db/schema";
import { FieldRefusal } from "~/lib/field-refusal";
import { writeRefusal } from "~/lib/write-rules";
import {
  algorithmA,
  homogeneityCheck,
  scoreGroup,
  ScoringRefusal,
  stabilityCheck,
  type GroupScores,
  type HomogeneityCheck,
  type SigmaPtChoice,
  type StabilityCheck,
} from "~/lib/proficiency";
import { precisionAtLevel, type PrecisionAtLevel } from "~/lib/comparison";
import type { StudyAnalysis } from "~/lib/precision";
import type { StatementSnapshot } from "~/lib/statement-text";
import { FLOAT_FINISHING_TEMPLATE } from "~/lib/study-templates";
import type { assignmentSchema, checksSchema, newRoundSchema } from "~/lib/round-forms";
import type { SessionUser } from "~/models/user.server";
import { coordinatedBy, insertStudy } from "~/models/study.server";
import { recordAudit } from "~/server/audit.server";
import { appUrl, composeEmail, sendEmail } from "~/server/email.server";
import type { z } from "zod";


/** What a round keeps of the published study it was set up from: the code and the approved statement's frozen analysis. */
type RoundPrecision = { sourceCode: string | null; analysis: StudyAnalysis | null };

/** Whether the round's source study gave precision figures for the response. */
export function hasPublishedPrecision(precision: RoundPrecision, responseKey: string) {
  return precision.analysis?.groups.some((g) => g.status === "computed" && g.response === responseKey) ?? false;
}

function figure(value: number) {
  return Number(value.toPrecision(4)).toString();
}

/** How σ_r and σ_R were found at the round's level, in words for the report and the letters. */
function precisionBasis(found: PrecisionAtLevel) {
  const where =
    found.basis === "level-relation"
      ? `s_r = ${figure(found.sr)} and s_R = ${figure(found.sR)} from the study's fitted level relations at level ${figure(found.level)}`
      : `s_r = ${figure(found.sr)} and s_R = ${figure(found.sR)} of material ${found.material}, the nearest level to ${figure(found.level)}`;
  return found.outsideStudiedRange
    ? `${where}; the level lies outside the studied range ${figure(found.studiedRange[0])}–${figure(found.studiedRange[1])}, so the figures are extrapolated`
    : where;
}

/** Refuses a round's write where the one table of write rules (~/lib/write-rules) does, with its sentence beside `field`. */
function assertRoundWrite(kind: "roundChoices" | "roundChecks" | "labUncertainty", study: Pick<Study, "state">, field = "form") {
  const refusal = writeRefusal(kind, study.state);
  if (refusal) throw new FieldRefusal(field, refusal);
}

/** Rounds the user coordinates (every round for an admin), newest first. */
export async function listRounds(user: SessionUser) {
  return db
    .select({ id: studies.id, code: studies.code, title: studies.title, state: studies.state, resultsDue: studies.resultsDue, createdAt: studies.createdAt })
    .from(studies)
    .where(coordinatedBy(user, "proficiency"))
    .orderBy(desc(studies.createdAt), desc(studies.id));
}

/** Published precision studies a round can be set up from: their statement holds the method's precision. */
export async function publishedPrecisionStudies() {
  return db
    .select({ id: studies.id, code: studies.code, title: studies.title, testMethod: studies.testMethod })
    .from(studies)
    .where(and(eq(studies.kind, "precision"), eq(studies.state, "published")))
    .orderBy(asc(studies.code));
}

async function approvedSnapshot(studyId: number): Promise<StatementSnapshot | null> {
  const [row] = await db
    .select({ snapshot: precisionStatements.snapshot })
    .from(precisionStatements)
    .where(and(eq(precisionStatements.studyId, studyId), eq(precisionStatements.state, "approved")))
    .orderBy(desc(precisionStatements.version))
    .limit(1);
  return (row?.snapshot as StatementSnapshot | undefined) ?? null;
}

/**
 * Creates a round. From a published study it takes the test method, the
 * responses and the approved statement's precision figures; otherwise it
 * starts from the float finishing test's responses, and σ_pt must come from
 * the round itself or a fixed value.
 */
export async function createRound(ownerId: number, input: z.infer<typeof newRoundSchema>) {
  if (await db.query.studies.findFirst({ where: eq(studies.code, input.code) })) {
    throw new FieldRefusal("code", "Another study or round already has this code.");
  }
  let source: { study: Study; snapshot: StatementSnapshot; responses: (typeof responses.$inferSelect)[] } | null = null;
  if (input.sourceStudyId !== null) {
    const study = await db.query.studies.findFirst({ where: and(eq(studies.id, input.sourceStudyId), eq(studies.kind, "precision"), eq(studies.state, "published")) });
    const snapshot = study ? await approvedSnapshot(study.id) : null;
    if (!study || !snapshot) throw new FieldRefusal("sourceStudyId", "Choose a published precision study.");
    const sourceResponses = await db.select().from(responses).where(eq(responses.studyId, study.id)).orderBy(asc(responses.sortOrder));
    source = { study, snapshot, responses: sourceResponses };
  } else if (input.testMethod === "") {
    throw new FieldRefusal("testMethod", "Name the test method, or choose a published study to take it from.");
  }
  const precision: RoundPrecision = source ? { sourceCode: source.study.code, analysis: source.snapshot.analysis } : { sourceCode: null, analysis: null };

  return db.transaction(async (tx) => {
    const round = await insertStudy(tx, {
      code: input.code,
      title: input.title,
      kind: "proficiency",
      testMethod: source ? source.study.testMethod : input.testMethod,
      replicatesPerCell: input.replicatesPerCell,
      targetSurfaceRating: source ? source.study.targetSurfaceRating : FLOAT_FINISHING_TEMPLATE.targetSurfaceRating,
      resultsDue: input.resultsDue,
      ownerId,
    });
    const responseRows = source
      ? source.responses.map(({ key, name, unit, kind, decimals, plausibleMin, plausibleMax, sortOrder }) => ({ key, name, unit, kind, decimals, plausibleMin, plausibleMax, sortOrder }))
      : FLOAT_FINISHING_TEMPLATE.responses.map((r, sortOrder) => ({ ...r, sortOrder }));
    const insertedResponses = await tx.insert(responses).values(responseRows.map((r) => ({ ...r, studyId: round.id }))).returning();
    if (source) {
      const targets = await tx.select().from(freshPropertyTargets).where(eq(freshPropertyTargets.studyId, source.study.id));
      if (targets.length) await tx.insert(freshPropertyTargets).values(targets.map((t) => ({ ...t, studyId: round.id })));
    }
    const insertedMaterials = await tx
      .insert(materials)
      .values(input.materials.map((m, sortOrder) => ({ ...m, studyId: round.id, sortOrder })))
      .returning();
    await tx.insert(roundSettings).values({ studyId: round.id, sourceStudyId: source?.study.id ?? null, precision });
    await tx.insert(roundAssignments).values(
      insertedMaterials.flatMap((material) =>
        insertedResponses.map((response) => ({
          studyId: round.id,
          materialId: material.id,
          responseId: response.id,
          sigmaMethod: defaultSigmaMethod(precision, response.key),
        })),
      ),
    );
    await recordAudit({ actorUserId: ownerId, action: "round_created", entityType: "study", entityId: round.id, studyId: round.id, after: { ...input, sourceCode: source?.study.code ?? null } }, tx);
    return round;
  });
}

async function settingsOf(studyId: number) {
  const settings = await db.query.roundSettings.findFirst({ where: eq(roundSettings.studyId, studyId) });
  if (!settings) throw new Error(`round ${studyId} has no settings`);
  return { ...settings, precision: settings.precision as RoundPrecision, publishedReport: settings.publishedReport as PublishedRound | null };
}

/** σ_pt follows the published precision where the source study gave figures for the response, else the round's s*. */
function defaultSigmaMethod(precision: RoundPrecision, responseKey: string) {
  return hasPublishedPrecision(precision, responseKey) ? ("precision" as const) : ("robust" as const);
}

/**
 * The choice row of one material × response of the round, made with the
 * defaults when the material or response was added after the round was set
 * up; refused when either is not the round's.
 */
async function assignmentRowFor(study: Study, materialId: number, responseId: number) {
  const [material, response] = await Promise.all([
    db.query.materials.findFirst({ where: and(eq(materials.id, materialId), eq(materials.studyId, study.id)) }),
    db.query.responses.findFirst({ where: and(eq(responses.id, responseId), eq(responses.studyId, study.id)) }),
  ]);
  if (!material || !response) throw new FieldRefusal("form", "That material and response are not part of this round.");
  const settings = await settingsOf(study.id);
  await db
    .insert(roundAssignments)
    .values({ studyId: study.id, materialId, responseId, sigmaMethod: defaultSigmaMethod(settings.precision, response.key) })
    .onConflictDoNothing();
  const row = await db.query.roundAssignments.findFirst({
    where: and(eq(roundAssignments.studyId, study.id), eq(roundAssignments.materialId, materialId), eq(roundAssignments.responseId, responseId)),
  });
  return { row: row!, response, settings };
}

/** The round's materials × responses with the coordinator's choices and the entered check results. */
export async function roundDesign(studyId: number) {
  const [materialRows, responseRows, assignmentRows, checkRows, settings] = await Promise.all([
    db.select().from(materials).where(eq(materials.studyId, studyId)).orderBy(asc(materials.sortOrder)),
    db.select().from(responses).where(eq(responses.studyId, studyId)).orderBy(asc(responses.sortOrder)),
    db.select().from(roundAssignments).where(eq(roundAssignments.studyId, studyId)),
    db.select().from(roundCheckResults).where(eq(roundCheckResults.studyId, studyId)).orderBy(asc(roundCheckResults.sample), asc(roundCheckResults.replicate)),
    settingsOf(studyId),
  ]);
  const groups = materialRows.flatMap((material) =>
    responseRows.map((response) => {
      const assignment = assignmentRows.find((a) => a.materialId === material.id && a.responseId === response.id) ?? {
        assignedMethod: "consensus" as const,
        referenceValue: null,
        referenceUncertainty: null,
        sigmaMethod: defaultSigmaMethod(settings.precision, response.key),
        fixedSigma: null,
        checkJustification: "",
      };
      const checks = checkRows.filter((c) => c.materialId === material.id && c.responseId === response.id);
      const homogeneity: [number, number][] = [];
      for (const row of checks.filter((c) => c.check === "homogeneity")) {
        const pair = (homogeneity[row.sample - 1] ??= [Number.NaN, Number.NaN]);
        pair[row.replicate - 1] = row.value;
      }
      return {
        material: { id: material.id, code: material.code, description: material.description },
        response: { id: response.id, key: response.key, name: response.name, unit: response.unit, decimals: response.decimals },
        assignment,
        homogeneity: homogeneity.filter((pair) => pair.every(Number.isFinite)),
        stability: checks.filter((c) => c.check === "stability").map((c) => c.value),
      };
    }),
  );
  return { groups, settings };
}

export type RoundDesign = Awaited<ReturnType<typeof roundDesign>>;

/** Saves how the assigned value and σ_pt of one material × response are set. */
export async function saveAssignment(study: Study, actorUserId: number, input: z.infer<typeof assignmentSchema>) {
  assertRoundWrite("roundChoices", study);
  const values = {
    assignedMethod: input.assignedMethod,
    referenceValue: input.assignedMethod === "reference" ? input.referenceValue : null,
    referenceUncertainty: input.assignedMethod === "reference" ? input.referenceUncertainty : null,
    sigmaMethod: input.sigmaMethod,
    fixedSigma: input.sigmaMethod === "fixed" ? input.fixedSigma : null,
    updatedBy: actorUserId,
    updatedAt: new Date(),
  };
  const { row, response, settings } = await assignmentRowFor(study, input.materialId, input.responseId);
  if (input.sigmaMethod === "precision" && !hasPublishedPrecision(settings.precision, response.key)) {
    throw new FieldRefusal("sigmaMethod", "This round has no published precision for the response; choose the round's s* or a fixed value.");
  }
  await db.transaction(async (tx) => {
    await tx.update(roundAssignments).set(values).where(eq(roundAssignments.id, row.id));
    await recordAudit({ actorUserId, action: "round_assignment_saved", entityType: "round_assignment", entityId: row.id, studyId: study.id, after: values }, tx);
  });
}

/** Replaces the homogeneity and stability results of one material × response, and the justification, in one transaction. */
export async function saveChecks(study: Study, actorUserId: number, input: z.infer<typeof checksSchema>) {
  assertRoundWrite("roundChecks", study);
  const { row: assignment } = await assignmentRowFor(study, input.materialId, input.responseId);
  const rows = [
    ...input.homogeneity.flatMap(([first, second], index) => [
      { check: "homogeneity" as MaterialCheck, sample: index + 1, replicate: 1, value: first },
      { check: "homogeneity" as MaterialCheck, sample: index + 1, replicate: 2, value: second },
    ]),
    ...input.stability.map((value, index) => ({ check: "stability" as MaterialCheck, sample: index + 1, replicate: 1, value })),
  ];
  await db.transaction(async (tx) => {
    await tx.delete(roundCheckResults).where(and(eq(roundCheckResults.materialId, input.materialId), eq(roundCheckResults.responseId, input.responseId)));
    if (rows.length) await tx.insert(roundCheckResults).values(rows.map((r) => ({ ...r, studyId: study.id, materialId: input.materialId, responseId: input.responseId })));
    await tx.update(roundAssignments).set({ checkJustification: input.justification }).where(eq(roundAssignments.id, assignment.id));
    await recordAudit(
      { actorUserId, action: "round_checks_saved", entityType: "round_assignment", entityId: assignment.id, studyId: study.id, after: { homogeneity: input.homogeneity, stability: input.stability, justification: input.justification } },
      tx,
    );
  });
}

/** A lab's own standard uncertainty for one material × response (blank removes it). */
export async function saveLabUncertainty(enrollmentId: number, study: Study, actorUserId: number, input: { materialId: number; responseId: number; standardUncertainty: number | null }) {
  assertRoundWrite("labUncertainty", study, "standardUncertainty");
  const material = await db.query.materials.findFirst({ where: and(eq(materials.id, input.materialId), eq(materials.studyId, study.id)) });
  const response = await db.query.responses.findFirst({ where: and(eq(responses.id, input.responseId), eq(responses.studyId, study.id)) });
  if (!material || !response) throw new FieldRefusal("standardUncertainty", "That material and response are not part of this round.");
  const key = and(eq(roundLabUncertainties.enrollmentId, enrollmentId), eq(roundLabUncertainties.materialId, input.materialId), eq(roundLabUncertainties.responseId, input.responseId));
  await db.transaction(async (tx) => {
    await tx.delete(roundLabUncertainties).where(key);
    if (input.standardUncertainty !== null) await tx.insert(roundLabUncertainties).values({ enrollmentId, materialId: input.materialId, responseId: input.responseId, standardUncertainty: input.standardUncertainty });
    await recordAudit({ actorUserId, action: "round_uncertainty_saved", entityType: "enrollment", entityId: enrollmentId, studyId: study.id, after: input }, tx);
  });
}

/** The lab's entered uncertainties, by "materialId:responseId". */
export async function labUncertainties(enrollmentId: number) {
  const rows = await db.select().from(roundLabUncertainties).where(eq(roundLabUncertainties.enrollmentId, enrollmentId));
  return Object.fromEntries(rows.map((r) => [`${r.materialId}:${r.responseId}`, r.standardUncertainty]));
}

/** One material × response of a round, scored (or the reason it cannot be), with its material checks. */
export interface RoundGroup {
  material: { code: string; description: string };
  response: { key: string; name: string; unit: string; decimals: number };
  scores: GroupScores | null;
  refusal: string | null;
  assignedBasis: string;
  sigmaBasis: string;
  homogeneity: HomogeneityCheck | null;
  stability: StabilityCheck | null;
  justification: string;
  /** Whether the checks let the scores be published: both pass, or a justification is recorded. */
  checksCleared: boolean;
  /** Every lab's result, by code, for the distribution chart. */
  distribution: { labCode: string; result: number }[];
}

/** What a published round keeps, unchanged from then on. */
export interface PublishedRound {
  code: string;
  title: string;
  testMethod: string;
  sourceCode: string | null;
  replicates: number;
  publishedAt: string;
  groups: RoundGroup[];
}

const SIGMA_BASIS: Record<Exclude<SigmaPtChoice["method"], "precision">, string> = {
  robust: "The robust standard deviation s* of this round's results (Algorithm A, ISO 13528 C.3.1).",
  fixed: "A fixed value set by the coordinator for fitness for purpose (ISO 13528 8.2).",
};

/** Scores every material × response from the labs' submitted results with the coordinator's current choices. */
export async function scoreRound(study: Study): Promise<RoundGroup[]> {
  const { groups, settings } = await roundDesign(study.id);
  const resultRows = await db
    .select({ enrollmentId: enrollments.id, labCode: enrollments.labCode, materialId: cells.materialId, responseId: cells.responseId, value: results.value })
    .from(results)
    .innerJoin(cells, eq(cells.id, results.cellId))
    .innerJoin(enrollments, eq(enrollments.id, cells.enrollmentId))
    .where(and(eq(enrollments.studyId, study.id), eq(cells.status, "submitted"), ne(enrollments.state, "withdrawn")))
    .orderBy(asc(enrollments.labCode), asc(results.replicate));
  const uncertaintyRows = await db
    .select({ enrollmentId: roundLabUncertainties.enrollmentId, materialId: roundLabUncertainties.materialId, responseId: roundLabUncertainties.responseId, u: roundLabUncertainties.standardUncertainty })
    .from(roundLabUncertainties)
    .innerJoin(enrollments, eq(enrollments.id, roundLabUncertainties.enrollmentId))
    .where(eq(enrollments.studyId, study.id));

  return groups.map((group): RoundGroup => {
    const mine = resultRows.filter((r) => r.materialId === group.material.id && r.responseId === group.response.id);
    const byLab = new Map<number, { labCode: string; values: number[]; uncertainty: number | null }>();
    for (const row of mine) {
      const entry = byLab.get(row.enrollmentId) ?? { labCode: row.labCode ?? "—", values: [], uncertainty: null };
      entry.values.push(row.value);
      byLab.set(row.enrollmentId, entry);
    }
    for (const u of uncertaintyRows) {
      if (u.materialId === group.material.id && u.responseId === group.response.id) {
        const entry = byLab.get(u.enrollmentId);
        if (entry) entry.uncertainty = u.u;
      }
    }
    const entries = [...byLab.values()];
    const assignment = group.assignment;
    const assigned =
      assignment.assignedMethod === "reference"
        ? { method: "reference" as const, value: assignment.referenceValue!, uncertainty: assignment.referenceUncertainty ?? 0 }
        : { method: "consensus" as const };
    let assignedBasis =
      assigned.method === "reference"
        ? "A reference value with its standard uncertainty, entered by the coordinator (ISO 13528 7.4–7.6)."
        : "The consensus of the participants' results: robust average x* by Algorithm A (ISO 13528 C.3.1), standard uncertainty u = 1.25·s*/√p (ISO 13528 7.7.3).";

    let scores: GroupScores | null = null;
    let refusal: string | null = null;
    let sigmaBasis = assignment.sigmaMethod === "precision" ? "" : SIGMA_BASIS[assignment.sigmaMethod];
    try {
      if (entries.length < 2) throw new ScoringRefusal("Scores need submitted results from at least 2 labs.");
      let sigma: SigmaPtChoice;
      if (assignment.sigmaMethod === "fixed") sigma = { method: "fixed", value: assignment.fixedSigma! };
      else if (assignment.sigmaMethod === "robust") sigma = { method: "robust" };
      else {
        // The level is the assigned value: a reference value, or the consensus computed first.
        const level =
          assigned.method === "reference" ? assigned.value : algorithmA(entries.map((e) => e.values.reduce((a, b) => a + b, 0) / e.values.length)).robustMean;
        const found = settings.precision.analysis ? precisionAtLevel(settings.precision.analysis, group.response.key, level) : null;
        if (!found) throw new ScoringRefusal("The source study gave no precision for this response; choose the round's s* or a fixed σ_pt.");
        sigma = { method: "precision", atLevel: () => found };
        sigmaBasis = `From the published precision of ${settings.precision.sourceCode} (ISO 13528 8.5: σ_pt = √(σ_R² − σ_r²(1 − 1/m)), m = ${study.replicatesPerCell}): ${precisionBasis(found)}.`;
      }
      scores = scoreGroup(entries, assigned, sigma, study.replicatesPerCell);
    } catch (error) {
      if (!(error instanceof ScoringRefusal) && !(error instanceof RangeError)) throw error;
      refusal = error.message;
    }
    if (assigned.method === "consensus" && scores?.robust.degenerate) {
      assignedBasis += " More than half the labs reported the same result, so x* is their median and s* is 0; the plain standard deviation of the results stands in for s* in u.";
    }
    const sigmaPt = scores?.sigmaPt ?? null;
    const homogeneity = sigmaPt !== null && group.homogeneity.length >= 2 ? homogeneityCheck(group.homogeneity, sigmaPt) : null;
    const stability =
      sigmaPt !== null && homogeneity && group.stability.length > 0
        ? stabilityCheck(homogeneity.generalMean, group.stability.reduce((a, b) => a + b, 0) / group.stability.length, sigmaPt)
        : null;
    const justification = assignment.checkJustification;
    const checksCleared = (homogeneity?.passes === true && stability?.passes === true) || justification.trim() !== "";
    return {
      material: { code: group.material.code, description: group.material.description },
      response: { key: group.response.key, name: group.response.name, unit: group.response.unit, decimals: group.response.decimals },
      scores,
      refusal,
      assignedBasis,
      sigmaBasis,
      homogeneity,
      stability,
      justification,
      checksCleared,
      distribution: entries.map((e) => ({ labCode: e.labCode, result: e.values.reduce((a, b) => a + b, 0) / e.values.length })).sort((a, b) => a.result - b.result),
    };
  });
}

/** What stands in the way of publishing, in plain words; empty when the round may publish. */
export function publicationProblems(study: Pick<Study, "state">, groups: RoundGroup[]): string[] {
  const problems: string[] = [];
  const refusal = writeRefusal("roundPublication", study.state);
  if (refusal) problems.push(refusal);
  for (const group of groups) {
    const name = `${group.material.code} · ${group.response.name}`;
    if (group.refusal) problems.push(`${name}: ${group.refusal}`);
    if (!group.checksCleared) {
      const missing = !group.homogeneity || !group.stability;
      problems.push(
        missing
          ? `${name}: enter the homogeneity and stability results, or record why the round publishes without them.`
          : `${name}: the homogeneity or stability check fails; record a justification before publishing.`,
      );
    }
  }
  return problems;
}

/**
 * Publishes the round: freezes the report and every lab's scores (triggers
 * refuse any later change) and moves the round to published, in one
 * transaction that only succeeds if the round is still checking.
 */
export async function publishRound(study: Study, actorUserId: number, { publishedAt = new Date(), request = null, notify = true }: { publishedAt?: Date; request?: Request | null; notify?: boolean } = {}) {
  const groups = await scoreRound(study);
  const problems = publicationProblems(study, groups);
  if (problems.length) throw new FieldRefusal("form", problems.join(" "));
  const settings = await settingsOf(study.id);
  const report: PublishedRound = {
    code: study.code,
    title: study.title,
    testMethod: study.testMethod,
    sourceCode: settings.precision.sourceCode,
    replicates: study.replicatesPerCell,
    publishedAt: publishedAt.toISOString(),
    groups,
  };
  const enrollmentRows = await db.select({ labId: enrollments.labId, labCode: enrollments.labCode }).from(enrollments).where(eq(enrollments.studyId, study.id));
  const labIdByCode = new Map(enrollmentRows.map((e) => [e.labCode, e.labId]));
  const scoreRows = groups.flatMap((group) =>
    (group.scores?.labs ?? []).map((lab) => ({
      studyId: study.id,
      labId: labIdByCode.get(lab.labCode)!,
      labCode: lab.labCode,
      materialCode: group.material.code,
      responseKey: group.response.key,
      result: lab.result,
      scoreKind: lab.scoreKind,
      score: lab.score,
      zeta: lab.zeta,
      verdict: lab.verdict,
      publishedAt,
    })),
  );
  const moved = await db.transaction(async (tx) => {
    const updated = await tx.update(studies).set({ state: "published" }).where(and(eq(studies.id, study.id), eq(studies.state, "checking"))).returning({ id: studies.id });
    if (updated.length === 0) return false;
    await tx.update(roundSettings).set({ publishedReport: report, publishedAt, publishedBy: actorUserId }).where(eq(roundSettings.studyId, study.id));
    if (scoreRows.length) await tx.insert(roundScores).values(scoreRows);
    await recordAudit({ actorUserId, action: "study_state_changed", entityType: "study", entityId: study.id, studyId: study.id, before: { state: "checking" }, after: { state: "published" } }, tx);
    await recordAudit({ actorUserId, action: "round_published", entityType: "study", entityId: study.id, studyId: study.id, after: { scores: scoreRows.length } }, tx);
    return true;
  });
  if (!moved) throw new FieldRefusal("form", "Someone else changed the round's state meanwhile; reload and try again.");
  if (notify) await tellLabsTheirLettersAreReady(study, request);
}

/** One message to each scored lab's contact: the letter is on its page; the scores are not in the e-mail. */
async function tellLabsTheirLettersAreReady(study: Study, request: Request | null) {
  const contacts = await db
    .select({ name: labs.contactName, email: labs.contactEmail })
    .from(enrollments)
    .innerJoin(labs, eq(labs.id, enrollments.labId))
    .where(and(eq(enrollments.studyId, study.id), eq(enrollments.state, "accepted")));
  for (const contact of contacts) {
    if (!contact.email) continue;
    await sendEmail(
      composeEmail({
        to: contact.email,
        subject: `${study.code}: your proficiency letter is ready`,
        greeting: `Hello ${contact.name || "colleague"},`,
        paragraphs: [
          `The scores of proficiency round ${study.code} (${study.title}) are published.`,
          "Your lab's confidential letter gives its scores, the assigned values and σ_pt with their basis, and what to do after a questionable or unsatisfactory score. Sign in to read and print it.",
        ],
        action: { label: "Read your letter", url: appUrl(request, `/lab/rounds/${study.id}/letter`) },
      }),
      { studyId: study.id },
    );
  }
}

/** The frozen report of a published round, or null before publication. */
export async function publishedRound(studyId: number) {
  return (await settingsOf(studyId)).publishedReport;
}

/** The round's report for the coordinator: frozen once published, live before. */
export async function roundReport(study: Study) {
  const published = await publishedRound(study.id);
  const groups = published?.groups ?? (await scoreRound(study));
  const names = await db
    .select({ code: enrollments.labCode, name: labs.name })
    .from(enrollments)
    .innerJoin(labs, eq(labs.id, enrollments.labId))
    .where(eq(enrollments.studyId, study.id));
  return { published: published !== null, groups, labNames: Object.fromEntries(names.flatMap((n) => (n.code ? [[n.code, n.name]] : []))) };
}

/** The method's performance round over round: for each published round of the same test method, σ_pt, s* and the share of satisfactory scores. */
export async function methodPerformance(testMethod: string) {
  const rows = await db
    .select({ id: studies.id, code: studies.code, report: roundSettings.publishedReport, publishedAt: roundSettings.publishedAt })
    .from(roundSettings)
    .innerJoin(studies, eq(studies.id, roundSettings.studyId))
    .where(and(eq(studies.testMethod, testMethod), eq(studies.state, "published")))
    .orderBy(asc(roundSettings.publishedAt));
  return rows.flatMap((row) =>
    ((row.report as PublishedRound | null)?.groups ?? []).flatMap((group) =>
      group.scores
        ? [
            {
              round: row.code,
              publishedAt: row.publishedAt,
              material: group.material.code,
              response: group.response.name,
              labs: group.scores.labs.length,
              assignedValue: group.scores.assignedValue,
              sigmaPt: group.scores.sigmaPt,
              robustSd: group.scores.robust.robustSd,
              satisfactoryShare: group.scores.labs.filter((l) => l.verdict === "satisfactory").length / group.scores.labs.length,
            },
          ]
        : [],
    ),
  );
}

/**
 * A lab's letter: its own scores in the published round, the round's figures
 * and their basis, every result by lab code only, and the lab's scores across
 * all published rounds. Null until the round is published.
 */
export async function labLetter(studyId: number, enrollment: { id: number; labId: number; labCode: string | null }) {
  const report = await publishedRound(studyId);
  if (!report || !enrollment.labCode) return null;
  const groups = report.groups.map((group) => ({
    material: group.material,
    response: group.response,
    assignedBasis: group.assignedBasis,
    sigmaBasis: group.sigmaBasis,
    refusal: group.refusal,
    homogeneity: group.homogeneity,
    stability: group.stability,
    assignedValue: group.scores?.assignedValue ?? null,
    assignedUncertainty: group.scores?.assignedUncertainty ?? null,
    sigmaPt: group.scores?.sigmaPt ?? null,
    labsScored: group.scores?.labs.length ?? 0,
    own: group.scores?.labs.find((lab) => lab.labCode === enrollment.labCode) ?? null,
    distribution: group.distribution,
  }));
  const history = await db
    .select({
      round: studies.code,
      roundId: roundScores.studyId,
      material: roundScores.materialCode,
      response: roundScores.responseKey,
      scoreKind: roundScores.scoreKind,
      score: roundScores.score,
      verdict: roundScores.verdict,
      publishedAt: roundScores.publishedAt,
    })
    .from(roundScores)
    .innerJoin(studies, eq(studies.id, roundScores.studyId))
    // Published scores never change, so a lab merged into this one keeps its own id there: its history is read alongside.
    .where(and(or(eq(roundScores.labId, enrollment.labId), inArray(roundScores.labId, db.select({ id: labs.id }).from(labs).where(eq(labs.mergedIntoId, enrollment.labId)))), eq(studies.testMethod, report.testMethod)))
    .orderBy(asc(roundScores.publishedAt), asc(roundScores.materialCode));
  return { report: { code: report.code, title: report.title, testMethod: report.testMethod, sourceCode: report.sourceCode, replicates: report.replicates, publishedAt: report.publishedAt }, labCode: enrollment.labCode, groups, history };
}

export type LabLetter = NonNullable<Awaited<ReturnType<typeof labLetter>>>;

/** Published rounds the user's labs took part in, for the lab's home page. */
export async function labRounds(labIds: number[]) {
  if (labIds.length === 0) return [];
  return db
    .select({ id: studies.id, code: studies.code, title: studies.title, state: studies.state, labCode: enrollments.labCode })
    .from(enrollments)
    .innerJoin(studies, eq(studies.id, enrollments.studyId))
    .where(and(inArray(enrollments.labId, labIds), eq(studies.kind, "proficiency"), eq(enrollments.state, "accepted")))
    .orderBy(desc(studies.id));
}
