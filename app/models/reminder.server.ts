/** Reminds the labs whose results are not all submitted — and only those. */
import { eq, inArray } from "drizzle-orm";
import { db } from "~/db/client.server";
import { enrollments, labs, type Study } from "~/db/schema";
import { recordAudit } from "~/server/audit.server";
import { appUrl, sendEmail } from "~/server/email.server";
import { missingResultsReminderEmail } from "~/server/email-templates.server";
import { studyMatrix } from "~/models/study.server";

export async function remindLabsWithMissingResults(study: Study, actorUserId: number, request: Request | null) {
  const matrix = await studyMatrix(study.id);
  const missing = matrix.rows
    .map((row) => ({ enrollmentId: row.id, codes: matrix.materials.filter((_, i) => !row.submitted[i]).map((m) => m.code) }))
    .filter((r) => r.codes.length > 0);
  if (missing.length === 0) return { reminded: [] as string[] };
  const contacts = await db
    .select({ enrollmentId: enrollments.id, name: labs.name, email: labs.contactEmail })
    .from(enrollments)
    .innerJoin(labs, eq(labs.id, enrollments.labId))
    .where(inArray(enrollments.id, missing.map((m) => m.enrollmentId)));
  const reminded: string[] = [];
  for (const m of missing) {
    const lab = contacts.find((c) => c.enrollmentId === m.enrollmentId);
    if (!lab?.email) continue;
    await sendEmail(
      missingResultsReminderEmail({ to: lab.email, labName: lab.name, study, missing: m.codes, resultsDue: study.resultsDue, url: appUrl(request, `/lab/studies/${study.id}`) }),
      { studyId: study.id },
    );
    reminded.push(lab.name);
  }
  await recordAudit({ actorUserId, action: "missing_results_reminded", entityType: "study", entityId: study.id, studyId: study.id, after: { labs: reminded } });
  return { reminded };
}
