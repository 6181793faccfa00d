/**
 * One plain sentence per audit event, built from the stored event alone, for
 * the study's audit trail: "L03 received the shipment, condition good,
 * 2026-09-04", field changes as "slump 180 → 175 mm".
 */
import { formatDate } from "~/lib/format";
import { FRESH_FIELDS } from "~/lib/results/fresh";

export interface StoredAuditEvent {
  action: string;
  before: unknown;
  after: unknown;
  reason: string | null;
  /** The name of whoever did it, when known. */
  actorName: string | null;
  /** The blind code of the lab the event concerns, when it concerns one. */
  labCode: string | null;
}

type Fields = Record<string, unknown>;

const asFields = (value: unknown): Fields => (value && typeof value === "object" && !Array.isArray(value) ? (value as Fields) : {});
const asList = (value: unknown): Fields[] => (Array.isArray(value) ? value.map(asFields) : []);

/** Trims a float's noise: 175 stays 175, 0.1 + 0.2 reads 0.3. */
function showNumber(value: unknown): string {
  if (value === null || value === undefined || value === "") return "—";
  if (typeof value === "number") return String(Number(value.toPrecision(12)));
  return String(value);
}

const FRESH_BY_COLUMN: Record<string, { label: string; unit: string }> = Object.fromEntries(
  Object.values(FRESH_FIELDS).map((f) => [f.column, { label: f.label.toLowerCase(), unit: f.unit }]),
);

/** "slump 180 → 175 mm" for each fresh property that changed; the batching time as "batched at …". */
function freshChanges(before: Fields, after: Fields): string[] {
  return Object.keys(after)
    .filter((key) => key !== "queryId" && before[key] !== after[key])
    .map((key) => {
      const field = FRESH_BY_COLUMN[key];
      if (key === "batchedAt") return `batching time ${showNumber(before.batchedAt).replace("T", " ")} → ${showNumber(after.batchedAt).replace("T", " ")}`;
      if (!field) return `${key} ${showNumber(before[key])} → ${showNumber(after[key])}`;
      const unit = field.unit === "%" ? " %" : ` ${field.unit}`;
      return `${field.label} ${showNumber(before[key])} → ${showNumber(after[key])}${unit}`;
    });
}

/** "M1 passes r2 3 → 4" for each replicate value written; at most four, then how many in all. */
function resultChanges(before: unknown, after: unknown): string {
  const earlier = asList(before);
  const items = asList(after).map((row, index) => {
    const from = earlier[index]?.value;
    const where = `${row.material} ${row.response} r${row.replicate}`;
    if (row.value === null || row.value === undefined) return `${where} ${showNumber(from)} → cleared`;
    return from === null || from === undefined ? `${where} = ${showNumber(row.value)}` : `${where} ${showNumber(from)} → ${showNumber(row.value)}`;
  });
  const shown = items.slice(0, 4).join("; ");
  return items.length > 4 ? `${shown}; and ${items.length - 4} more` : shown;
}

const plural = (n: number, one: string, many = `${one}s`) => `${n} ${n === 1 ? one : many}`;

/** "the results", "5 results" — counting what the event lists. */
const countOf = (value: unknown, noun: string) => plural(asList(value).length, noun);

const withReason = (sentence: string, reason: string | null) => (reason ? `${sentence}. Reason: ${reason}` : sentence);

/** Readable words for an action nobody wrote a sentence for: "study_updated" → "study updated". */
const actionWords = (action: string) => action.replace(/[._]/g, " ");

type Describe = (event: StoredAuditEvent, who: { lab: string; person: string }) => string;

