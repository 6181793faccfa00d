/**
 * What is waiting for a lab in one study, in the order the work is done:
 * accept the invitation, confirm receipt, batch, enter results, submit,
 * answer queries. Built from plain facts so the lab home and its tests share
 * one rule.
 */
import type { ENROLLMENT_STATES, SHIPMENT_STATUSES, StudyState } from "~/db/values";

type EnrollmentState = (typeof ENROLLMENT_STATES)[number];
type ShipmentStatus = (typeof SHIPMENT_STATUSES)[number];

export interface LabStudyFacts {
  studyId: number;
  studyState: StudyState;
  enrollmentState: EnrollmentState;
  enrollmentDeadline: string | null;
  resultsDue: string | null;
  replicatesPerCell: number;
  responseCount: number;
  /** The e-mail the pending invitation went to and when its link stops working. */
  invitation: { email: string; expiresOn: string } | null;
  shipment: { status: ShipmentStatus; shippedOn: string | null } | null;
  materials: {
    id: number;
    code: string;
    batchRecorded: boolean;
    /** Replicate values stored, drafts included. */
    valuesEntered: number;
    cellsSubmitted: number;
  }[];
  openQueries: number;
}

export type TodoKind = "accept" | "receipt" | "batch" | "enter" | "submit" | "query";

export interface TodoItem {
  kind: TodoKind;
  title: string;
  detail: string;
  due: string | null;
  links: { to: string; label: string }[];
}

const plural = (n: number, one: string, many = `${one}s`) => `${n} ${n === 1 ? one : many}`;

/** Everything waiting for the lab in this study; empty when nothing is. */
export function labTodoItems(facts: LabStudyFacts): TodoItem[] {
  const base = `/lab/studies/${facts.studyId}`;
  const items: TodoItem[] = [];
  if (facts.enrollmentState === "declined" || facts.enrollmentState === "withdrawn") return items;
  if (facts.enrollmentState === "invited") {
    if (facts.studyState === "recruiting" || facts.studyState === "testing") {
      items.push({
        kind: "accept",
        title: "Accept the invitation",
        detail: facts.invitation
          ? `Answer here, or with the link in the invitation sent to ${facts.invitation.email}; either works until ${facts.invitation.expiresOn}.`
          : "Ask the coordinator for a new invitation link.",
        due: facts.enrollmentDeadline,
        links: [{ to: base, label: "About the study" }],
      });
    }
    return items;
  }

  if (facts.shipment?.status === "shipped") {
    items.push({
      kind: "receipt",
      title: "Confirm receipt of the materials",
      detail: facts.shipment.shippedOn ? `Shipped ${facts.shipment.shippedOn}; record the date and condition on arrival.` : "Record the date and condition on arrival.",
      due: null,
      links: [{ to: `${base}/receipt`, label: "Confirm receipt" }],
    });
  }

  if (facts.studyState === "testing") {
    const perMaterial = facts.responseCount * facts.replicatesPerCell;
    const unbatched = facts.materials.filter((m) => !m.batchRecorded && m.cellsSubmitted < facts.responseCount);
    if (unbatched.length > 0) {
      items.push({
        kind: "batch",
        title: `Batch ${plural(unbatched.length, "material")}`,
        detail: `${plural(facts.materials.length - unbatched.length, "batch", "batches")} of ${facts.materials.length} recorded.`,
        due: facts.resultsDue,
        links: unbatched.map((m) => ({ to: `${base}/batch/${m.id}`, label: `Batch sheet ${m.code}` })),
      });
    }
    const incomplete = facts.materials.filter((m) => m.valuesEntered < perMaterial && m.cellsSubmitted < facts.responseCount);
    if (incomplete.length > 0) {
      const entered = facts.materials.reduce((sum, m) => sum + Math.min(m.valuesEntered, perMaterial), 0);
      items.push({
        kind: "enter",
        title: `Enter results for ${plural(incomplete.length, "material")}`,
        detail: `${entered} of ${facts.materials.length * perMaterial} values entered, drafts included.`,
        due: facts.resultsDue,
        links: incomplete.map((m) => ({ to: `${base}/results/${m.id}`, label: `Results of ${m.code} (${m.valuesEntered} of ${perMaterial})` })),
      });
    }
    const ready = facts.materials.filter((m) => m.valuesEntered >= perMaterial && m.cellsSubmitted < facts.responseCount);
    if (ready.length > 0) {
      items.push({
        kind: "submit",
        title: `Submit ${plural(ready.length, "material")}`,
        detail: `Every value is entered; the ${plural(ready.length * facts.responseCount, "draft cell")} reach the coordinator once submitted.`,
        due: facts.resultsDue,
        links: ready.map((m) => ({ to: `${base}/results/${m.id}`, label: `Submit ${m.code}` })),
      });
    }
  }

  if (facts.openQueries > 0) {
    items.push({
      kind: "query",
      title: `Answer ${plural(facts.openQueries, "query", "queries")}`,
      detail: "The coordinator asks about your lab's data.",
      due: null,
      links: [{ to: "/lab/queries", label: "Answer them on the queries page" }],
    });
  }
  return items;
}
