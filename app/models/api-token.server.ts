import { randomBytes } from "node:crypto";
import { and, asc, desc, eq, isNull, lt, or } from "drizzle-orm";
import { db } from "~/db/client.server";
import { apiTokens, cells, enrollments, materials, responses, studies } from "~/db/schema";
import { studyAccessFor } from "~/server/guards.server";
import { AccountError, type SessionUser } from "~/models/user.server";
import { hashToken } from "~/server/token-hash.server";
import type { ApiExampleContext } from "~/lib/api/examples";
import { studyDesign } from "~/models/statement.server";
import { listCoordinatedStudies, listLabEnrollments, listReviewedStudies } from "~/models/study.server";

const TOKEN_PREFIX = "rbt_";

export type ApiScope = (typeof apiTokens.$inferSelect)["scope"];
export type ApiToken = typeof apiTokens.$inferSelect;

/**
 * Creates a token for the user, limited to one enrollment (`results:write`) or
 * one study (`study:read`) the user may already reach. The token itself is
 * returned once and only its hash is kept.
 */
export async function createApiToken(
  user: SessionUser,
  input: { name: string; scope: ApiScope; enrollmentId?: number | null; studyId?: number | null },
) {
  let enrollmentId: number | null = null;
  let studyId: number | null = null;
  if (input.scope === "results:write") {
    const enrollment = input.enrollmentId ? await db.query.enrollments.findFirst({ where: eq(enrollments.id, input.enrollmentId) }) : undefined;
    if (!enrollment || !user.labIds.includes(enrollment.labId)) throw new AccountError("target", "Choose one of your lab's studies.");
    enrollmentId = enrollment.id;
    studyId = enrollment.studyId;
  } else {
    const found = input.studyId ? await studyAccessFor(user, input.studyId) : null;
    if (!found) throw new AccountError("target", "Choose a study you can see.");
    studyId = found.study.id;
  }
  const token = TOKEN_PREFIX + randomBytes(32).toString("base64url");
  const [row] = await db
    .insert(apiTokens)
    .values({ userId: user.id, name: input.name, scope: input.scope, enrollmentId, studyId, tokenHash: hashToken(token) })
    .returning();
  return { token, row: row! };
}

export async function listApiTokens(userId: number) {
  return db
    .select({
      id: apiTokens.id,
      name: apiTokens.name,
      scope: apiTokens.scope,
      studyCode: studies.code,
      createdAt: apiTokens.createdAt,
      lastUsedAt: apiTokens.lastUsedAt,
      revokedAt: apiTokens.revokedAt,
    })
    .from(apiTokens)
    .leftJoin(studies, eq(studies.id, apiTokens.studyId))
    .where(eq(apiTokens.userId, userId))
    .orderBy(desc(apiTokens.createdAt));
}

export async function revokeApiToken(userId: number, tokenId: number) {
  await db
    .update(apiTokens)
    .set({ revokedAt: new Date() })
    .where(and(eq(apiTokens.id, tokenId), eq(apiTokens.userId, userId), isNull(apiTokens.revokedAt)));
}

const LAST_USE_RESOLUTION_MS = 60_000;

/** Until when a use of the token needs no new last-use record (epoch ms). */
const lastUseRecordedUntil = (token: ApiToken) => (token.lastUsedAt?.getTime() ?? 0) + LAST_USE_RESOLUTION_MS;

/** The live token behind a bearer string, recording its use (at most once a minute, to spare writes). */
export async function activeApiToken(token: string) {
  if (!token.startsWith(TOKEN_PREFIX)) return null;
  const row = await db.query.apiTokens.findFirst({ where: eq(apiTokens.tokenHash, hashToken(token)) });
  if (!row || row.revokedAt) return null;
  const now = new Date();
  if (now.getTime() > lastUseRecordedUntil(row)) {
    await db
      .update(apiTokens)
      .set({ lastUsedAt: now })
      .where(and(eq(apiTokens.id, row.id), or(isNull(apiTokens.lastUsedAt), lt(apiTokens.lastUsedAt, new Date(now.getTime() - LAST_USE_RESOLUTION_MS)))));
  }
  return row;
}

/** The study's first submitted cell as the what-if query writes it (L03:F1:holes), or null before any lab submits. */
async function firstSubmittedCell(studyId: number) {
  const [cell] = await db
    .select({ lab: enrollments.labCode, material: materials.code, response: responses.key })
    .from(cells)
    .innerJoin(enrollments, eq(enrollments.id, cells.enrollmentId))
    .innerJoin(materials, eq(materials.id, cells.materialId))
    .innerJoin(responses, eq(responses.id, cells.responseId))
    .where(and(eq(enrollments.studyId, studyId), eq(cells.status, "submitted")))
    .orderBy(asc(enrollments.labCode), asc(materials.sortOrder), asc(responses.sortOrder))
    .limit(1);
  return cell?.lab ? `${cell.lab}:${cell.material}:${cell.response}` : null;
}

// Which of a person's studies the API page's examples use: one with results to read first.
const EXAMPLE_ORDER = ["checking", "in_review", "published", "testing", "recruiting", "draft", "cancelled"];
const byExampleOrder = <T extends { state: string }>(rows: T[]) => [...rows].sort((a, b) => EXAMPLE_ORDER.indexOf(a.state) - EXAMPLE_ORDER.indexOf(b.state));

/** The person's own studies, round and lab enrollment that the API page fills its examples with. */
export async function apiExampleContext(user: SessionUser, origin: string): Promise<ApiExampleContext> {
  const coordinates = user.role === "admin" || user.role === "coordinator";
  const reviews = user.role === "reviewer";
  const [coordinated, reviewed, labStudies] = await Promise.all([
    coordinates ? listCoordinatedStudies(user, "any") : Promise.resolve([]),
    reviews ? listReviewedStudies(user.id) : Promise.resolve([]),
    listLabEnrollments(user.labIds),
  ]);
  const readable = byExampleOrder(coordinates ? coordinated.filter((s) => s.kind === "precision") : reviewed);
  const taking = labStudies.filter((e) => e.enrollmentState === "accepted" && e.studyState === "testing");
  const entryStudy = taking[0] ?? null;
  const design = entryStudy ? await studyDesign(entryStudy.studyId) : null;
  const ownLab = byExampleOrder(labStudies.filter((e) => e.enrollmentState === "accepted").map((e) => ({ id: e.studyId, code: e.studyCode, state: e.studyState })));
  const pick = (row: { id: number; code: string } | undefined) => (row ? { id: row.id, code: row.code } : null);
  const study = pick(readable[0] ?? (entryStudy ? { id: entryStudy.studyId, code: entryStudy.studyCode } : ownLab[0]));
  return {
    origin,
    email: user.email,
    study,
    coordinates,
    whatIfCell: coordinates && study ? await firstSubmittedCell(study.id) : null,
    reviews,
    published: pick(readable.find((s) => s.state === "published")),
    round: pick(byExampleOrder(coordinated.filter((s) => s.kind === "proficiency"))[0]),
    entry:
      entryStudy && design?.materials[0] && design.responses[0]
        ? { enrollmentId: entryStudy.enrollmentId, studyCode: entryStudy.studyCode, material: design.materials[0].code, response: design.responses[0].key }
        : null,
  };
}