const SENTENCES: Record<string, Describe> = {
  "results.draft_saved": (e, who) => `${who.lab} saved draft results: ${resultChanges(e.before, e.after)}`,
  "results.imported": (e, who) => withReason(`${who.lab} imported results: ${resultChanges(e.before, e.after)}`, e.reason),
  "results.submitted": (e, who) => {
    const after = asFields(e.after);
    return `${who.lab} submitted the results of ${showNumber(after.material)} (${countOf(after.cells, "cell")})`;
  },
  "result.amended": (e, who) => {
    const before = asFields(e.before);
    const after = asFields(e.after);
    return withReason(`${who.lab} amended ${after.material} ${after.response} r${after.replicate}: ${showNumber(before.value)} → ${showNumber(after.value)}`, e.reason);
  },
  "result.photo_added": (e, who) => {
    const after = asFields(e.after);
    return `${who.lab} added a photo to ${showNumber(after.material)} replicate ${showNumber(after.replicate)}`;
  },
  "batch.fresh_properties_saved": (e, who) => {
    const changes = freshChanges(asFields(e.before), asFields(e.after));
    return `${who.lab} recorded fresh properties${changes.length ? `: ${changes.join(", ")}` : ""}`;
  },
  "batch.fresh_properties_amended": (e, who) => {
    const changes = freshChanges(asFields(e.before), asFields(e.after));
    return withReason(`${who.lab} corrected fresh properties${changes.length ? `: ${changes.join(", ")}` : ""}`, e.reason);
  },
  shipment_created: (_e, who) => `${who.person} prepared a shipment for ${who.lab}`,
  shipment_shipped: (e, who) => {
    const after = asFields(e.after);
    const carrier = after.carrier ? ` by ${after.carrier}` : "";
    return `${who.person} shipped the materials to ${who.lab}${carrier}, ${formatDate(after.shippedOn as string)}`;
  },
  shipment_received: (e, who) => {
    const after = asFields(e.after);
    const notes = after.receiptNotes ? ` (${after.receiptNotes})` : "";
    return `${who.lab} received the shipment, condition ${showNumber(after.condition)}${notes}, ${formatDate(after.receivedOn as string)}`;
  },
  shipment_receipt_corrected: (e, who) => {
    const before = asFields(e.before);
    const after = asFields(e.after);
    const changes = Object.keys(after)
      .filter((k) => before[k] !== after[k])
      .map((k) => `${k === "receivedOn" ? "received on" : k === "receiptNotes" ? "notes" : k} ${showNumber(before[k])} → ${showNumber(after[k])}`);
    return `${who.lab} corrected the receipt${changes.length ? `: ${changes.join(", ")}` : ""}`;
  },
  shipment_lost: (_e, who) => `${who.person} marked the shipment to ${who.lab} lost`,
  lab_invited: (_e, who) => `${who.person} invited a lab`,
  invitation_accepted: (e, who) => `${showNumber(asFields(e.after).labCode ?? who.lab)} accepted the invitation`,
  invitation_declined: (_e, who) => `${who.lab} declined the invitation`,
  lab_withdrawn: (e, who) => withReason(`${who.person} withdrew ${who.lab} from the study`, e.reason),
  "query.raised": (e, who) => {
    const after = asFields(e.after);
    const statistic = after.statistic ? ` (${after.statistic})` : "";
    const asks = after.asksCorrection ? ", asking for a correction" : "";
    return `${who.person} asked ${showNumber(after.lab ?? who.lab)} about ${showNumber(after.material)} ${showNumber(after.response)}${statistic}${asks}`;
  },
  "query.answered": (_e, who) => `${who.lab} answered a query`,
  "query.closed": (_e, who) => `${who.person} closed the query to ${who.lab}`,
  "cell_decision.saved": (e, who) => {
    const before = asFields(e.before);
    const after = asFields(e.after);
    const change = before.decision && before.decision !== after.decision ? ` (was ${before.decision})` : "";
    return withReason(`${who.person} ${after.decision === "excluded" ? "excluded" : "retained"} ${showNumber(after.lab)} ${showNumber(after.material)} ${showNumber(after.response)}${change}`, e.reason);
  },
  study_state_changed: (e, who) => `${who.person} moved the study from ${showNumber(asFields(e.before).state).replace("_", " ")} to ${showNumber(asFields(e.after).state).replace("_", " ")}`,
  missing_results_reminded: (e, who) => {
    const labs = asFields(e.after).labs;
    return `${who.person} reminded ${Array.isArray(labs) ? plural(labs.length, "lab") : "labs"} of missing results`;
  },
};

/**
 * The sentence for one stored event. An action without its own sentence reads
 * "<who> <action in words>", so a new kind of event is never shown raw.
 */
export function describeAuditEvent(event: StoredAuditEvent): string {
  const who = { lab: event.labCode ?? "the lab", person: event.actorName ?? "someone" };
  const describe = SENTENCES[event.action];
  const sentence = describe ? describe(event, who) : withReason(`${who.person}: ${actionWords(event.action)}`, event.reason);
  return sentence.charAt(0).toUpperCase() + sentence.slice(1);
}
