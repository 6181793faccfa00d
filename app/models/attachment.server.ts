import { asc, eq } from "drizzle-orm";
import { db } from "~/db/client.server";
import { withCellContext } from "~/models/cell-context.server";
import { attachments, cells, enrollments, materials, responses, results, shipments, studies } from "~/db/schema";
import { type StudyAccess, studyAccessFor } from "~/server/guards.server";
import type { SessionUser } from "~/models/user.server";

export type ReadableAttachment = { attachment: typeof attachments.$inferSelect; downloadName: string };

/**
 * Whether the user may download an attachment, and the neutral name it is
 * served under: it follows the attachment to what it belongs to and applies
 * that thing's access rule. Reviewers see surface photos of submitted results
 * only, and every name carries the blind lab code, never the uploaded file's
 * name (which could name the lab). A file not yet linked to anything is its
 * uploader's alone.
 */
export async function readableAttachment(user: SessionUser, attachmentId: number): Promise<ReadableAttachment | null> {
  const attachment = await db.query.attachments.findFirst({ where: eq(attachments.id, attachmentId) });
  if (!attachment) return null;

  const accessIn = async (studyId: number, roles: StudyAccess[], enrollmentId?: number) => {
    const found = await studyAccessFor(user, studyId);
    if (!found || !roles.includes(found.access)) return null;
    // An analyst reaches only their own lab's enrollment.
    if (found.access === "analyst" && enrollmentId !== undefined && found.enrollment?.id !== enrollmentId) return null;
    return found.access;
  };

  const resultLinks = await withCellContext(
    db
      .select({
        studyId: enrollments.studyId,
        enrollmentId: enrollments.id,
        labCode: enrollments.labCode,
        material: materials.code,
        response: responses.key,
        replicate: results.replicate,
        cellStatus: cells.status,
      })
      .from(results)
      .innerJoin(cells, eq(cells.id, results.cellId))
      .$dynamic(),
  )
    .where(eq(results.photoAttachmentId, attachmentId))
    .orderBy(asc(responses.sortOrder));
  const resultLink = resultLinks[0];
  if (resultLink) {
    const access = await accessIn(resultLink.studyId, ["admin", "coordinator", "reviewer", "analyst"], resultLink.enrollmentId);
    if (!access) return null;
    // The committee reviews submitted results; a draft's photo is still the lab's own business.
    if (access === "reviewer" && resultLinks.some((link) => link.cellStatus !== "submitted")) return null;
    const name = `${resultLink.labCode ?? "lab"}-${resultLink.material}-${resultLink.response}-rep${resultLink.replicate}`;
    return { attachment, downloadName: name };
  }

  const [shipmentLink] = await db
    .select({ studyId: enrollments.studyId, enrollmentId: enrollments.id, labCode: enrollments.labCode, shipmentId: shipments.id })
    .from(shipments)
    .innerJoin(enrollments, eq(enrollments.id, shipments.enrollmentId))
    .where(eq(shipments.photoAttachmentId, attachmentId))
    .limit(1);
  if (shipmentLink) {
    const access = await accessIn(shipmentLink.studyId, ["admin", "coordinator", "analyst"], shipmentLink.enrollmentId);
    return access ? { attachment, downloadName: `${shipmentLink.labCode ?? "lab"}-receipt-${shipmentLink.shipmentId}` } : null;
  }

  const protocolOf = await db.query.studies.findFirst({ where: eq(studies.protocolAttachmentId, attachmentId) });
  if (protocolOf) {
    const access = await accessIn(protocolOf.id, ["admin", "coordinator", "reviewer", "analyst"]);
    return access ? { attachment, downloadName: `${protocolOf.code}-protocol` } : null;
  }

  return attachment.uploadedBy === user.id ? { attachment, downloadName: `upload-${attachment.id}` } : null;
}

