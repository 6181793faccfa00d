/**
 * Shipments of materials to enrolled labs: `preparing → shipped → received |
 * lost`. Marking one shipped e-mails the lab; the lab confirms receipt with the
 * condition, notes and an optional photo.
 */
import { and, asc, count, desc, eq, inArray, ne, notExists } from "drizzle-orm";
import { db } from "~/db/client.server";
import { cells, enrollments, labs, materials, mixtureConstituents, results, shipmentItems, shipments, type Study } from "~/db/schema";
import { recordAudit } from "~/server/audit.server";
import { notFound } from "~/server/guards.server";
import { appUrl, sendEmail } from "~/server/email.server";
import { shipmentNoticeEmail } from "~/server/email-templates.server";
import { FieldRefusal } from "~/lib/field-refusal";
import { todayIso } from "~/lib/format";
import { type PackingItem, startingPackingList } from "~/lib/packing-list";
import { receiptDateProblem } from "~/lib/plausible-dates";
import { enrollmentRefusal, type WriteKind, writeRefusal } from "~/lib/write-rules";

type Shipment = typeof shipments.$inferSelect;

export class ShipmentError extends FieldRefusal {}

function assertWritable(kind: WriteKind, study: Study, field = "form") {
  const refusal = writeRefusal(kind, study.state);
  if (refusal) throw new ShipmentError(field, refusal);
}

/** The packing list a new shipment starts from: the study's constituent lots (see startingPackingList). */
export async function studyStartingPackingList(studyId: number) {
  const rows = await db
    .select({ materialCode: materials.code, kind: mixtureConstituents.kind, name: mixtureConstituents.name, lot: mixtureConstituents.lot })
    .from(mixtureConstituents)
    .innerJoin(materials, eq(materials.id, mixtureConstituents.materialId))
    .where(eq(materials.studyId, studyId))
    .orderBy(asc(materials.sortOrder), asc(materials.code), asc(mixtureConstituents.sortOrder));
  return startingPackingList(rows);
}

/**
 * The accepted labs still waiting for materials: no shipment yet, or only lost
 * ones (a lost box is replaced). A damaged one is replaced by the coordinator's
 * decision, not by the "every lab" list.
 */
export async function labsAwaitingShipment(studyId: number) {
  const open = db
    .select({ id: shipments.id })
    .from(shipments)
    .where(and(eq(shipments.enrollmentId, enrollments.id), ne(shipments.status, "lost")));
  return db
    .select({ enrollmentId: enrollments.id, labCode: enrollments.labCode, labName: labs.name })
    .from(enrollments)
    .innerJoin(labs, eq(labs.id, enrollments.labId))
    .where(and(eq(enrollments.studyId, studyId), eq(enrollments.state, "accepted"), notExists(open)))
    .orderBy(asc(enrollments.labCode), asc(labs.name));
}

async function shipmentOf(study: Study, shipmentId: number) {
  const [row] = await db
    .select({ shipment: shipments })
    .from(shipments)
    .innerJoin(enrollments, eq(enrollments.id, shipments.enrollmentId))
    .where(and(eq(shipments.id, shipmentId), eq(enrollments.studyId, study.id)));
  if (!row) throw new ShipmentError("form", "That shipment is not part of this study.");
  return row.shipment;
}

export type ShipmentInput = { enrollmentId: number | "every"; labCount?: number; items: PackingItem[]; note: string; carrier: string; trackingNumber: string };

/**
 * Prepares the same packing list for one lab or for every lab awaiting
 * materials, all in one transaction. Only a lab awaiting a shipment can get
 * one, so a second box is never prepared by accident; for "every", the number
 * of labs must still be the one the coordinator confirmed. Returns how many
 * shipments were prepared.
 */
