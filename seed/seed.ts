/**
 * Writes the demo scenario into an empty database, and leaves alone what is
 * already there, so running it twice changes nothing.
 */
import { eq } from "drizzle-orm";
import type { Database } from "~/db/client.server";
import {
  cells,
  enrollments,
  freshPropertyTargets,
  labMembers,
  labs,
  userRoles,
  materials,
  mixtureConstituents,
  queries,
  responses,
  results,
  shipmentItems,
  shipments,
  studies,
  studyReviewers,
  type StudyState,
  users,
} from "~/db/schema";
import { hashPassword } from "~/models/user.server";
import { FLOAT_FINISHING_TEMPLATE } from "~/lib/study-templates";
import {
  CHECKING_STUDY_PLANTS,
  CHECKING_STUDY_SEED,
  DEMO_LABS,
  DEMO_MATERIALS,
  DEMO_OVERLAY_MATERIALS,
  DEMO_PASSWORD,
  DEMO_PEOPLE,
  demoPackingList,
  demoResults,
  FLOAT_FINISHING_RESPONSES,
} from "./demo-data";
import { seedDemoRounds } from "./rounds";
import { seedToolkitDemo } from "./toolkit-demo";

type StudySpec = {
  code: string;
  title: string;
  state: StudyState;
  notes: string;
  resultsDue: string;
  materials: typeof DEMO_MATERIALS;
  /** Blind code of each lab, by lab index (as drawn once for the demo). */
  labCodes: string[];
  /** Which labs have submitted, which hold drafts; the rest have not started. */
  submittedLabs: number[];
  draftLabs: number[];
  resultSeed: number;
  plants?: typeof CHECKING_STUDY_PLANTS;
  /** Labs whose materials are still on the way (the rest received them, one of them damaged when `damagedLab` is set). */
  inTransitLabs: number[];
  damagedLab?: { labIndex: number; notes: string };
  /** A question the coordinator has already put to one lab about one cell. */
  openQuery?: { labIndex: number; material: string; response: string; statistic: string; question: string };
};

const STUDIES: StudySpec[] = [
  {
    code: "FF-2026-A",
    title: "Finishability of paving mixtures — SCM type and sand blend",
    state: "checking",
    notes: "Consortium round 1. Target surface rating 2 on the 1–3 visual scale.",
    resultsDue: "2026-10-30",
    materials: DEMO_MATERIALS,
    labCodes: ["L03", "L07", "L01", "L05", "L08", "L02", "L06", "L04"],
    submittedLabs: [0, 1, 2, 3, 4, 5, 6, 7],
    draftLabs: [],
    resultSeed: CHECKING_STUDY_SEED,
    plants: CHECKING_STUDY_PLANTS,
    inTransitLabs: [],
    damagedLab: { labIndex: 5, notes: "One bag of natural sand torn in transit; the lab batched from the spare bag of the same lot." },
  },
  {
    code: "FF-2026-B",
    title: "Finishability of fiber-reinforced overlay mixtures",
    state: "testing",
    notes: "Consortium round 2. Fibers are shipped pre-weighed per batch.",
    resultsDue: "2027-01-29",
    materials: DEMO_OVERLAY_MATERIALS,
    labCodes: ["L06", "L02", "L08", "L01", "L04", "L07", "L03", "L05"],
    submittedLabs: [0, 1, 2, 3],
    draftLabs: [4, 5],
    resultSeed: 7331,
    inTransitLabs: [6, 7],
    openQuery: {
      labIndex: 0,
      material: "F1",
      response: "surface",
      statistic: "",
      question: "Please confirm your three F1 pass counts to the target surface, and tell us whether any specimen was finished later than the others or by a different operator.",
    },
  },
];

const REPLICATES = 3;

