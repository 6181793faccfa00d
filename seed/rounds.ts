/**
 * The demo's proficiency rounds, taking σ_pt from the toolkit demo's
 * published precision study: an earlier published round, a published round of twelve labs with one unsatisfactory and one
 * questionable score planted, and a round in testing. Built through the
 * product's own round functions, so the demo is what the pages would make.
 */
import { and, eq } from "drizzle-orm";
import type { Database } from "~/db/client.server";
import { cells, enrollments, labMembers, labs, materials, responses, results, studies } from "~/db/schema";
import { createRound, publishRound, saveChecks } from "~/models/round.server";
import { generator } from "./demo-data";
import { PUBLISHED_STUDY_CODE } from "./toolkit-demo";
import { PREVIOUS_ROUND_SEED, PUBLISHED_ROUND_PLANTS, ROUND_BASE, ROUND_CHECKS, ROUND_EXTRA_ANALYSTS, ROUND_EXTRA_LABS, ROUND_MATERIALS } from "./rounds-data";

type Ids = { coordinatorId: number; labIds: number[]; userId: (email: string, name: string, role: "analyst") => Promise<number> };

/** Fresh lab codes for a round: a shuffle of L01…L12, the same on every machine. */
function roundCodes(seed: number, count: number) {
  const next = generator(seed);
  const codes = Array.from({ length: count }, (_, i) => `L${String(i + 1).padStart(2, "0")}`);
  for (let i = codes.length - 1; i > 0; i--) {
    const j = Math.floor(next() * (i + 1));
    [codes[i], codes[j]] = [codes[j]!, codes[i]!];
  }
  return codes;
}

async function enterRoundResults(db: Database, roundId: number, labIds: number[], { seed, submittedLabs, plants = [] }: { seed: number; submittedLabs: number[]; plants?: readonly { labIndex: number; material: string; response: string; values: readonly number[] }[] }) {
  const codes = roundCodes(seed, labIds.length);
  const next = generator(seed + 1);
  const normal = () => Math.sqrt(-2 * Math.log(1 - next())) * Math.cos(2 * Math.PI * next());
  const materialRows = await db.select().from(materials).where(eq(materials.studyId, roundId));
  const responseRows = await db.select().from(responses).where(eq(responses.studyId, roundId));
  for (const [labIndex, labId] of labIds.entries()) {
    const [enrollment] = await db.insert(enrollments).values({ studyId: roundId, labId, labCode: codes[labIndex], state: "accepted", invitedAt: new Date("2026-03-02"), respondedAt: new Date("2026-03-06") }).returning();
    if (!submittedLabs.includes(labIndex)) continue;
    for (const material of materialRows) {
      for (const response of responseRows) {
        const base = ROUND_BASE[material.code as keyof typeof ROUND_BASE][response.key as "holes" | "surface"];
        const bias = 0.6 * normal();
        const planted = plants.find((p) => p.labIndex === labIndex && p.material === material.code && p.response === response.key);
        const values = planted ? [...planted.values] : [1, 2].map(() => Math.max(1, Math.round(base + bias + 0.6 * normal())));
        const [cell] = await db.insert(cells).values({ enrollmentId: enrollment!.id, materialId: material.id, responseId: response.id, status: "submitted", submittedAt: new Date("2026-04-20") }).returning();
        await db.insert(results).values(values.map((value, i) => ({ cellId: cell!.id, replicate: i + 1, value, testedOn: "2026-04-15" })));
      }
    }
  }
}

async function enterChecks(db: Database, round: typeof studies.$inferSelect, coordinatorId: number) {
  const materialRows = await db.select().from(materials).where(eq(materials.studyId, round.id));
  const responseRows = await db.select().from(responses).where(eq(responses.studyId, round.id));
  for (const material of materialRows) {
    for (const response of responseRows) {
      const checks = ROUND_CHECKS[`${material.code}:${response.key}`]!;
      await saveChecks(round, coordinatorId, { intent: "checks", materialId: material.id, responseId: response.id, homogeneity: checks.homogeneity, stability: checks.stability, justification: "" });
    }
  }
}

