import type { StudyState } from "~/db/schema";

/** How each study state reads on the pages. */
export const STATE_LABEL: Record<StudyState, string> = {
  draft: "Draft",
  recruiting: "Recruiting labs",
  testing: "Testing",
  checking: "Checking data",
  in_review: "In committee review",
  published: "Published",
  cancelled: "Cancelled",
};
