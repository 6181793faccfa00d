/** A ruggedness study's pages: the study from the parent's middleware, 404 unless it is a ruggedness study. */
import type { RouterContextProvider } from "react-router";
import type { StudyAccess } from "~/server/guards.server";
import { notFound } from "~/server/guards.server";
import { requireStudy } from "~/server/study-context.server";

export function requireRuggednessStudy(context: Readonly<RouterContextProvider>, allowed: StudyAccess[]) {
  const grant = requireStudy(context, allowed);
  if (grant.study.kind !== "ruggedness") notFound();
  return grant;
}
