import { eq } from "drizzle-orm";
import { db } from "~/db/client.server";
import { attachments, cells, enrollments, results, shipments, studies } from "~/db/schema";
import { type StudyAccess, studyAccessFor } from "~/server/guards.server";
import type { SessionUser } from "~/models/user.server";

/**
 * Whether the user may download an attachment: it follows the attachment to
 * what it belongs to and applies that thing's access rule. A file not yet
 * linked to anything is its uploader's alone.
 */
export async function readableAttachment(user: SessionUser, attachmentId: number) {
  const attachment = await db.query.attachments.findFirst({ where: eq(attachments.id, attachmentId) });
  if (!attachment) return null;

  const allowedIn = async (studyId: number, roles: StudyAccess[], enrollmentId?: number) => {
    const found = await studyAccessFor(user, studyId);
    if (!found || !roles.includes(found.access)) return false;
    // An analyst reaches only their own lab's enrollment.
    return found.access !== "analyst" || enrollmentId === undefined || found.enrollment?.id === enrollmentId;
  };

  const [resultLink] = await db
    .select({ studyId: enrollments.studyId, enrollmentId: enrollments.id })
    .from(results)
    .innerJoin(cells, eq(cells.id, results.cellId))
    .innerJoin(enrollments, eq(enrollments.id, cells.enrollmentId))
    .where(eq(results.photoAttachmentId, attachmentId))
    .limit(1);
  if (resultLink) {
    return (await allowedIn(resultLink.studyId, ["admin", "coordinator", "reviewer", "analyst"], resultLink.enrollmentId)) ? attachment : null;
  }

  const [shipmentLink] = await db
    .select({ studyId: enrollments.studyId, enrollmentId: enrollments.id })
    .from(shipments)
    .innerJoin(enrollments, eq(enrollments.id, shipments.enrollmentId))
    .where(eq(shipments.photoAttachmentId, attachmentId))
    .limit(1);
  if (shipmentLink) {
    return (await allowedIn(shipmentLink.studyId, ["admin", "coordinator", "analyst"], shipmentLink.enrollmentId)) ? attachment : null;
  }

  const protocolOf = await db.query.studies.findFirst({ where: eq(studies.protocolAttachmentId, attachmentId) });
  if (protocolOf) {
    return (await allowedIn(protocolOf.id, ["admin", "coordinator", "reviewer", "analyst"])) ? attachment : null;
  }

  return attachment.uploadedBy === user.id ? attachment : null;
}
