/**
 * Precision statements: a frozen snapshot of the analysis (data version,
 * decisions, figures) with draft texts in the E691 and C670 forms, sent to
 * the committee, answered, and published.
 */
import { asc, eq } from "drizzle-orm";
import { db } from "~/db/client.server";
import { materials, responses } from "~/db/schema";

/** The study's responses and materials, in their order, as the analysis pages and the snapshot name them. */
export async function studyDesign(studyId: number) {
  const [responseRows, materialRows] = await Promise.all([
    db.select().from(responses).where(eq(responses.studyId, studyId)).orderBy(asc(responses.sortOrder)),
    db.select().from(materials).where(eq(materials.studyId, studyId)).orderBy(asc(materials.sortOrder)),
  ]);
  return {
    responses: responseRows.map(({ key, name, unit, decimals }) => ({ key, name, unit, decimals })),
    materials: materialRows.map(({ code, description }) => ({ code, description })),
  };
}
