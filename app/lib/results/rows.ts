/**
 * Checks result rows (typed, imported or sent to the API) against a study
 * and the lab's submitted cells. Pure, so the import preview in the browser
 * and the server's import name the same problems for the same rows.
 */
import { testDateProblem } from "~/lib/plausible-dates";
import { unsafeCharacterMessage } from "~/lib/text-hygiene";
import { checkResultValue, checkTestDate, type ResponseRule } from "./values";

/** One result as typed in the form, read from a CSV row or sent to the API. */
export type ResultInputRow = {
  /** Row number to name in problems (CSV: the spreadsheet row; form and API: position from 1). */
  row?: number;
  material: string;
  response: string;
  replicate: number | string;
  value: string | number | null;
  testedOn?: string | null;
  operator?: string | null;
  /** The version of the stored replicate the writer read (0: none stored); given, a save that finds another version is refused as a conflict. */
  readVersion?: number;
};

export type RowField = "material" | "response" | "replicate" | "value" | "tested_on" | "operator";
/** `submitted`: the row targets a submitted cell, which only an amendment may change (a state conflict, not bad input). */
export type RowProblem = { row: number; field: RowField; message: string; submitted?: true };

export type ResolvedRow = {
  row: number;
  materialId: number;
  materialCode: string;
  responseId: number;
  responseKey: string;
  replicate: number;
  value: number | null;
  /** Set when the value is kept but unusual. */
  warning?: string;
  testedOn: string | null;
  operator: string;
  readVersion?: number;
};

export type RowFrame = {
  replicatesPerCell: number;
  materials: { id: number; code: string }[];
  responses: (ResponseRule & { id: number; key: string })[];
  /** `materialId:responseId` of the lab's submitted cells. */
  submittedCells: Set<string>;
  /** When the lab received the materials; no test is dated before it. */
  receivedOn?: string | null;
  /** The study's last day for results (YYYY-MM-DD): no test date after it. */
  studyEnd?: string | null;
};

export const cellKey = (materialId: number, responseId: number) => `${materialId}:${responseId}`;

/** Text of the input quoted back in a message, cut short so a huge cell does not make a huge message. */
export function shorten(text: string, max = 40) {
  return text.length > max ? `${text.slice(0, max)}…` : text;
}

// A replicate typed in a file is plain digits: "0x2", "1e0" or "+1" are not replicate numbers.
const REPLICATE_DIGITS = /^\d{1,6}$/;
// A spreadsheet runs a cell that starts with one of these as a formula (OWASP "CSV injection").
const FORMULA_START = /^[=+\-@]/;

/** Each row resolved to the study's ids, or named with its problem; a row with a problem is not resolved. */
export function resolveResultRows(frame: RowFrame, rows: ResultInputRow[], { valueRequired }: { valueRequired: boolean }) {
  const problems: RowProblem[] = [];
  const resolved: ResolvedRow[] = [];
  const seen = new Map<string, number>();
  const materialCodes = frame.materials.map((m) => m.code).join(", ");
  const responseKeys = frame.responses.map((r) => r.key).join(", ");
  rows.forEach((input, index) => {
    const row = input.row ?? index + 1;
    const problem = (field: RowField, message: string, extra: { submitted?: true } = {}) => problems.push({ row, field, message, ...extra });
    const materialCode = String(input.material ?? "").trim();
    const responseKey = String(input.response ?? "").trim();
    const material = frame.materials.find((m) => m.code.toLowerCase() === materialCode.toLowerCase());
    const response = frame.responses.find((r) => r.key.toLowerCase() === responseKey.toLowerCase());
    if (!material) return problem("material", `The study has no material “${shorten(materialCode)}” (it has ${materialCodes}).`);
    if (!response) return problem("response", `The study has no response “${shorten(responseKey)}” (it has ${responseKeys}).`);
    const replicateText = String(input.replicate).trim();
    const replicate = typeof input.replicate === "number" || REPLICATE_DIGITS.test(replicateText) ? Number(replicateText) : Number.NaN;
    if (!Number.isInteger(replicate) || replicate < 1 || replicate > frame.replicatesPerCell) {
      return problem("replicate", `Replicate must be a whole number from 1 to ${frame.replicatesPerCell}.`);
    }
    const where = `${material.code} · ${response.key} · replicate ${replicate}`;
    const earlier = seen.get(`${material.id}:${response.id}:${replicate}`);
    if (earlier !== undefined) return problem("replicate", `${where} is already given in row ${earlier}.`);
    seen.set(`${material.id}:${response.id}:${replicate}`, row);
    if (frame.submittedCells.has(cellKey(material.id, response.id))) {
      return problem("value", `${where} is already submitted; change it with an amendment (with a reason) on the result entry page.`, { submitted: true });
    }
    const check = checkResultValue(response, input.value);
    if (check.status === "refused") return problem("value", check.message);
    if (check.status === "empty" && valueRequired) return problem("value", "The value is empty.");
    const date = checkTestDate(input.testedOn, new Date(), { studyEnd: frame.studyEnd });
    if (!date.ok) return problem("tested_on", date.message);
    const beforeReceipt = date.value && testDateProblem(date.value, { receivedOn: frame.receivedOn ?? null });
    if (beforeReceipt) return problem("tested_on", beforeReceipt);
    const operator = String(input.operator ?? "").trim();
    if (operator.length > 120) return problem("operator", "Keep the operator's name to 120 characters or fewer.");
    const unsafe = unsafeCharacterMessage(operator);
    if (unsafe) return problem("operator", unsafe);
    if (FORMULA_START.test(operator)) return problem("operator", "An operator's name cannot start with =, +, - or @ (a spreadsheet would run it as a formula).");
    resolved.push({
      row,
      materialId: material.id,
      materialCode: material.code,
      responseId: response.id,
      responseKey: response.key,
      replicate,
      value: check.status === "ok" ? check.value : null,
      ...(check.status === "ok" && check.warning ? { warning: check.warning } : {}),
      testedOn: date.value,
      operator,
      ...(input.readVersion !== undefined ? { readVersion: input.readVersion } : {}),
    });
  });
  return { problems, resolved };
}
