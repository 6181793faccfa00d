/**
 * The method toolkit's demo (fictional, like the rest of the demo): a
 * published study of bridge-deck mixtures with its approved statement, a
 * comparison of a trial mixture made against that statement, and a
 * ruggedness study of the float finishing test in which one factor — the
 * time after placement when floating starts — matters.
 */
import { eq } from "drizzle-orm";
import type { Database } from "~/db/client.server";
import {
  cellDecisions,
  cells,
  comparisons,
  enrollments,
  labs,
  materials,
  mixtureConstituents,
  precisionStatements,
  responses,
  results,
  shipmentItems,
  shipments,
  ruggednessFactors,
  ruggednessPlans,
  ruggednessResults,
  studies,
  studyReviewers,
  users,
  votes,
} from "~/db/schema";
import { acceptabilityCheck, compareMixtures } from "~/lib/comparison";
import { analyzeStudy, type ExcludedCell, type ResultRow } from "~/lib/precision";
import { plackettBurmanDesign, randomRunOrder } from "~/lib/ruggedness";
import { c670Text, e691Text, type StatementSnapshot } from "~/lib/statement-text";
import { DEMO_LABS, DEMO_MATERIALS, DEMO_PEOPLE, demoPackingList, demoResults, FLOAT_FINISHING_RESPONSES, generator } from "./demo-data";

export const PUBLISHED_STUDY_CODE = "FF-2025-D";
export const RUGGEDNESS_STUDY_CODE = "RG-2026-1";

const PUBLISHED_LAB_CODES = ["L05", "L02", "L08", "L04", "L01", "L07", "L03", "L06"];
const PUBLISHED_MATERIALS = DEMO_MATERIALS.slice(0, 3);
const REPLICATES = 3;
/** Ostrade (lab index 3) floated one M2 specimen far too late: its holes cell is excluded after the lab confirmed it. */
const PUBLISHED_PLANTS = [{ labIndex: 3, material: "M2", response: "holes" as const, replicate: 2, value: 16 }];
const EXCLUSION_REASON = "Lab confirmed that the second specimen was floated 40 minutes late after a mixer fault; the cell does not follow the method.";

async function idOf(db: Database, email: string) {
  const user = await db.query.users.findFirst({ where: eq(users.email, email) });
  if (!user) throw new Error(`seed the demo accounts first (${email})`);
  return user.id;
}

