import Papa from "papaparse";
import type { ExcludedCell } from "~/lib/precision";

export const DECISION_COLUMNS = ["lab", "material", "response", "decision", "reason"] as const;

export type CellDecisionRow = ExcludedCell & { decision: "retained" | "excluded" };

/** The cell decisions as CSV (header row, RFC 4180 quoting), one row per decided cell. */
export function decisionsCsv(rows: readonly CellDecisionRow[]): string {
  return `${Papa.unparse({ fields: [...DECISION_COLUMNS], data: rows.map((r) => DECISION_COLUMNS.map((c) => r[c])) }, { newline: "\n" })}\n`;
}

export interface ParsedDecisions {
  /** the cells to leave out of the analysis (decision "excluded") */
  excludedCells: ExcludedCell[];
  /** problems of the file, each naming its row (header = row 1) */
  problems: string[];
}

/**
 * Reads a decisions CSV (columns lab, material, response, decision, reason):
 * the excluded cells the precision engine takes. Retained cells need no action
 * and are only checked. Every excluded cell needs its reason.
 */
export function parseDecisionsCsv(text: string): ParsedDecisions {
  const parsed = Papa.parse<Record<string, string>>(text.replace(/^\uFEFF/, ""), { header: true, skipEmptyLines: "greedy", transformHeader: (h) => h.trim().toLowerCase() });
  const problems: string[] = [];
  const missing = DECISION_COLUMNS.filter((c) => !parsed.meta.fields?.includes(c));
  if (missing.length > 0) return { excludedCells: [], problems: [`the header has no ${missing.map((c) => `"${c}"`).join(", ")} column (needed: ${DECISION_COLUMNS.join(", ")})`] };
  const excludedCells: ExcludedCell[] = [];
  parsed.data.forEach((record, i) => {
    const row = i + 2;
    const [lab, material, response, decision, reason] = DECISION_COLUMNS.map((c) => (record[c] ?? "").trim());
    if (!lab || !material || !response) return problems.push(`row ${row}: lab, material and response are all needed`);
    if (decision !== "excluded" && decision !== "retained") return problems.push(`row ${row}: decision must be "excluded" or "retained", got "${decision}"`);
    if (!reason) return problems.push(`row ${row}: every decision needs its reason`);
    if (decision === "excluded") excludedCells.push({ lab: lab!, material: material!, response: response!, reason: reason! });
  });
  return { excludedCells, problems };
}