export async function prepareShipments(study: Study, input: ShipmentInput, actorUserId: number) {
  assertWritable("shipments", study);
  const awaiting = await labsAwaitingShipment(study.id);
  let targets: number[];
  if (input.enrollmentId === "every") {
    if (awaiting.length === 0) throw new ShipmentError("enrollmentId", "Every accepted lab already has a shipment.");
    if (input.labCount !== awaiting.length) {
      throw new ShipmentError("enrollmentId", `The labs awaiting materials changed meanwhile: ${awaiting.length} now. Check the list and send again.`);
    }
    targets = awaiting.map((lab) => lab.enrollmentId);
  } else {
    const enrollmentId = input.enrollmentId;
    if (!awaiting.some((lab) => lab.enrollmentId === enrollmentId)) {
      throw new ShipmentError("enrollmentId", "Ship only to labs that have accepted and have no shipment yet.");
    }
    targets = [enrollmentId];
  }
  const { items, note, carrier, trackingNumber } = input;
  return db.transaction(async (tx) => {
    for (const enrollmentId of targets) {
      const [row] = await tx.insert(shipments).values({ enrollmentId, note, carrier, trackingNumber }).returning();
      await tx.insert(shipmentItems).values(items.map((item, sortOrder) => ({ ...item, shipmentId: row!.id, sortOrder })));
      await recordAudit({ actorUserId, action: "shipment_created", entityType: "shipment", entityId: row!.id, studyId: study.id, after: { enrollmentId, items, note, carrier, trackingNumber } }, tx);
    }
    return targets.length;
  });
}

/** Moves a shipment on, only from the state the change starts from, so a stale page cannot skip a step. */
async function moveShipment(study: Study, shipment: Shipment, from: Shipment["status"][], change: Partial<Shipment>, action: string, actorUserId: number) {
  if (!from.includes(shipment.status)) throw new ShipmentError("form", `This shipment is ${shipment.status}; it cannot be changed that way.`);
  await db.transaction(async (tx) => {
    const moved = await tx.update(shipments).set(change).where(and(eq(shipments.id, shipment.id), inArray(shipments.status, from))).returning();
    if (moved.length === 0) throw new ShipmentError("form", "Someone changed this shipment meanwhile; reload and try again.");
    await recordAudit({ actorUserId, action, entityType: "shipment", entityId: shipment.id, studyId: study.id, before: shipment, after: change }, tx);
  });
}

export async function markShipped(
  study: Study,
  input: { shipmentId: number; shippedOn: string; carrier: string; trackingNumber: string },
  actorUserId: number,
  request: Request | null,
) {
  assertWritable("shipments", study);
  const shipment = await shipmentOf(study, input.shipmentId);
  if (input.shippedOn > todayIso()) throw new ShipmentError("shippedOn", "The shipping date is in the future; mark the shipment shipped on the day it leaves.");
  const { shipmentId: _, ...change } = input;
  await moveShipment(study, shipment, ["preparing"], { ...change, status: "shipped" }, "shipment_shipped", actorUserId);
  const [lab] = await db
    .select({ name: labs.name, contactEmail: labs.contactEmail })
    .from(enrollments)
    .innerJoin(labs, eq(labs.id, enrollments.labId))
    .where(eq(enrollments.id, shipment.enrollmentId));
  if (lab?.contactEmail) {
    await sendEmail(
      shipmentNoticeEmail({
        to: lab.contactEmail,
        labName: lab.name,
        study,
        items: await itemsOf([shipment.id]).then((byShipment) => byShipment.get(shipment.id) ?? []),
        note: shipment.note,
        carrier: input.carrier,
        trackingNumber: input.trackingNumber,
        shippedOn: input.shippedOn,
        url: appUrl(request, `/lab/studies/${study.id}/receipt`),
      }),
      { studyId: study.id },
    );
  }
}

export async function markLost(study: Study, shipmentId: number, actorUserId: number) {
  assertWritable("shipments", study);
  const shipment = await shipmentOf(study, shipmentId);
  await moveShipment(study, shipment, ["preparing", "shipped"], { status: "lost" }, "shipment_lost", actorUserId);
}

export type ReceiptInput = { shipmentId: number; receivedOn: string; condition: "good" | "damaged"; receiptNotes: string; photoAttachmentId: number | null };

/**
 * The lab confirms a shipment of its own enrollment, or corrects its receipt
 * until the lab records its first result (the test dates are checked against
 * the date of receipt). Dates in the future or before the shipment left are
 * refused; a correction keeps the earlier receipt in the audit trail. Any
 * other id, another lab's shipment or one that does not exist, is the same
 * 404, so a lab cannot count the study's shipments or labs.
 */