async function seedPublishedStudy(db: Database) {
  const existing = await db.query.studies.findFirst({ where: eq(studies.code, PUBLISHED_STUDY_CODE) });
  if (existing) return existing.id;
  const coordinatorId = await idOf(db, DEMO_PEOPLE.coordinator.email);
  const reviewerIds = await Promise.all(DEMO_PEOPLE.reviewers.map((r) => idOf(db, r.email)));
  const labIds = await Promise.all(DEMO_LABS.map(async (l) => (await db.query.labs.findFirst({ where: eq(labs.name, l.name) }))!.id));
  const values = demoResults(PUBLISHED_MATERIALS.map((m) => m.code), REPLICATES, 2025, PUBLISHED_PLANTS);

  // Rows in the order the analysis reads them from the database: lab code, material, response, replicate.
  const byCode = PUBLISHED_LAB_CODES.map((code, labIndex) => ({ code, labIndex })).sort((a, b) => a.code.localeCompare(b.code));
  const rows: ResultRow[] = byCode.flatMap(({ code, labIndex }) =>
    PUBLISHED_MATERIALS.flatMap((m) =>
      FLOAT_FINISHING_RESPONSES.flatMap((r) =>
        values.filter((v) => v.labIndex === labIndex && v.material === m.code && v.response === r.key).map((v) => ({ lab: code, material: m.code, response: r.key, replicate: v.replicate, value: v.value })),
      ),
    ),
  );
  const excluded: ExcludedCell[] = [{ lab: PUBLISHED_LAB_CODES[3]!, material: "M2", response: "holes", reason: EXCLUSION_REASON }];
  const analysis = analyzeStudy(rows, { alpha: 0.005, excludedCells: excluded, responseKinds: { holes: "count", surface: "count" } });
  const snapshot: StatementSnapshot = {
    study: { code: PUBLISHED_STUDY_CODE, title: "Finishability of bridge-deck mixtures", testMethod: "Float finishing test of fresh concrete" },
    dataVersion: 1,
    frozenAt: "2026-03-02T14:00:00.000Z",
    labs: DEMO_LABS.length,
    replicates: REPLICATES,
    materials: PUBLISHED_MATERIALS.map(({ code, description }) => ({ code, description })),
    responses: FLOAT_FINISHING_RESPONSES.map(({ key, name, unit }) => ({ key, name, unit, decimals: 0 })),
    analysis,
  };

  return db.transaction(async (tx) => {
    const [study] = await tx
      .insert(studies)
      .values({
        code: PUBLISHED_STUDY_CODE,
        title: snapshot.study.title,
        testMethod: snapshot.study.testMethod,
        notes: "Consortium round 0, published. Target surface rating 2 on the 1–3 visual scale.",
        state: "published",
        replicatesPerCell: REPLICATES,
        targetSurfaceRating: 2,
        enrollmentDeadline: "2025-08-15",
        shipDate: "2025-09-02",
        resultsDue: "2025-10-31",
        ownerId: coordinatorId,
        dataVersion: 1,
      })
      .returning();
    const studyId = study!.id;
    await tx.insert(studyReviewers).values(reviewerIds.map((userId) => ({ studyId, userId })));
    const responseRows = await tx.insert(responses).values(FLOAT_FINISHING_RESPONSES.map((r, i) => ({ ...r, studyId, decimals: 0, sortOrder: i }))).returning();
    const materialIds = new Map<string, number>();
    for (const [i, m] of PUBLISHED_MATERIALS.entries()) {
      const [material] = await tx.insert(materials).values({ studyId, code: m.code, description: m.description, sortOrder: i }).returning();
      await tx.insert(mixtureConstituents).values(m.constituents.map((c, j) => ({ ...c, materialId: material!.id, sortOrder: j })));
      materialIds.set(m.code, material!.id);
    }
    const packingList = demoPackingList(PUBLISHED_MATERIALS);
    for (const [labIndex, labId] of labIds.entries()) {
      const [enrollment] = await tx
        .insert(enrollments)
        .values({ studyId, labId, labCode: PUBLISHED_LAB_CODES[labIndex], state: "accepted", invitedAt: new Date("2025-07-21"), respondedAt: new Date("2025-07-29") })
        .returning();
      const [shipment] = await tx.insert(shipments).values({
        enrollmentId: enrollment!.id,
        carrier: "Brellwick Freight",
        trackingNumber: `BW-D${4101 + labIndex}`,
        shippedOn: "2025-09-02",
        receivedOn: "2025-09-05",
        status: "received",
        condition: "good",
      }).returning();
      await tx.insert(shipmentItems).values(packingList.map((item, sortOrder) => ({ ...item, shipmentId: shipment!.id, sortOrder })));
      for (const [code, materialId] of materialIds) {
        for (const response of responseRows) {
          const [cell] = await tx
            .insert(cells)
            .values({ enrollmentId: enrollment!.id, materialId, responseId: response.id, status: "submitted", submittedAt: new Date("2025-10-22") })
            .returning();
          const cellValues = values.filter((v) => v.labIndex === labIndex && v.material === code && v.response === response.key);
          await tx.insert(results).values(cellValues.map((v) => ({ cellId: cell!.id, replicate: v.replicate, value: v.value, testedOn: "2025-10-15", operator: DEMO_PEOPLE.analysts[labIndex]!.name })));
          const decided = new Date("2026-02-10");
          if (labIndex === 3 && code === "M2" && response.key === "holes") {
            await tx.insert(cellDecisions).values({ cellId: cell!.id, decision: "excluded", reason: EXCLUSION_REASON, decidedBy: coordinatorId, decidedAt: decided });
          }
          if (labIndex === 6 && code === "M3" && response.key === "surface") {
            await tx.insert(cellDecisions).values({ cellId: cell!.id, decision: "retained", reason: "Queried for a high k; the lab's operator log shows the method was followed.", decidedBy: coordinatorId, decidedAt: decided });
          }
        }
      }
    }
    const [statement] = await tx
      .insert(precisionStatements)
      .values({ studyId, version: 1, state: "approved", textE691: e691Text(snapshot), textC670: c670Text(snapshot), snapshot, dataVersion: 1, createdBy: coordinatorId, sentAt: new Date("2026-03-03") })
      .returning();
    await tx.insert(votes).values(reviewerIds.map((reviewerId) => ({ statementId: statement!.id, reviewerId, choice: "approve" as const, updatedAt: new Date("2026-03-20") })));
    return studyId;
  });
}

