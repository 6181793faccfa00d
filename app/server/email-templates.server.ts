/**
 * The product's messages, each built with composeEmail so every transport
 * sends exactly the same text. Callers pass absolute links (appUrl).
 */
import type { Role } from "~/db/values";
import { formatQuantity } from "~/lib/packing-list";
import { composeEmail } from "~/server/email.server";

type StudyRef = { code: string; title: string };

/** What a lab is asked to do, for the invitation: materials × replicates of each response. */
export type InvitationWorkload = { materials: number; replicates: number; responses: string[] };

export type InvitationDates = { enrollmentDeadline: string | null; shipDate: string | null; resultsDue: string | null };

function plural(n: number, one: string, many: string) {
  return `${n} ${n === 1 ? one : many}`;
}

/** "Materials ship on …; results are due on …", from whichever dates the study has. */
function invitationDatesText(d: InvitationDates) {
  const parts = [
    d.enrollmentDeadline && `answer by ${d.enrollmentDeadline}`,
    d.shipDate && `materials ship on ${d.shipDate}`,
    d.resultsDue && `results are due on ${d.resultsDue}`,
  ].filter(Boolean);
  return parts.length ? `Dates: ${parts.join("; ")}.` : "The coordinator will tell you the testing dates.";
}

function workloadText(w: InvitationWorkload) {
  const records = w.responses.length ? `; each test records ${w.responses.join(" and ")}` : "";
  if (w.materials === 0) return `Workload: ${plural(w.replicates, "replicate", "replicates")} of each material${records}. The coordinator is still choosing the materials.`;
  return `Workload: ${plural(w.materials, "material", "materials")} × ${plural(w.replicates, "replicate", "replicates")} = ${plural(w.materials * w.replicates, "test", "tests")}${records}.`;
}

export function invitationEmail(p: {
  to: string;
  contactName: string;
  labName: string;
  study: StudyRef & InvitationDates;
  workload: InvitationWorkload;
  coordinator: { name: string; email: string };
  url: string;
  expiresOn: string;
}) {
  return composeEmail({
    to: p.to,
    subject: `Invitation to interlaboratory study ${p.study.code}`,
    greeting: `Dear ${p.contactName || "lab contact"},`,
    paragraphs: [
      `${p.labName} is invited to take part in ${p.study.code}, "${p.study.title}".`,
      invitationDatesText(p.study),
      workloadText(p.workload),
      `Coordinator: ${p.coordinator.name}, ${p.coordinator.email}. Write to them with any question about the study.`,
      "Open the link to accept or decline. If you have no Ringbatch account yet, you set your password there.",
      `The link works once and expires on ${p.expiresOn}. Do not forward it: whoever opens it acts for your lab.`,
    ],
    action: { label: "Answer the invitation", url: p.url },
  });
}

export function shipmentNoticeEmail(p: {
  to: string;
  labName: string;
  study: StudyRef;
  items: { description: string; quantity: number; unit: string; lot: string; containerCount: number }[];
  note: string;
  carrier: string;
  trackingNumber: string;
  shippedOn: string;
  url: string;
}) {
  return composeEmail({
    to: p.to,
    subject: `${p.study.code}: materials shipped to ${p.labName}`,
    greeting: `Dear ${p.labName} team,`,
    paragraphs: [
      `The materials for ${p.study.code} left on ${p.shippedOn}${p.carrier ? ` with ${p.carrier}` : ""}${p.trackingNumber ? `, tracking number ${p.trackingNumber}` : ""}.`,
      p.items.length
        ? `Contents: ${p.items.map((item) => `${item.description}, ${formatQuantity(item.quantity, item.unit)}${item.lot ? `, lot ${item.lot}` : ""}, ${item.containerCount} ${item.containerCount === 1 ? "container" : "containers"}`).join("; ")}.`
        : "Contents: as listed on the packing list in the box.",
      ...(p.note ? [`Note: ${p.note}`] : []),
      "When they arrive, confirm receipt and their condition. Bags of cement and aggregate are heavy: lift with help.",
    ],
    action: { label: "Confirm receipt", url: p.url },
  });
}

export function missingResultsReminderEmail(p: { to: string; labName: string; study: StudyRef; missing: string[]; resultsDue: string | null; url: string }) {
  return composeEmail({
    to: p.to,
    subject: `${p.study.code}: results still missing`,
    greeting: `Dear ${p.labName} team,`,
    paragraphs: [
      `Results for ${p.study.code} are not yet submitted for: ${p.missing.join(", ")}.`,
      p.resultsDue ? `Results are due on ${p.resultsDue}.` : "Please submit them as soon as you can.",
    ],
    action: { label: "Open your study tasks", url: p.url },
  });
}

export function queryRaisedEmail(p: { to: string; labName: string; study: StudyRef; materialCode: string; responseName: string; question: string; url: string }) {
  return composeEmail({
    to: p.to,
    subject: `${p.study.code}: a question about your results for ${p.materialCode}`,
    greeting: `Dear ${p.labName} team,`,
    paragraphs: [
      `The coordinator has a question about your ${p.responseName} results for material ${p.materialCode}:`,
      p.question,
      "Nothing is excluded before you have had the chance to answer.",
    ],
    action: { label: "Answer the question", url: p.url },
  });
}

