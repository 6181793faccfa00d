/**
 * A round's parent route checks access once, like a study's
 * (study-context.server), and 404s for any study that is not a proficiency
 * round, so round pages never open a precision study.
 */
import { createContext, type RouterContextProvider } from "react-router";
import { notFound, requireStudyAccess, type StudyAccess } from "~/server/guards.server";

export type RoundAccessGrant = Awaited<ReturnType<typeof requireStudyAccess>>;

const roundAccessContext = createContext<RoundAccessGrant>();

type MiddlewareArgs = { request: Request; params: { roundId?: string }; context: Readonly<RouterContextProvider> };

export function roundAccessMiddleware(allowed: StudyAccess[]) {
  return async ({ request, params, context }: MiddlewareArgs) => {
    const grant = await requireStudyAccess(request, params.roundId, allowed);
    if (grant.study.kind !== "proficiency") notFound();
    context.set(roundAccessContext, grant);
  };
}

export function requireRound(context: Readonly<RouterContextProvider>, allowed: StudyAccess[]): RoundAccessGrant {
  const grant = context.get(roundAccessContext);
  if (!allowed.includes(grant.access)) notFound();
  return grant;
}