export async function seedDemo(db: Database) {
  const passwordHash = await hashPassword(DEMO_PASSWORD);
  const userId = async (email: string, name: string, role: (typeof users.$inferInsert)["role"]) => {
    const existing = await db.query.users.findFirst({ where: eq(users.email, email) });
    if (existing) return existing.id;
    const [created] = await db.insert(users).values({ email, name, role, passwordHash }).returning();
    return created!.id;
  };

  await userId(DEMO_PEOPLE.admin.email, DEMO_PEOPLE.admin.name, "admin");
  const coordinatorId = await userId(DEMO_PEOPLE.coordinator.email, DEMO_PEOPLE.coordinator.name, "coordinator");
  const reviewerIds: number[] = [];
  for (const r of DEMO_PEOPLE.reviewers) reviewerIds.push(await userId(r.email, r.name, "reviewer"));

  const labIds: number[] = [];
  for (const [i, lab] of DEMO_LABS.entries()) {
    const analyst = DEMO_PEOPLE.analysts[i]!;
    let row = await db.query.labs.findFirst({ where: eq(labs.name, lab.name) });
    row ??= (
      await db.insert(labs).values({ ...lab, contactName: analyst.name, contactEmail: analyst.email }).returning()
    )[0]!;
    labIds.push(row.id);
    const analystId = await userId(analyst.email, analyst.name, "analyst");
    await db.insert(labMembers).values({ labId: row.id, userId: analystId, isContact: true }).onConflictDoNothing();
  }
  // One analyst also sits on the committee: the reviewer picker leaves them out of the studies their lab takes part in.
  const committeeAnalyst = DEMO_PEOPLE.analysts.at(-1)!;
  await db.insert(userRoles).values({ userId: await userId(committeeAnalyst.email, committeeAnalyst.name, "analyst"), role: "reviewer" }).onConflictDoNothing();

  for (const spec of STUDIES) {
    if (await db.query.studies.findFirst({ where: eq(studies.code, spec.code) })) continue;
    await db.transaction(async (tx) => {
      const [study] = await tx
        .insert(studies)
        .values({
          code: spec.code,
          title: spec.title,
          testMethod: "Float finishing test of fresh concrete",
          notes: spec.notes,
          state: spec.state,
          replicatesPerCell: REPLICATES,
          targetSurfaceRating: 2,
          specimenVolumeM3: FLOAT_FINISHING_TEMPLATE.specimenVolumeM3,
          wastePercent: FLOAT_FINISHING_TEMPLATE.wastePercent,
          enrollmentDeadline: "2026-08-14",
          shipDate: "2026-09-01",
          resultsDue: spec.resultsDue,
          ownerId: coordinatorId,
          dataVersion: 1,
        })
        .returning();
      const studyId = study!.id;
      await tx.insert(studyReviewers).values(reviewerIds.map((id) => ({ studyId, userId: id })));
      // Slump 75 mm ± 25 mm and air 6 % ± 1.5 points: the usual tolerances (reference/critical-values.md).
      await tx.insert(freshPropertyTargets).values([
        { studyId, property: "slump", target: 75, tolerance: 25 },
        { studyId, property: "air_content", target: 6, tolerance: 1.5 },
      ]);
      const responseRows = await tx
        .insert(responses)
        .values(FLOAT_FINISHING_RESPONSES.map((r, i) => ({ ...r, studyId, decimals: 0, sortOrder: i })))
        .returning();
      const materialRows = [];
      for (const [i, m] of spec.materials.entries()) {
        const [material] = await tx.insert(materials).values({ studyId, code: m.code, description: m.description, sortOrder: i }).returning();
        await tx.insert(mixtureConstituents).values(m.constituents.map((c, j) => ({ ...c, materialId: material!.id, sortOrder: j })));
        materialRows.push(material!);
      }
      const enrollmentIds: number[] = [];
      for (const [i, labId] of labIds.entries()) {
        const [enrollment] = await tx
          .insert(enrollments)
          .values({ studyId, labId, labCode: spec.labCodes[i], state: "accepted", invitedAt: new Date("2026-07-20"), respondedAt: new Date("2026-07-28") })
          .returning();
        enrollmentIds.push(enrollment!.id);
      }
      const packingList = demoPackingList(spec.materials);
      const shipmentRows = await tx.insert(shipments).values(
        enrollmentIds.map((enrollmentId, labIndex) => {
          const inTransit = spec.inTransitLabs.includes(labIndex);
          const damaged = spec.damagedLab?.labIndex === labIndex;
          return {
            enrollmentId,
            carrier: "Brellwick Freight",
            trackingNumber: `BW-${spec.code.slice(-1)}${String(4101 + labIndex)}`,
            shippedOn: inTransit ? "2026-11-24" : "2026-09-01",
            status: inTransit ? ("shipped" as const) : ("received" as const),
            receivedOn: inTransit ? null : "2026-09-04",
            condition: inTransit ? null : damaged ? ("damaged" as const) : ("good" as const),
            receiptNotes: damaged ? spec.damagedLab!.notes : "",
          };
        }),
      ).returning();
      await tx.insert(shipmentItems).values(shipmentRows.flatMap((shipment) => packingList.map((item, sortOrder) => ({ ...item, shipmentId: shipment.id, sortOrder }))));
      const cellIdOf = new Map<string, number>();
      const values = demoResults(materialRows.map((m) => m.code), REPLICATES, spec.resultSeed, spec.plants);
      for (const labIndex of [...spec.submittedLabs, ...spec.draftLabs]) {
        const submitted = spec.submittedLabs.includes(labIndex);
        // A lab with drafts has typed only its first material so far.
        const labMaterials = submitted ? materialRows : materialRows.slice(0, 1);
        for (const material of labMaterials) {
          for (const response of responseRows) {
            const [cell] = await tx
              .insert(cells)
              .values({
                enrollmentId: enrollmentIds[labIndex]!,
                materialId: material.id,
                responseId: response.id,
                status: submitted ? "submitted" : "draft",
                submittedAt: submitted ? new Date("2026-10-20") : null,
              })
              .returning();
            cellIdOf.set(`${labIndex}:${material.code}:${response.key}`, cell!.id);
            const cellValues = values.filter((v) => v.labIndex === labIndex && v.material === material.code && v.response === response.key);
            await tx.insert(results).values(
              cellValues.map((v) => ({
                cellId: cell!.id,
                replicate: v.replicate,
                value: v.value,
                testedOn: "2026-10-14",
                operator: DEMO_PEOPLE.analysts[labIndex]!.name,
              })),
            );
          }
        }
      }
      if (spec.openQuery) {
        const { labIndex, material, response, statistic, question } = spec.openQuery;
        await tx.insert(queries).values({ cellId: cellIdOf.get(`${labIndex}:${material}:${response}`)!, raisedBy: coordinatorId, statistic, question });
      }
    });
  }
  await seedToolkitDemo(db);
  // The rounds take σ_pt from the toolkit's published study, so they come after it.
  await seedDemoRounds(db, { coordinatorId, labIds, userId });
}
