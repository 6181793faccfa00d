/**
 * Which study states allow which analysis and review writes. Each function
 * returns the message to show when the write is refused, or null when allowed.
 */
import type { StudyState } from "~/db/schema";

const READ_ONLY = "This study is published; it is read-only.";

function refuseUnless(state: StudyState, allowed: StudyState[], otherwise: string) {
  if (state === "published") return READ_ONLY;
  if (state === "cancelled") return "This study was cancelled; nothing more can be changed.";
  return allowed.includes(state) ? null : otherwise;
}

/** Cell decisions and statement drafting happen while the data are being checked. */
export const decisionRefusal = (state: StudyState) =>
  refuseUnless(state, ["checking"], "Cell decisions can be made only while the study is checking data.");

/** Queries can start as soon as results come in, and stay answerable until the review starts. */
export const queryRefusal = (state: StudyState) =>
  refuseUnless(state, ["testing", "checking"], "Queries can be raised or closed only while the study is testing or checking data.");

export const draftingRefusal = (state: StudyState) =>
  refuseUnless(state, ["checking"], "A statement can be frozen or edited only while the study is checking data.");

/** Votes, comments, answers to objections and publication belong to the committee round. */
export const reviewRefusal = (state: StudyState) =>
  refuseUnless(state, ["in_review"], "The committee review is not open for this study.");
