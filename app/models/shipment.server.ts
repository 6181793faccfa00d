/**
 * Shipments of materials to enrolled labs: `preparing → shipped → received |
 * lost`. Marking one shipped e-mails the lab; the lab confirms receipt with the
 * condition, notes and an optional photo.
 */
import { and, asc, count, desc, eq, inArray } from "drizzle-orm";
import { db } from "~/db/client.server";
import { cells, enrollments, labs, materials, mixtureConstituents, results, shipments, type Study } from "~/db/schema";
import { recordAudit } from "~/server/audit.server";
import { notFound } from "~/server/guards.server";
import { appUrl, sendEmail } from "~/server/email.server";
import { shipmentNoticeEmail } from "~/server/email-templates.server";
import { FieldRefusal } from "~/lib/field-refusal";
import { todayIso } from "~/lib/format";
import { receiptDateProblem } from "~/lib/plausible-dates";
import { enrollmentRefusal, type WriteKind, writeRefusal } from "~/lib/write-rules";

type Shipment = typeof shipments.$inferSelect;

export class ShipmentError extends FieldRefusal {}

function assertWritable(kind: WriteKind, study: Study, field = "form") {
  const refusal = writeRefusal(kind, study.state);
  if (refusal) throw new ShipmentError(field, refusal);
}

/** What goes in the box by default: each material with the lots of its constituents. */
export async function defaultContents(studyId: number) {
  const rows = await db
    .select({ code: materials.code, lot: mixtureConstituents.lot, name: mixtureConstituents.name })
    .from(materials)
    .leftJoin(mixtureConstituents, eq(mixtureConstituents.materialId, materials.id))
    .where(eq(materials.studyId, studyId))
    .orderBy(asc(materials.sortOrder), asc(materials.code), asc(mixtureConstituents.sortOrder));
  const byMaterial = new Map<string, string[]>();
  for (const r of rows) {
    const lots = byMaterial.get(r.code) ?? [];
    if (r.lot && !lots.includes(`${r.name} lot ${r.lot}`)) lots.push(`${r.name} lot ${r.lot}`);
    byMaterial.set(r.code, lots);
  }
  return [...byMaterial].map(([code, lots]) => (lots.length ? `${code}: ${lots.join(", ")}` : code)).join("; ");
}

async function enrollmentOf(study: Study, enrollmentId: number) {
  const enrollment = await db.query.enrollments.findFirst({ where: and(eq(enrollments.id, enrollmentId), eq(enrollments.studyId, study.id)) });
  if (!enrollment || enrollment.state !== "accepted") throw new ShipmentError("enrollmentId", "Ship only to labs that have accepted.");
  return enrollment;
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

export type ShipmentInput = { enrollmentId: number; contents: string; carrier: string; trackingNumber: string };

export async function createShipment(study: Study, input: ShipmentInput, actorUserId: number) {
  assertWritable("shipments", study);
  await enrollmentOf(study, input.enrollmentId);
  return db.transaction(async (tx) => {
    const [row] = await tx.insert(shipments).values(input).returning();
    await recordAudit({ actorUserId, action: "shipment_created", entityType: "shipment", entityId: row!.id, studyId: study.id, after: input }, tx);
    return row!;
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
        contents: shipment.contents,
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

/** Every shipment of the study with its lab, newest first. */
export async function listStudyShipments(studyId: number) {
  return db
    .select({
      id: shipments.id,
      enrollmentId: shipments.enrollmentId,
      labName: labs.name,
      labCode: enrollments.labCode,
      status: shipments.status,
      contents: shipments.contents,
      carrier: shipments.carrier,
      trackingNumber: shipments.trackingNumber,
      shippedOn: shipments.shippedOn,
      receivedOn: shipments.receivedOn,
      condition: shipments.condition,
      receiptNotes: shipments.receiptNotes,
      photoAttachmentId: shipments.photoAttachmentId,
    })
    .from(shipments)
    .innerJoin(enrollments, eq(enrollments.id, shipments.enrollmentId))
    .innerJoin(labs, eq(labs.id, enrollments.labId))
    .where(eq(enrollments.studyId, studyId))
    .orderBy(desc(shipments.id));
}

export async function listEnrollmentShipments(enrollmentId: number) {
  return db.select().from(shipments).where(eq(shipments.enrollmentId, enrollmentId)).orderBy(desc(shipments.id));
}
