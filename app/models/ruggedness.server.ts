/**
 * Ruggedness studies (studies of kind "ruggedness", ASTM E1169): a
 * coordinator's single-lab screening of the procedure details a test method
 * must hold tightly. Factors and the design can change until the first result
 * is entered; results are kept per run, response and replicate.
 */
import { randomInt } from "node:crypto";
import { asc, count, eq } from "drizzle-orm";
import { db } from "~/db/client.server";
import { responses, ruggednessFactors, ruggednessPlans, ruggednessResults, studies, type Study } from "~/db/schema";
import { FieldRefusal } from "~/lib/field-refusal";
import { type WriteKind, writeRefusal } from "~/lib/write-rules";
import { analyzeRuggedness, designFor, plackettBurmanDesign, randomRunOrder, type RunCount } from "~/lib/ruggedness";
import type { FactorsInput } from "~/lib/ruggedness/forms";
import type { z } from "zod";
import type { newRuggednessSchema } from "~/lib/ruggedness/forms";
import { FLOAT_FINISHING_TEMPLATE } from "~/lib/study-templates";
import { recordAudit } from "~/server/audit.server";
import type { SessionUser } from "~/models/user.server";
import { coordinatedBy, insertStudy } from "~/models/study.server";


/** Refuses a write where the one table of write rules (~/lib/write-rules) does, with its sentence beside `field`. */
function assertRuggednessWrite(kind: Extract<WriteKind, "ruggednessDesign" | "ruggednessResults">, study: Pick<Study, "state">, field: string) {
  const refusal = writeRefusal(kind, study.state);
  if (refusal) throw new FieldRefusal(field, refusal);
}

/** The ruggedness studies a coordinator owns or coordinates; every one for an admin. */
export async function listRuggednessStudies(user: SessionUser) {
  const rows = await db
    .select({ id: studies.id, code: studies.code, title: studies.title, state: studies.state, testMethod: studies.testMethod, runs: ruggednessPlans.runs })
    .from(studies)
    .leftJoin(ruggednessPlans, eq(ruggednessPlans.studyId, studies.id))
    .where(coordinatedBy(user, "ruggedness"))
    .orderBy(asc(studies.code));
  return rows;
}

/** Creates a ruggedness study with its responses: the float finishing test's two, or one named response. */
export async function createRuggednessStudy(ownerId: number, input: z.output<typeof newRuggednessSchema>) {
  if (await db.query.studies.findFirst({ where: eq(studies.code, input.code) })) throw new FieldRefusal("code", "Another study already has this code.");
  const float = input.template === "float_finishing";
  return db.transaction(async (tx) => {
    const study = await insertStudy(tx, {
      code: input.code,
      title: input.title,
      kind: "ruggedness",
      testMethod: float ? FLOAT_FINISHING_TEMPLATE.testMethod : input.testMethod!,
      notes: input.notes ?? "",
      replicatesPerCell: 1,
      targetSurfaceRating: float ? FLOAT_FINISHING_TEMPLATE.targetSurfaceRating : null,
      ownerId,
    });
    const studyId = study.id;
    const responseRows = float
      ? FLOAT_FINISHING_TEMPLATE.responses.map((r, i) => ({ ...r, studyId, sortOrder: i }))
      : [{ studyId, key: "result", name: input.responseName!, unit: input.responseUnit ?? "", kind: "continuous" as const, decimals: 2, sortOrder: 0 }];
    await tx.insert(responses).values(responseRows);
    await recordAudit({ actorUserId: ownerId, action: "study_created", entityType: "study", entityId: studyId, studyId, after: { ...input, kind: "ruggedness" } }, tx);
    return study;
  });
}

/** Plan, factors and responses of a ruggedness study, and how many results are in. */
export async function ruggednessSetup(studyId: number) {
  const [plan, factors, responseRows, [{ results }]] = await Promise.all([
    db.query.ruggednessPlans.findFirst({ where: eq(ruggednessPlans.studyId, studyId) }),
    db.select().from(ruggednessFactors).where(eq(ruggednessFactors.studyId, studyId)).orderBy(asc(ruggednessFactors.column)),
    db.select().from(responses).where(eq(responses.studyId, studyId)).orderBy(asc(responses.sortOrder)),
    db.select({ results: count() }).from(ruggednessResults).where(eq(ruggednessResults.studyId, studyId)) as Promise<{ results: number }[]>,
  ]);
  return {
    plan: plan ? { runs: plan.runs as RunCount, replicates: plan.replicates, runOrder: plan.runOrder, runOrderSeed: plan.runOrderSeed } : null,
    factors: factors.map(({ column, name, unit, low, high }) => ({ column, name, unit, low, high })),
    responses: responseRows.map(({ id, key, name, unit, kind, decimals }) => ({ id, key, name, unit, kind, decimals })),
    resultCount: results,
  };
}

