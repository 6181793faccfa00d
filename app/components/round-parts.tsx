/** Pieces the round pages and the lab's letter share. */
import type { FormReply } from "~/components/forms";
import { Badge } from "~/components/ui";
import type { ScoreVerdict } from "~/db/values";
import { formatFigure } from "~/lib/review/format";

export const VERDICT_VIEW: Record<ScoreVerdict, { label: string; tone: "leaf" | "ochre" | "signal" }> = {
  satisfactory: { label: "Satisfactory", tone: "leaf" },
  questionable: { label: "Questionable (warning signal)", tone: "ochre" },
  unsatisfactory: { label: "Unsatisfactory (action signal)", tone: "signal" },
};

export function VerdictBadge({ verdict }: { verdict: ScoreVerdict }) {
  const view = VERDICT_VIEW[verdict];
  return <Badge tone={view.tone}>{view.label}</Badge>;
}

/** A score to two decimals with its sign, as scores are usually read. */
export function formatScore(score: number | null | undefined) {
  if (score === null || score === undefined) return "—";
  return `${score > 0 ? "+" : ""}${formatFigure(score, 2)}`;
}

/** The reply of the action only when it belongs to this material × response's form. */
export function replyFor(reply: unknown, materialId: number, responseId: number): FormReply {
  const initial = (reply as FormReply)?.result?.initialValue as Record<string, unknown> | undefined;
  return initial?.materialId === String(materialId) && initial?.responseId === String(responseId) ? (reply as FormReply) : undefined;
}

/** The hidden fields of a form about one material × response of the round: the action's intent and the cell's ids. */
export function groupFields(intent: string, { material, response }: { material: { id: number }; response: { id: number } }) {
  return { intent, materialId: material.id, responseId: response.id };
}
