/**
 * A study's parent route checks access once, in its middleware, and hands the
 * study, the caller and their role to its child routes through the router's
 * context. Children only narrow the roles they serve.
 */
import { createContext, type RouterContextProvider } from "react-router";
import { enrollmentEnded, notFound, requireStudyAccess, type StudyAccess } from "~/server/guards.server";

export type StudyAccessGrant = Awaited<ReturnType<typeof requireStudyAccess>>;

const studyAccessContext = createContext<StudyAccessGrant>();

type MiddlewareArgs = { request: Request; params: { studyId?: string }; context: Readonly<RouterContextProvider> };

/** The parent route's middleware: 404 unless the caller's access to the study is one of `allowed`. */
export function studyAccessMiddleware(allowed: StudyAccess[]) {
  return async ({ request, params, context }: MiddlewareArgs) => {
    context.set(studyAccessContext, await requireStudyAccess(request, params.studyId, allowed));
  };
}

/**
 * What the parent found, narrowed to the roles this child serves (404
 * otherwise). Analysts of a lab that declined or was withdrawn get 404 too,
 * except on the pages that show them that notice (`endedEnrollment`).
 */
export function requireStudy(
  context: Readonly<RouterContextProvider>,
  allowed: StudyAccess[],
  { endedEnrollment = false }: { endedEnrollment?: boolean } = {},
): StudyAccessGrant {
  const grant = context.get(studyAccessContext);
  if (!allowed.includes(grant.access)) notFound();
  if (grant.access === "analyst" && !endedEnrollment && enrollmentEnded(grant.enrollment)) notFound();
  return grant;
}
