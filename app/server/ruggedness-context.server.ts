/**
 * A ruggedness study's pages sit under `/ruggedness/:ruggednessStudyId`; the
 * parent checks access once, as a precision study's parent does, and each
 * page takes the study from the context, 404 unless it is a ruggedness study.
 */
import type { RouterContextProvider } from "react-router";
import { notFound, type StudyAccess } from "~/server/guards.server";
import { requireStudy, studyAccessMiddleware } from "~/server/study-context.server";

type MiddlewareArgs = { request: Request; params: { ruggednessStudyId?: string }; context: Readonly<RouterContextProvider> };

export function ruggednessAccessMiddleware(allowed: StudyAccess[]) {
  const check = studyAccessMiddleware(allowed);
  return ({ request, params, context }: MiddlewareArgs) => check({ request, params: { studyId: params.ruggednessStudyId }, context });
}

export function requireRuggednessStudy(context: Readonly<RouterContextProvider>, allowed: StudyAccess[]) {
  const grant = requireStudy(context, allowed);
  if (grant.study.kind !== "ruggedness") notFound();
  return grant;
}
