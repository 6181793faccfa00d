/**
 * Every loader and action checks access here. Someone outside a study or lab
 * gets 404, not 403, so the existence of a study does not leak.
 */
import { and, eq, sql } from "drizzle-orm";
import { data, redirect } from "react-router";
import { preparedOnce } from "~/db/client.server";
import { enrollments, type Role, studies, studyCoordinators, studyReviewers } from "~/db/schema";
import { sessionStorage } from "~/server/session.server";
import { loadSessionUser, type SessionUser } from "~/models/user.server";

export function notFound(): never {
  throw data("Not found", { status: 404 });
}

// The root loader and the page's own loader both ask for the user of one request; read the session once.
// (After an action, React Router runs the loaders with a new Request, so a change the action made is seen.)
const userOfRequest = new WeakMap<Request, Promise<SessionUser | null>>();

export function getUser(request: Request): Promise<SessionUser | null> {
  let user = userOfRequest.get(request);
  if (!user) {
    user = sessionStorage.getSession(request.headers.get("Cookie")).then((session) => {
      const userId = session.get("userId");
      return userId ? loadSessionUser(userId) : null;
    });
    userOfRequest.set(request, user);
  }
  return user;
}

export async function requireUser(request: Request): Promise<SessionUser> {
  const user = await getUser(request);
  if (!user) {
    const url = new URL(request.url);
    throw redirect(`/login?redirectTo=${encodeURIComponent(url.pathname + url.search)}`);
  }
  return user;
}

export async function requireRole(request: Request, ...roles: Role[]): Promise<SessionUser> {
  const user = await requireUser(request);
  if (!roles.some((role) => user.roles.includes(role))) notFound();
  return user;
}

/** The lists of studies, rounds and ruggedness studies: coordinators and admins read them; only coordinators start new ones. */
export async function requireStudyListReader(request: Request) {
  const user = await requireRole(request, "coordinator", "admin");
  return { user, canCreate: user.roles.includes("coordinator") };
}

export type StudyAccess = "admin" | "coordinator" | "reviewer" | "analyst";

// Every study page asks these before anything else.
const accessQueries = preparedOnce((database) => {
  const studyId = sql.placeholder("studyId");
  const userId = sql.placeholder("userId");
  return {
    study: database.query.studies.findFirst({ where: eq(studies.id, studyId) }).prepare(),
    coordinator: database.query.studyCoordinators.findFirst({ where: and(eq(studyCoordinators.studyId, studyId), eq(studyCoordinators.userId, userId)) }).prepare(),
    reviewer: database.query.studyReviewers.findFirst({ where: and(eq(studyReviewers.studyId, studyId), eq(studyReviewers.userId, userId)) }).prepare(),
    enrollment: database.query.enrollments.findFirst({ where: and(eq(enrollments.studyId, studyId), eq(enrollments.labId, sql.placeholder("labId"))) }).prepare(),
  };
});

/** How a user may see a study, or null when the study is none of theirs. */
export async function studyAccessFor(user: SessionUser, studyId: number) {
  const queries = accessQueries();
  const study = await queries.study.execute({ studyId });
  if (!study) return null;
  if (user.roles.includes("admin")) return { study, access: "admin" as const, enrollment: null };
  const coordinates = study.ownerId === user.id || (await queries.coordinator.execute({ studyId, userId: user.id }));
  if (coordinates) return { study, access: "coordinator" as const, enrollment: null };
  const reviews = await queries.reviewer.execute({ studyId, userId: user.id });
  if (reviews) return { study, access: "reviewer" as const, enrollment: null };
  for (const labId of user.labIds) {
    const enrollment = await queries.enrollment.execute({ studyId, labId });
    if (enrollment) return { study, access: "analyst" as const, enrollment };
  }
  return null;
}

/**
 * A lab that declined the invitation or was withdrawn keeps a notice on the
 * study's first page and nothing else: its analysts no longer follow the study.
 */
export function enrollmentEnded(enrollment: { state: string } | null | undefined) {
  return enrollment?.state === "declined" || enrollment?.state === "withdrawn";
}

/** The user and their access to the study, or 404 when their access is not among `allowed`. */
export async function requireStudyAccess(request: Request, studyIdParam: string | undefined, allowed: StudyAccess[]) {
  const user = await requireUser(request);
  const studyId = Number(studyIdParam);
  if (!Number.isSafeInteger(studyId) || studyId <= 0) notFound();
  const found = await studyAccessFor(user, studyId);
  if (!found || !allowed.includes(found.access)) notFound();
  return { user, ...found };
}

/** A lab the user belongs to, or 404. */
export async function requireLabMember(request: Request, labId: number, { contact = false } = {}) {
  const user = await requireUser(request);
  const ids = contact ? user.contactLabIds : user.labIds;
  if (!ids.includes(labId)) notFound();
  return user;
}