export function reviewRequestedEmail(p: { to: string; reviewerName: string; study: StudyRef; statementVersion: number; url: string }) {
  return composeEmail({
    to: p.to,
    subject: `${p.study.code}: precision statement version ${p.statementVersion} for review`,
    greeting: `Dear ${p.reviewerName},`,
    paragraphs: [
      `The draft precision statement of ${p.study.code}, "${p.study.title}", is ready for your review.`,
      "You see the blinded data, the consistency plots and the draft text; comment and vote approve, object (with your reason) or abstain.",
    ],
    action: { label: "Review the statement", url: p.url },
  });
}

export function colleagueWelcomeEmail(p: { to: string; name: string; labName: string; addedBy: string; url: string; expiresOn: string }) {
  return composeEmail({
    to: p.to,
    subject: `Your Ringbatch account for ${p.labName}`,
    greeting: `Dear ${p.name},`,
    paragraphs: [
      `${p.addedBy} added you as an analyst of ${p.labName} in Ringbatch, where your lab records its results for interlaboratory studies.`,
      "Open the link to set your password. You will see your own lab's studies only.",
      `The link works once and expires on ${p.expiresOn}.`,
    ],
    action: { label: "Set your password", url: p.url },
  });
}

const ROLE_WORDS: Record<Role, string> = { admin: "an administrator", coordinator: "a study coordinator", analyst: "a lab analyst", reviewer: "a committee reviewer" };

export function accountWelcomeEmail(p: { to: string; name: string; roles: readonly Role[]; addedBy: string; url: string; expiresOn: string }) {
  const roles = p.roles.map((r) => ROLE_WORDS[r]);
  return composeEmail({
    to: p.to,
    subject: "Your Ringbatch account",
    greeting: `Dear ${p.name},`,
    paragraphs: [
      `${p.addedBy} made you a Ringbatch account as ${roles.join(" and ")}.`,
      "Open the link to set your password; you then sign in with this e-mail address and that password.",
      `The link works once and expires on ${p.expiresOn}.`,
    ],
    action: { label: "Set your password", url: p.url },
  });
}

export function passwordResetEmail(p: { to: string; name: string; url: string; expiresAt: string }) {
  return composeEmail({
    to: p.to,
    subject: "Set a new Ringbatch password",
    greeting: `Dear ${p.name},`,
    paragraphs: [
      "Someone (we hope you) asked to set a new password for your Ringbatch account.",
      `The link works once, for 30 minutes (until ${p.expiresAt}). Setting a new password signs you out everywhere else.`,
      "If you did not ask, ignore this message: your password stays as it is.",
    ],
    action: { label: "Set a new password", url: p.url },
  });
}

const turnOff = (url: string) => `You can turn these notices off on your account page: ${url}`;

export function shipmentProblemEmail(p: { to: string; name: string; study: StudyRef; lab: string; lost: boolean; notes: string; url: string }) {
  return composeEmail({
    to: p.to,
    subject: `${p.study.code}: shipment to ${p.lab} ${p.lost ? "lost" : "arrived damaged"}`,
    greeting: `Hello ${p.name},`,
    paragraphs: [
      p.lost ? `The shipment of ${p.study.code} to ${p.lab} is marked lost in transit.` : `${p.lab} reports that the shipment of ${p.study.code} arrived damaged.`,
      ...(p.notes ? [`The lab's notes: ${p.notes}`] : []),
      "Decide whether to send a replacement: the shipments page offers the lab a new packing list once its shipment is marked lost.",
    ],
    action: { label: "Open the shipments", url: p.url },
  });
}

export function enrollmentAnswerEmail(p: { to: string; name: string; study: StudyRef; labName: string; accepted: boolean; url: string; preferencesUrl: string }) {
  return composeEmail({
    to: p.to,
    subject: `${p.study.code}: ${p.labName} ${p.accepted ? "accepted" : "declined"} the invitation`,
    greeting: `Hello ${p.name},`,
    paragraphs: [
      `${p.labName} ${p.accepted ? "accepted" : "declined"} the invitation to ${p.study.code}, "${p.study.title}".`,
      ...(p.accepted ? ["Its shipment can be prepared on the shipments page."] : []),
      turnOff(p.preferencesUrl),
    ],
    action: { label: "Open the labs of the study", url: p.url },
  });
}

export function resultsDueEmail(p: { to: string; name: string; labName: string; study: StudyRef; missing: string[]; resultsDue: string; overdue: boolean; url: string; preferencesUrl: string }) {
  return composeEmail({
    to: p.to,
    subject: `${p.study.code}: results ${p.overdue ? "overdue since" : "due on"} ${p.resultsDue}`,
    greeting: `Hello ${p.name},`,
    paragraphs: [
      p.overdue
        ? `Results of ${p.labName} for ${p.study.code} were due on ${p.resultsDue} and are not yet submitted for: ${p.missing.join(", ")}.`
        : `Results of ${p.labName} for ${p.study.code} are due on ${p.resultsDue}; still to submit: ${p.missing.join(", ")}.`,
      p.overdue ? "Submit them as soon as you can, or write to the coordinator if something holds your lab up." : "Submitted results can still be amended while the study is testing.",
      turnOff(p.preferencesUrl),
    ],
    action: { label: "Open your study tasks", url: p.url },
  });
}
