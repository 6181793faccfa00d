/**
 * Mixture comparisons against published precision statements: the statements
 * anyone signed in may use, and each person's own history of comparisons,
 * every one frozen with the statement version it used.
 */
import { and, desc, eq, type SQL } from "drizzle-orm";
import { db } from "~/db/client.server";
import { comparisons, precisionStatements, studies } from "~/db/schema";
import { acceptabilityCheck, compareMixtures, type AcceptabilityCheck, type MixtureComparison } from "~/lib/comparison";
import type { ComparisonInput } from "~/lib/comparison/form";
import { FieldRefusal } from "~/lib/field-refusal";
import type { StatementSnapshot } from "~/lib/statement-text";

export type ComparisonOutcome = { comparison: MixtureComparison; reference: AcceptabilityCheck | null; trial: AcceptabilityCheck | null };

/** The approved statements of published studies, newest first, with the responses each gives figures for. */
export async function publishedStatements() {
  const rows = await db
    .select({ id: precisionStatements.id, version: precisionStatements.version, snapshot: precisionStatements.snapshot, studyCode: studies.code, studyTitle: studies.title, testMethod: studies.testMethod })
    .from(precisionStatements)
    .innerJoin(studies, eq(studies.id, precisionStatements.studyId))
    .where(and(eq(studies.state, "published"), eq(precisionStatements.state, "approved")))
    .orderBy(desc(precisionStatements.createdAt));
  return rows.map(({ snapshot, ...row }) => {
    const s = snapshot as StatementSnapshot;
    const responses = s.responses
      .map((r) => {
        const means = s.analysis.groups.flatMap((g) => (g.status === "computed" && g.response === r.key ? [g.mean] : []));
        return { key: r.key, name: r.name, unit: r.unit, levels: means.length ? ([Math.min(...means), Math.max(...means)] as const) : null };
      })
      .filter((r) => r.levels !== null);
    return { ...row, responses };
  });
}

async function approvedStatement(statementId: number) {
  const [row] = await db
    .select({ statement: precisionStatements, studyCode: studies.code, studyTitle: studies.title, testMethod: studies.testMethod })
    .from(precisionStatements)
    .innerJoin(studies, eq(studies.id, precisionStatements.studyId))
    .where(and(eq(precisionStatements.id, statementId), eq(studies.state, "published"), eq(precisionStatements.state, "approved")));
  return row ? { ...row, snapshot: row.statement.snapshot as StatementSnapshot } : null;
}

/** Computes and keeps one comparison; refusals name the field they belong to. */
export async function saveComparison(userId: number, input: ComparisonInput) {
  const [statementId, response] = input.basis.split(":") as [string, string];
  const found = await approvedStatement(Number(statementId));
  if (!found) throw new FieldRefusal("basis", "That statement is not a published one; choose another.");
  const comparison = compareMixtures(found.snapshot.analysis, response, input.setting, { label: input.referenceLabel, values: input.referenceValues }, { label: input.trialLabel, values: input.trialValues });
  if (!comparison) throw new FieldRefusal("basis", "This statement has no precision figures for that response.");
  const check = (values: number[]) => (values.length >= 2 ? acceptabilityCheck(values, comparison.precision.sr) : null);
  const outcome: ComparisonOutcome = { comparison, reference: check(input.referenceValues), trial: check(input.trialValues) };
  const [row] = await db
    .insert(comparisons)
    .values({
      userId,
      statementId: found.statement.id,
      response,
      setting: input.setting,
      referenceLabel: input.referenceLabel,
      trialLabel: input.trialLabel,
      referenceValues: input.referenceValues,
      trialValues: input.trialValues,
      notes: input.notes ?? "",
      outcome,
    })
    .returning({ id: comparisons.id });
  return row!.id;
}

const historyColumns = {
  id: comparisons.id,
  createdAt: comparisons.createdAt,
  response: comparisons.response,
  setting: comparisons.setting,
  referenceLabel: comparisons.referenceLabel,
  trialLabel: comparisons.trialLabel,
  referenceValues: comparisons.referenceValues,
  trialValues: comparisons.trialValues,
  notes: comparisons.notes,
  outcome: comparisons.outcome,
  statementVersion: precisionStatements.version,
  snapshot: precisionStatements.snapshot,
  studyCode: studies.code,
  studyTitle: studies.title,
  testMethod: studies.testMethod,
};

function historyRows(where: SQL | undefined) {
  return db
    .select(historyColumns)
    .from(comparisons)
    .innerJoin(precisionStatements, eq(precisionStatements.id, comparisons.statementId))
    .innerJoin(studies, eq(studies.id, precisionStatements.studyId))
    .where(where)
    .orderBy(desc(comparisons.createdAt), desc(comparisons.id));
}

function present({ snapshot, ...row }: Awaited<ReturnType<typeof historyRows>>[number]) {
  const responseInfo = (snapshot as StatementSnapshot).responses.find((r) => r.key === row.response);
  return {
    ...row,
    createdAt: row.createdAt.toISOString(),
    responseName: responseInfo?.name ?? row.response,
    unit: responseInfo?.unit ?? "",
    outcome: row.outcome as ComparisonOutcome,
  };
}

/** The person's own comparisons, newest first. */
export async function listComparisons(userId: number) {
  return (await historyRows(eq(comparisons.userId, userId))).map(present);
}

/** One of the person's comparisons, or null when it is not theirs. */
export async function findComparison(userId: number, comparisonId: number) {
  const [row] = await historyRows(and(eq(comparisons.id, comparisonId), eq(comparisons.userId, userId)));
  return row ? present(row) : null;
}