async function seedPublishedRound(
  db: Database,
  ids: Ids,
  sourceId: number,
  labIds: number[],
  spec: { code: string; title: string; lot: string; seed: number; publishedAt: Date; plants?: typeof PUBLISHED_ROUND_PLANTS },
) {
  if (await db.query.studies.findFirst({ where: eq(studies.code, spec.code) })) return;
  const round = await createRound(ids.coordinatorId, {
    code: spec.code,
    title: spec.title,
    sourceStudyId: sourceId,
    testMethod: "",
    replicatesPerCell: 2,
    materials: ROUND_MATERIALS.map((m) => ({ ...m, description: m.description.replace("PT26-1", spec.lot) })),
    resultsDue: null,
  });
  await db.update(studies).set({ state: "testing" }).where(eq(studies.id, round.id));
  await enterRoundResults(db, round.id, labIds, { seed: spec.seed, submittedLabs: labIds.map((_, i) => i), plants: spec.plants });
  const testing = (await db.query.studies.findFirst({ where: eq(studies.id, round.id) }))!;
  await enterChecks(db, testing, ids.coordinatorId);
  await db.update(studies).set({ state: "checking" }).where(and(eq(studies.id, round.id), eq(studies.state, "testing")));
  await publishRound({ ...testing, state: "checking" }, ids.coordinatorId, { publishedAt: spec.publishedAt, notify: false });
}

export async function seedDemoRounds(db: Database, ids: Ids) {
  const source = await db.query.studies.findFirst({ where: eq(studies.code, PUBLISHED_STUDY_CODE) });
  if (!source) throw new Error(`seed the published study ${PUBLISHED_STUDY_CODE} first`);
  const roundLabIds = [...ids.labIds];
  for (const [i, lab] of ROUND_EXTRA_LABS.entries()) {
    const analyst = ROUND_EXTRA_ANALYSTS[i]!;
    let row = await db.query.labs.findFirst({ where: eq(labs.name, lab.name) });
    row ??= (await db.insert(labs).values({ ...lab, contactName: analyst.name, contactEmail: analyst.email }).returning())[0]!;
    roundLabIds.push(row.id);
    const analystId = await ids.userId(analyst.email, analyst.name, "analyst");
    await db.insert(labMembers).values({ labId: row.id, userId: analystId, isContact: true }).onConflictDoNothing();
  }

  // An earlier round, all satisfactory, so each letter has a history; then the round with the planted scores.
  await seedPublishedRound(db, ids, source.id, roundLabIds, { code: "PT-2025-2", title: "Float finishing proficiency round, autumn 2025", lot: "PT25-2", seed: PREVIOUS_ROUND_SEED, publishedAt: new Date("2025-11-28T15:00:00Z") });
  await seedPublishedRound(db, ids, source.id, roundLabIds, { code: "PT-2026-1", title: "Float finishing proficiency round, spring 2026", lot: "PT26-1", seed: 2611, publishedAt: new Date("2026-05-08T15:00:00Z"), plants: PUBLISHED_ROUND_PLANTS });

  if (!(await db.query.studies.findFirst({ where: eq(studies.code, "PT-2026-2") }))) {
    const round = await createRound(ids.coordinatorId, {
      code: "PT-2026-2",
      title: "Float finishing proficiency round, autumn 2026",
      sourceStudyId: source.id,
      testMethod: "",
      replicatesPerCell: 2,
      materials: ROUND_MATERIALS.map((m) => ({ ...m, description: m.description.replace("PT26-1", "PT26-2") })),
      resultsDue: "2026-12-18",
    });
    await db.update(studies).set({ state: "testing", shipDate: "2026-11-16" }).where(eq(studies.id, round.id));
    await enterRoundResults(db, round.id, roundLabIds, { seed: 2602, submittedLabs: [0, 2, 4, 6, 8, 10] });
  }
}