/**
 * Replaces the factors and lays out the design: the smallest Plackett–Burman
 * design that takes them (8 runs up to 7 factors, 12 up to 11), factors in its
 * first columns and the rest left as dummy columns, and a new random run order.
 * Refused once results are in, since they belong to the design as it was.
 */
export async function saveFactors(study: Study, actorUserId: number, input: FactorsInput) {
  assertRuggednessWrite("ruggednessDesign", study, "factors");
  const runs = designFor(input.factors.length);
  if (!runs) throw new FieldRefusal("factors", "At most 11 factors fit the 12-run design.");
  const [{ results }] = (await db.select({ results: count() }).from(ruggednessResults).where(eq(ruggednessResults.studyId, study.id))) as { results: number }[];
  if (results > 0) throw new FieldRefusal("factors", "Results have been entered for this design; the factors and the design can no longer change.");
  const seed = randomInt(1, 2 ** 31 - 1);
  const plan = { runs, replicates: input.replicates, runOrderSeed: seed, runOrder: randomRunOrder(runs, seed) };
  await db.transaction(async (tx) => {
    await tx.delete(ruggednessFactors).where(eq(ruggednessFactors.studyId, study.id));
    await tx.insert(ruggednessFactors).values(input.factors.map((f, i) => ({ ...f, studyId: study.id, column: i + 1 })));
    await tx.insert(ruggednessPlans).values({ studyId: study.id, ...plan }).onConflictDoUpdate({ target: ruggednessPlans.studyId, set: plan });
    await tx.update(studies).set({ replicatesPerCell: input.replicates }).where(eq(studies.id, study.id));
    await recordAudit({ actorUserId, action: "ruggedness.design_laid_out", entityType: "study", entityId: study.id, studyId: study.id, after: { ...plan, factors: input.factors } }, tx);
  });
  return plan;
}

/** The entered results: per response key, per design row (index 0 = run 1), the values in replicate order. */
export async function ruggednessResultsByResponse(studyId: number, runs: number) {
  const rows = await db
    .select({ run: ruggednessResults.run, key: responses.key, replicate: ruggednessResults.replicate, value: ruggednessResults.value })
    .from(ruggednessResults)
    .innerJoin(responses, eq(responses.id, ruggednessResults.responseId))
    .where(eq(ruggednessResults.studyId, studyId))
    .orderBy(asc(ruggednessResults.run), asc(ruggednessResults.replicate));
  const byResponse: Record<string, number[][]> = {};
  for (const row of rows) {
    byResponse[row.key] ??= Array.from({ length: runs }, () => []);
    byResponse[row.key]![row.run - 1]?.push(row.value);
  }
  return { byResponse, rows };
}

export type ResultEntry = { run: number; replicate: number; responseKey: string; value: number };

/** Stores or changes the given results in one transaction; results not given stay as they are. A refusal with no field (key "") belongs to the whole form. */
export async function saveRuggednessResults(study: Study, actorUserId: number, entries: ResultEntry[]) {
  assertRuggednessWrite("ruggednessResults", study, "");
  const setup = await ruggednessSetup(study.id);
  if (!setup.plan) throw new FieldRefusal("", "Lay out the design before entering results.");
  if (entries.length === 0) throw new FieldRefusal("", "Enter at least one result.");
  const responseIds = new Map(setup.responses.map((r) => [r.key, r.id]));
  const now = new Date();
  let stored = 0;
  await db.transaction(async (tx) => {
    for (const entry of entries) {
      const responseId = responseIds.get(entry.responseKey);
      if (!responseId || entry.run < 1 || entry.run > setup.plan!.runs || entry.replicate > setup.plan!.replicates) continue;
      stored++;
      await tx
        .insert(ruggednessResults)
        .values({ studyId: study.id, run: entry.run, responseId, replicate: entry.replicate, value: entry.value, enteredBy: actorUserId, updatedAt: now })
        .onConflictDoUpdate({ target: [ruggednessResults.studyId, ruggednessResults.run, ruggednessResults.responseId, ruggednessResults.replicate], set: { value: entry.value, enteredBy: actorUserId, updatedAt: now } });
    }
    if (stored > 0 && study.state === "draft") await tx.update(studies).set({ state: "testing" }).where(eq(studies.id, study.id));
    await recordAudit({ actorUserId, action: "ruggedness.results_saved", entityType: "study", entityId: study.id, studyId: study.id, after: { stored } }, tx);
  });
  return stored;
}

/** Effects, their tests, the half-normal points and a conclusion per factor, for every response. */
export async function ruggednessAnalysis(studyId: number) {
  const setup = await ruggednessSetup(studyId);
  if (!setup.plan) return { setup, responses: [] };
  const { byResponse } = await ruggednessResultsByResponse(studyId, setup.plan.runs);
  const design = plackettBurmanDesign(setup.plan.runs);
  return {
    setup,
    design,
    responses: setup.responses.map((response) => ({
      response,
      analysis: analyzeRuggedness(setup.plan!.runs, setup.factors, byResponse[response.key] ?? [], { name: response.name, unit: response.unit }),
    })),
  };
}

