/**
 * In which study states each write through a page or the API succeeds
 * (the product's write rules, ~/lib/write-rules, and its lifecycle). Every
 * other state refuses it with a message and changes nothing. No write of a
 * published or cancelled study succeeds.
 */
import type { StudyState } from "~/db/values";

export const WRITES = [
  "setup: study details",
  "setup: replicates per cell",
  "setup: significance level",
  "setup: add a response",
  "setup: fresh-property targets",
  "setup: add a material",
  "setup: replace the protocol",
  "setup: add a co-coordinator",
  "setup: add a reviewer",
  "setup: remove a reviewer",
  "setup: cancel the study",
  "labs: invite a lab",
  "labs: invite a lab from outside the directory",
  "labs: withdraw a lab",
  "shipments: create",
  "shipments: mark shipped",
  "shipments: mark lost",
  "lab: confirm receipt",
  "lab: save draft results",
  "lab: submit a material",
  "lab: amend a submitted result",
  "lab: amend fresh properties",
  "lab: import CSV",
  "api: write results",
  "lab: answer a query",
  "analysis: raise a query",
  "analysis: decide on a cell",
  "queries: close a query",
  "statement: edit the text",
  "statement: send to the committee",
  "statement: answer an objection",
  "statement: publish",
  "review: vote",
  "review: comment",
  "review: reply to an answer",
  "review: rule on an objection",
] as const;

export type Write = (typeof WRITES)[number];

const BEFORE_REVIEW: StudyState[] = ["draft", "recruiting", "testing", "checking"];

export const ALLOWED_IN: Record<Write, StudyState[]> = {
  "setup: study details": BEFORE_REVIEW,
  "setup: replicates per cell": ["draft", "recruiting"],
  "setup: significance level": BEFORE_REVIEW,
  "setup: add a response": ["draft", "recruiting"],
  "setup: fresh-property targets": ["draft", "recruiting"],
  "setup: add a material": ["draft", "recruiting"],
  "setup: replace the protocol": ["draft", "recruiting"],
  "setup: add a co-coordinator": [...BEFORE_REVIEW, "in_review"],
  "setup: add a reviewer": BEFORE_REVIEW,
  "setup: remove a reviewer": BEFORE_REVIEW,
  "setup: cancel the study": [...BEFORE_REVIEW, "in_review"],
  "labs: invite a lab": ["recruiting"],
  "labs: invite a lab from outside the directory": ["recruiting"],
  "labs: withdraw a lab": ["recruiting", "testing", "checking"],
  "shipments: create": ["recruiting", "testing"],
  "shipments: mark shipped": ["recruiting", "testing"],
  "shipments: mark lost": ["recruiting", "testing"],
  "lab: confirm receipt": ["recruiting", "testing"],
  "lab: save draft results": ["testing"],
  "lab: submit a material": ["testing"],
  // After testing, only through the open correction query on that cell (the fixture has one).
  "lab: amend a submitted result": ["testing", "checking"],
  "lab: amend fresh properties": ["testing", "checking"],
  "lab: import CSV": ["testing"],
  "api: write results": ["testing"],
  "lab: answer a query": ["testing", "checking"],
  "analysis: raise a query": ["testing", "checking"],
  "analysis: decide on a cell": ["checking"],
  "queries: close a query": ["testing", "checking"],
  "statement: edit the text": ["checking"],
  "statement: send to the committee": ["checking"],
  "statement: answer an objection": ["in_review"],
  "statement: publish": ["in_review"],
  "review: vote": ["in_review"],
  "review: comment": ["in_review"],
  "review: reply to an answer": ["in_review"],
  "review: rule on an objection": ["in_review"],
};

/**
 * Writes of proficiency rounds and ruggedness studies (their own pages; the
 * shared setup, labs and results pages follow the table above). Rounds have
 * no committee review; a ruggedness study runs from draft to testing.
 */
export const KIND_WRITES = [
  "round: choose the assigned value and σ_pt",
  "round: enter homogeneity and stability results",
  "round: lab enters its uncertainty",
  "round: publish",
  "ruggedness: lay out factors and design",
  "ruggedness: enter results",
] as const;

export type KindWrite = (typeof KIND_WRITES)[number];

export const KIND_ALLOWED_IN: Record<KindWrite, StudyState[]> = {
  "round: choose the assigned value and σ_pt": BEFORE_REVIEW,
  "round: enter homogeneity and stability results": BEFORE_REVIEW,
  "round: lab enters its uncertainty": ["testing"],
  "round: publish": ["checking"],
  "ruggedness: lay out factors and design": ["draft"],
  "ruggedness: enter results": ["draft", "testing"],
};