export async function confirmReceipt(study: Study, enrollment: Pick<typeof enrollments.$inferSelect, "id" | "state">, input: ReceiptInput, actorUserId: number) {
  const shipment = await db.query.shipments.findFirst({ where: and(eq(shipments.id, input.shipmentId), eq(shipments.enrollmentId, enrollment.id)) });
  if (!shipment) notFound();
  assertWritable("receipts", study);
  const notEnrolled = enrollmentRefusal(enrollment.state);
  if (notEnrolled) throw new ShipmentError("form", notEnrolled);
  const dateProblem = receiptDateProblem(input.receivedOn, { shippedOn: shipment.shippedOn, today: todayIso() });
  if (dateProblem) throw new ShipmentError("receivedOn", dateProblem);
  if (input.condition === "damaged" && !input.receiptNotes) throw new ShipmentError("receiptNotes", "Describe the damage so the coordinator can decide what to resend.");
  const { shipmentId: _, ...change } = input;
  if (shipment.status !== "received") {
    await moveShipment(study, shipment, ["shipped"], { ...change, status: "received" }, "shipment_received", actorUserId);
    return "confirmed" as const;
  }
  if (await hasResults(enrollment.id)) throw new ShipmentError("form", "Your lab has recorded results; the receipt can no longer be corrected. Write to the coordinator instead.");
  const correction = { ...change, photoAttachmentId: change.photoAttachmentId ?? shipment.photoAttachmentId };
  await moveShipment(study, shipment, ["received"], correction, "shipment_receipt_corrected", actorUserId);
  return "corrected" as const;
}

async function hasResults(enrollmentId: number) {
  const [row] = await db.select({ n: count() }).from(results).innerJoin(cells, eq(cells.id, results.cellId)).where(eq(cells.enrollmentId, enrollmentId));
  return (row?.n ?? 0) > 0;
}

/** Whether the lab may still correct a receipt: no result recorded yet. */
export async function receiptCorrectable(study: Study, enrollmentId: number) {
  return writeRefusal("receipts", study.state) === null && !(await hasResults(enrollmentId));
}

type ShipmentItem = Omit<typeof shipmentItems.$inferSelect, "shipmentId" | "sortOrder">;

/** The packing lists of the given shipments, in their order. */
async function itemsOf(shipmentIds: number[]) {
  const byShipment = new Map<number, ShipmentItem[]>();
  if (shipmentIds.length === 0) return byShipment;
  const rows = await db.select().from(shipmentItems).where(inArray(shipmentItems.shipmentId, shipmentIds)).orderBy(asc(shipmentItems.shipmentId), asc(shipmentItems.sortOrder));
  for (const { shipmentId, sortOrder: _, ...item } of rows) byShipment.set(shipmentId, [...(byShipment.get(shipmentId) ?? []), item]);
  return byShipment;
}

const shipmentColumns = {
  id: shipments.id,
  enrollmentId: shipments.enrollmentId,
  labName: labs.name,
  labCode: enrollments.labCode,
  status: shipments.status,
  note: shipments.note,
  carrier: shipments.carrier,
  trackingNumber: shipments.trackingNumber,
  shippedOn: shipments.shippedOn,
  receivedOn: shipments.receivedOn,
  condition: shipments.condition,
  receiptNotes: shipments.receiptNotes,
  photoAttachmentId: shipments.photoAttachmentId,
  createdAt: shipments.createdAt,
};

/** Every shipment of the study with its lab and packing list, by lab, the latest first within a lab. */
export async function listStudyShipments(studyId: number) {
  const rows = await db
    .select(shipmentColumns)
    .from(shipments)
    .innerJoin(enrollments, eq(enrollments.id, shipments.enrollmentId))
    .innerJoin(labs, eq(labs.id, enrollments.labId))
    .where(eq(enrollments.studyId, studyId))
    .orderBy(asc(enrollments.labCode), asc(labs.name), desc(shipments.id));
  const items = await itemsOf(rows.map((row) => row.id));
  return rows.map((row) => ({ ...row, items: items.get(row.id) ?? [] }));
}

/** One shipment's packing list with where it goes; 404 when it is not part of the study. */
export async function packingListOf(studyId: number, shipmentId: number) {
  const [row] = await db
    .select({ ...shipmentColumns, address: labs.address, contactName: labs.contactName, contactEmail: labs.contactEmail })
    .from(shipments)
    .innerJoin(enrollments, eq(enrollments.id, shipments.enrollmentId))
    .innerJoin(labs, eq(labs.id, enrollments.labId))
    .where(and(eq(shipments.id, shipmentId), eq(enrollments.studyId, studyId)));
  if (!row) notFound();
  return { ...row, items: (await itemsOf([row.id])).get(row.id) ?? [] };
}

export async function listEnrollmentShipments(enrollmentId: number) {
  const rows = await db.select().from(shipments).where(eq(shipments.enrollmentId, enrollmentId)).orderBy(desc(shipments.id));
  const items = await itemsOf(rows.map((row) => row.id));
  return rows.map((row) => ({ ...row, items: items.get(row.id) ?? [] }));
}