async function seedComparison(db: Database, studyId: number) {
  const userId = await idOf(db, DEMO_PEOPLE.analysts[0]!.email);
  if (await db.query.comparisons.findFirst({ where: eq(comparisons.userId, userId) })) return;
  const statement = (await db.query.precisionStatements.findFirst({ where: eq(precisionStatements.studyId, studyId) }))!;
  const snapshot = statement.snapshot as StatementSnapshot;
  const reference = { label: "Plant mix 4000 (current sand)", values: [12, 13, 12] };
  const trial = { label: "Plant mix 4000 with blended sand", values: [15, 16, 16] };
  const comparison = compareMixtures(snapshot.analysis, "surface", "same-lab", reference, trial)!;
  await db.insert(comparisons).values({
    userId,
    statementId: statement.id,
    response: "surface",
    setting: "same-lab",
    referenceLabel: reference.label,
    trialLabel: trial.label,
    referenceValues: reference.values,
    trialValues: trial.values,
    notes: "Trial of a 50/50 blend of natural and manufactured sand before the spring paving season.",
    outcome: { comparison, reference: acceptabilityCheck(reference.values, comparison.precision.sr), trial: acceptabilityCheck(trial.values, comparison.precision.sr) },
    createdAt: new Date("2026-04-08T09:30:00Z"),
  });
}

export const RUGGEDNESS_FACTORS = [
  { column: 1, name: "Float angle", unit: "°", low: "5", high: "10" },
  { column: 2, name: "Time after placement when floating starts", unit: "min", low: "10", high: "20" },
  { column: 3, name: "Height left before strike-off", unit: "mm", low: "3", high: "6" },
  { column: 4, name: "Depth of the preformed holes", unit: "mm", low: "45", high: "55" },
  { column: 5, name: "Operator", unit: "", low: "Operator A", high: "Operator B" },
];

async function seedRuggednessStudy(db: Database) {
  if (await db.query.studies.findFirst({ where: eq(studies.code, RUGGEDNESS_STUDY_CODE) })) return;
  const coordinatorId = await idOf(db, DEMO_PEOPLE.coordinator.email);
  const design = plackettBurmanDesign(8);
  const noise = generator(1170);
  // Later floating stiffens the surface: +1.5 passes per half-range on the holes, +2 on the surface; the rest is scatter.
  const passes = (row: readonly number[], base: number, effect: number) => Math.max(1, Math.round(base + effect * row[1]! + (noise() - 0.5) * 1.6));
  await db.transaction(async (tx) => {
    const [study] = await tx
      .insert(studies)
      .values({
        code: RUGGEDNESS_STUDY_CODE,
        title: "Ruggedness of the float finishing test",
        kind: "ruggedness",
        testMethod: "Float finishing test of fresh concrete",
        notes: "Single-lab screening of five procedure details before the next round robin; reference paving mix M1, one batch per run.",
        state: "testing",
        replicatesPerCell: 2,
        targetSurfaceRating: 2,
        ownerId: coordinatorId,
      })
      .returning();
    const studyId = study!.id;
    const responseRows = await tx.insert(responses).values(FLOAT_FINISHING_RESPONSES.map((r, i) => ({ ...r, studyId, decimals: 0, sortOrder: i }))).returning();
    await tx.insert(ruggednessPlans).values({ studyId, runs: 8, replicates: 2, runOrderSeed: 4242, runOrder: randomRunOrder(8, 4242) });
    await tx.insert(ruggednessFactors).values(RUGGEDNESS_FACTORS.map((f) => ({ ...f, studyId })));
    const now = new Date("2026-05-12T15:00:00Z");
    await tx.insert(ruggednessResults).values(
      design.flatMap((row, i) =>
        responseRows.flatMap((response) =>
          [1, 2].map((replicate) => ({
            studyId,
            run: i + 1,
            responseId: response.id,
            replicate,
            value: response.key === "holes" ? passes(row, 8, 1.5) : passes(row, 14, 2),
            enteredBy: coordinatorId,
            updatedAt: now,
          })),
        ),
      ),
    );
  });
}

export async function seedToolkitDemo(db: Database) {
  const studyId = await seedPublishedStudy(db);
  await seedComparison(db, studyId);
  await seedRuggednessStudy(db);
}
