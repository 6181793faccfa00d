/**
 * Generated malformed inputs for the lab's CSV import and the results API.
 * Every case is a valid file or body (of a generated shape: columns in any
 * order, optional columns or not, quoting, line endings, BOM) with one to
 * three defects applied; each defect says which words the refusal must use.
 * The valid bases alone are imported by the suite as a control, so a refusal
 * is always the defect's doing.
 */
import { MAX_BODY_BYTES } from "~/server/api.server";
import { IMPORT_MAX_BYTES } from "~/lib/results/import-file";
import type { Random } from "./support";

export type Frame = { materials: string[]; responses: string[]; replicates: number };
export type Sender = "fresh" | "submitted";

type Encoding = "utf-8" | "latin1" | "utf-16le" | "utf-16be" | "utf-16le-no-bom";

/** A CSV file before it becomes bytes. `header: null` leaves the header row out. */
type Sheet = {
  header: string[] | null;
  rows: string[][];
  delimiter: string;
  eol: "\n" | "\r\n";
  trailingEol: boolean;
  quoteAll: boolean;
  bom: boolean;
  encoding: Encoding;
  sender: Sender;
};

export type GeneratedCase = { name: string; sender: Sender; bytes: Uint8Array; expect: RegExp[] };

type Defect<Model> = {
  name: string;
  expect: RegExp;
  model?: (model: Model, r: Random, frame: Frame) => void;
  text?: (text: string, r: Random, model: Model) => string;
  bytes?: (bytes: Uint8Array, r: Random) => Uint8Array;
  /** Makes the input big: at most one such defect per case, so sizes do not multiply. */
  bulky?: true;
  /** Drawn a quarter as often as the others (slow to run). */
  rare?: true;
  /** Makes the input larger than the route accepts. */
  oversize?: true;
};

const OPERATORS = ["Ines Paravel", "Bo Lindqvar", "Lindqvar, Bo", "Tomasz Orlen-Haake", "Zoë Brandt", "K. O'Malley-Ruiz"];
// Each has one accented letter between plain ones, so its Latin-1 bytes are never valid UTF-8.
const ACCENTED_OPERATORS = ["Jürgen Maas", "Zoë Brandt", "Søren Vik", "José Arana", "Renée Caldor"];
const pad = (n: number) => String(n).padStart(2, "0");
const testDate = (r: Random) => `2026-${pad(r.int(9, 11))}-${pad(r.int(1, 28))}`;
const huge = (r: Random, unit: string, max = 600_000) => unit.repeat(r.int(20_000, max));

const REQUIRED = ["material", "response", "replicate", "value"];
const OPTIONAL = ["tested_on", "operator"];

/** Every material × response × replicate of the study, some of them, shuffled. */
function someCells(r: Random, frame: Frame) {
  const all = frame.materials.flatMap((material) => frame.responses.flatMap((response) => Array.from({ length: frame.replicates }, (_, i) => ({ material, response, replicate: i + 1 }))));
  return r.shuffle(all).slice(0, r.int(1, all.length));
}

function baseSheet(r: Random, frame: Frame): Sheet {
  const columns = r.shuffle([...REQUIRED, ...OPTIONAL.filter(() => r.chance(0.6))]);
  const operator = r.pick(OPERATORS);
  const date = testDate(r);
  const rows = someCells(r, frame).map((cell) =>
    columns.map((column) => {
      if (column === "material") return r.chance(0.1) ? ` ${cell.material.toLowerCase()} ` : cell.material;
      if (column === "response") return r.chance(0.1) ? cell.response.toUpperCase() : cell.response;
      if (column === "replicate") return String(cell.replicate);
      if (column === "value") return String(r.int(1, 40));
      if (column === "tested_on") return date;
      return operator;
    }),
  );
  return {
    header: columns.map((c) => (r.chance(0.15) ? c.toUpperCase() : c)),
    rows,
    delimiter: ",",
    eol: r.pick(["\n", "\r\n"] as const),
    trailingEol: r.chance(0.5),
    quoteAll: r.chance(0.2),
    bom: r.chance(0.2),
    encoding: "utf-8",
    sender: "fresh",
  };
}

const columnIndex = (sheet: Sheet, name: string) => (sheet.header ?? []).findIndex((h) => h.trim().toLowerCase() === name);

/** Sets one cell of a data row, adding the column (with valid values elsewhere) when the file lacks it. */
function setCell(sheet: Sheet, r: Random, name: string, value: string) {
  let index = columnIndex(sheet, name);
  if (index < 0) {
    sheet.header!.push(name);
    const filler = name === "tested_on" ? "2026-10-14" : "Ines Paravel";
    for (const row of sheet.rows) row.push(filler);
    index = sheet.header!.length - 1;
  }
  if (sheet.rows.length > 0) r.pick(sheet.rows)[index] = value;
}

function serialize(sheet: Sheet) {
  // A row shortened by one defect and widened by another may hold gaps: they are empty fields.
  const quote = (field: string = "") => (sheet.quoteAll || /[",\r\n]/.test(field) || field.includes(sheet.delimiter) ? `"${field.replace(/"/g, '""')}"` : field);
  const lines = [...(sheet.header ? [sheet.header] : []), ...sheet.rows].map((row) => Array.from(row, quote).join(sheet.delimiter));
  return lines.join(sheet.eol) + (sheet.trailingEol ? sheet.eol : "");
}

function encode(text: string, sheet: Sheet): Uint8Array {
  const body = sheet.bom && sheet.encoding === "utf-8" ? `\uFEFF${text}` : text;
  if (sheet.encoding === "utf-8") return new TextEncoder().encode(body);
  if (sheet.encoding === "latin1") return Buffer.from(body, "latin1");
  const le = Buffer.from(body, "utf16le");
  if (sheet.encoding === "utf-16le-no-bom") return le;
  if (sheet.encoding === "utf-16le") return Buffer.concat([Buffer.from([0xff, 0xfe]), le]);
  return Buffer.concat([Buffer.from([0xfe, 0xff]), le.swap16()]);
}

/** Inserts bytes at a random place after the first `keep` bytes. */
function insertBytes(bytes: Uint8Array, r: Random, inserted: number[], keep = 0) {
  const at = r.int(Math.min(keep, bytes.length), bytes.length);
  return Buffer.concat([bytes.subarray(0, at), Buffer.from(inserted), bytes.subarray(at)]);
}

const dataLineRange = (text: string) => {
  const lines = text.split(/\r?\n/);
  return { lines, candidates: lines.map((line, i) => (i > 0 && line.trim() !== "" ? i : -1)).filter((i) => i > 0) };
};

const VALUE_MESSAGE = /Enter a number|A count is a whole number|A count cannot be negative|The value is empty/;
const HEADER_MESSAGE = /The header row has no/;
const NOT_UTF8 = /not UTF-8 text/;
const NOT_TEXT = /not a CSV text file|not UTF-8 text|UTF-16|The header row has no|could not be read as an \.xlsx workbook/;

const cellDefect = (name: string, column: string, expect: RegExp, values: (r: Random, frame: Frame) => string[]): Defect<Sheet> => ({
  name,
  expect,
  model: (sheet, r, frame) => setCell(sheet, r, column, r.pick(values(r, frame))),
});

/** In the order they are applied (cells, then columns, then the file as a whole), so no defect works on what another removed. */
const CSV_DEFECTS: Defect<Sheet>[] = [
  cellDefect("formula or junk as value", "value", VALUE_MESSAGE, () => ["=cmd()", "=1+2", "@SUM(A1:A2)", "=HYPERLINK(\"http://example.invalid\",\"x\")", "NaN", "Infinity", "-Infinity", "1e309", "1e3", "0x10", "1,5", "1 000", "12abc", "١٢", "１２", "'12", "12 passes", "true", "#N/A", "<script>alert(1)</script>"]),
  cellDefect("negative count", "value", /A count cannot be negative/, (r) => [`-${r.int(1, 40)}`, "-1"]),
  cellDefect("fractional count", "value", /A count is a whole number/, (r) => [`${r.int(1, 39)}.5`, "0.5", `${r.int(1, 9)}.25`]),
  cellDefect("empty value", "value", /The value is empty/, () => ["", "   "]),
  cellDefect("huge value", "value", VALUE_MESSAGE, (r) => [huge(r, "9"), huge(r, "x")]),
  cellDefect("unknown material", "material", /The study has no material/, (r) => ["F9", "F3", "X", "", "=cmd()", "+1", "@SUM(1)", "F1; DROP TABLE results", "../F1", "F1\u200b", "Ｆ1", huge(r, "F")]),
  cellDefect("unknown response", "response", /The study has no response/, (r) => ["gloss", "hole", "holes surface", "", "=1", "@holes", huge(r, "h")]),
  cellDefect("replicate out of range or not a whole number", "replicate", /Replicate must be a whole number/, (r, frame) => [
    "0",
    String(frame.replicates + r.int(1, 5)),
    "99",
    "-1",
    "1.5",
    "one",
    "",
    "+1",
    "0x2",
    "1e0",
    "=1",
    "2147483648",
    huge(r, "1"),
  ]),
  cellDefect("bad test date", "tested_on", /test date/, (r) => ["2026-13-01", "2026-02-30", "31/12/2026", "2026-1-5", "=TODAY()", "2999-01-01", "yesterday", "2026-10-14T10:00", huge(r, "2")]),
  cellDefect("operator that is a formula or too long", "operator", /operator/, (r) => ["=cmd|' /C calc'!A0", "+44 1234", "-x", "@SUM(A1)", "=HYPERLINK(\"http://example.invalid\")", "A".repeat(121), huge(r, "O")]),
  {
    name: "Latin-1 bytes",
    expect: NOT_UTF8,
    model: (sheet, r) => {
      setCell(sheet, r, "operator", r.pick(ACCENTED_OPERATORS));
      sheet.encoding = "latin1";
    },
  },
  {
    name: "duplicate replicate",
    expect: /is already given in row/,
    model: (sheet, r) => {
      const copy = [...r.pick(sheet.rows)];
      copy[columnIndex(sheet, "value")] = String(r.int(1, 40));
      sheet.rows.splice(r.int(0, sheet.rows.length), 0, copy);
    },
  },
  {
    name: "thousands of repeated rows",
    expect: /is already given in row/,
    bulky: true,
    rare: true,
    model: (sheet, r) => {
      // Cells cut short, so a huge cell is not repeated thousands of times.
      const row = r.pick(sheet.rows).map((cell) => cell.slice(0, 100));
      sheet.rows.push(...Array.from({ length: r.int(500, 5000) }, () => [...row]));
    },
  },
  { name: "rows of submitted cells", expect: /is already submitted/, model: (sheet) => void (sheet.sender = "submitted") },
  { name: "extra field in a row", expect: /fields where the header has/, model: (sheet, r) => void r.pick(sheet.rows).push(r.pick(["", "12", "extra"])) },
  { name: "missing field in a row", expect: /fields where the header has/, model: (sheet, r) => void r.pick(sheet.rows).pop() },
  {
    name: "renamed required column",
    expect: HEADER_MESSAGE,
    model: (sheet, r) => {
      const index = columnIndex(sheet, r.pick(REQUIRED));
      sheet.header![index] = r.pick(["materials", "mat", "resp", "replicate_no", "rep", "val", "result", "Material Code", "value (passes)"]);
    },
  },
  {
    name: "dropped required column",
    expect: HEADER_MESSAGE,
    model: (sheet, r) => {
      const index = columnIndex(sheet, r.pick(REQUIRED));
      sheet.header!.splice(index, 1);
      for (const row of sheet.rows) row.splice(index, 1);
    },
  },
  {
    name: "column named twice",
    expect: /column twice/,
    model: (sheet, r) => {
      const index = r.int(0, sheet.header!.length - 1);
      sheet.header!.push(sheet.header![index]!);
      for (const row of sheet.rows) row.push(row[index]!);
    },
  },
  {
    name: "column the import does not read",
    expect: /the import does not read/,
    model: (sheet, r) => {
      const at = r.int(0, sheet.header!.length);
      sheet.header!.splice(at, 0, r.pick(["notes", "lab", "units", "comment", "=cmd()", "value2"]));
      for (const row of sheet.rows) row.splice(at, 0, "x");
    },
  },
  {
    name: "very many named columns",
    expect: /the import does not read/,
    bulky: true,
    model: (sheet, r) => {
      const extra = Array.from({ length: r.int(200, 3000) }, (_, i) => `c${i + 1}`);
      sheet.header!.push(...extra);
      for (const row of sheet.rows) row.push(...extra.map(() => ""));
    },
  },
  {
    name: "value under an unnamed column",
    expect: /which has no name in the header row/,
    bulky: true,
    model: (sheet, r) => {
      const blanks = r.int(1, 2000);
      sheet.header!.push(...Array.from({ length: blanks }, () => ""));
      for (const row of sheet.rows) row.push(...Array.from({ length: blanks }, () => ""));
      r.pick(sheet.rows)[sheet.header!.length - r.int(1, blanks)] = r.pick(["12", "late", "=cmd()"]);
    },
  },
  // Semicolons are read (a spreadsheet in a decimal-comma locale saves them); tabs and bars are not.
  { name: "tabs or bars between fields", expect: HEADER_MESSAGE, model: (sheet, r) => void (sheet.delimiter = r.pick(["\t", "|"])) },
  { name: "UTF-16 with BOM", expect: /UTF-16/, model: (sheet, r) => void (sheet.encoding = r.pick(["utf-16le", "utf-16be"] as const)) },
  { name: "UTF-16 without BOM", expect: /not a CSV text file/, model: (sheet) => void (sheet.encoding = "utf-16le-no-bom") },
  { name: "only a header row", expect: /no result rows/, model: (sheet, r) => void (sheet.rows = r.chance(0.5) ? [] : [sheet.header!.map(() => "")]) },
  { name: "no header row", expect: /The header row has no|The file is empty/, model: (sheet) => void (sheet.header = null) },
  {
    name: "unbalanced quote",
    expect: /Quoted field unterminated|quoted field is malformed/,
    model: (sheet) => void (sheet.quoteAll = false),
    text: (text, r) => {
      const { lines, candidates } = dataLineRange(text);
      const line = candidates.length > 0 ? r.pick(candidates) : 0;
      const starts = [0, ...[...lines[line]!.matchAll(/,/g)].map((m) => m.index! + 1)];
      const at = r.pick(starts);
      lines[line] = `${lines[line]!.slice(0, at)}"${lines[line]!.slice(at)}`;
      return lines.join("\n");
    },
  },
  {
    name: "truncated in the last row",
    expect: /fields where the header has|Quoted field unterminated|The header row has no/,
    text: (text, r) => {
      const trimmed = text.replace(/[\r\n]+$/, "");
      const lastLine = trimmed.lastIndexOf("\n") + 1;
      const lastComma = trimmed.lastIndexOf(",");
      return lastComma > lastLine ? trimmed.slice(0, r.int(lastLine + 1, lastComma)) : trimmed.slice(0, r.int(1, Math.max(1, lastComma)));
    },
  },
  { name: "NUL byte", expect: /not a CSV text file/, text: (text, r) => { const at = r.int(0, text.length); return `${text.slice(0, at)}\u0000${text.slice(at)}`; } },
  {
    name: "invalid UTF-8 sequence",
    expect: NOT_UTF8,
    bytes: (bytes, r) => insertBytes(bytes, r, r.pick([[0xc0, 0x80], [0xed, 0xa0, 0x80], [0xf8, 0x88, 0x80, 0x80, 0x80], [0x80], [0xe2, 0x82], [0xff]]), 3),
  },
  {
    name: "binary junk",
    expect: NOT_TEXT,
    bytes: (_bytes, r) => Uint8Array.from({ length: r.int(16, 4096) }, () => r.int(0, 255)),
  },
  {
    name: "another file type",
    expect: NOT_TEXT,
    bytes: (_bytes, r) => {
      const signature = r.pick([[0x50, 0x4b, 0x03, 0x04, 0x14, 0x00, 0x06, 0x00], [0x89, 0x50, 0x4e, 0x47, 0x0d, 0x0a, 0x1a, 0x0a, 0, 0, 0, 0x0d], [0x1f, 0x8b, 0x08, 0x00], [0x25, 0x50, 0x44, 0x46, 0x2d, 0x31, 0x2e, 0x37, 0x0a, 0x25, 0xe2, 0xe3, 0xcf, 0xd3], [0xd0, 0xcf, 0x11, 0xe0, 0xa1, 0xb1, 0x1a, 0xe1, 0]]);
      return Uint8Array.from([...signature, ...Array.from({ length: r.int(0, 512) }, () => r.int(0, 255))]);
    },
  },
  { name: "empty file", expect: /The file is empty/, bytes: (_bytes, r) => r.pick([new Uint8Array(), new TextEncoder().encode(r.pick(["\n", "\r\n\r\n", "   \n\t\n", "\uFEFF", ",,,\n,,,"]))]) },
  {
    name: "file over 2 MB",
    expect: /larger than 2 MB/,
    bulky: true,
    rare: true,
    oversize: true,
    bytes: (bytes, r) => Buffer.concat([bytes, Buffer.alloc(IMPORT_MAX_BYTES + r.int(1, 200_000), "\n")]),
  },
];

function pickDefects<Model>(r: Random, defects: Defect<Model>[]) {
  const count = r.chance(0.6) ? 1 : r.chance(0.75) ? 2 : 3;
  const chosen: Defect<Model>[] = [];
  while (chosen.length < count) {
    const defect = r.pick(defects);
    if (chosen.includes(defect) || (defect.rare && !r.chance(0.25)) || (defect.bulky && chosen.some((d) => d.bulky))) continue;
    chosen.push(defect);
  }
  return chosen.sort((a, b) => defects.indexOf(a) - defects.indexOf(b));
}

type Pipeline<Model> = {
  base: (r: Random, frame: Frame) => Model;
  defects: Defect<Model>[];
  serialize: (model: Model) => string;
  encode: (text: string, model: Model) => Uint8Array;
  maxBytes: number;
};

/** Draws `n` cases: a base, its defects applied to the model, then to the text, then to the bytes. */
function generate<Model>(pipeline: Pipeline<Model>, r: Random, frame: Frame, n: number) {
  const cases: { name: string; model: Model; bytes: Uint8Array; expect: RegExp[] }[] = [];
  while (cases.length < n) {
    const model = pipeline.base(r, frame);
    const defects = pickDefects(r, pipeline.defects);
    for (const d of defects) d.model?.(model, r, frame);
    let text = pipeline.serialize(model);
    for (const d of defects) if (d.text) text = d.text(text, r, model);
    let bytes = pipeline.encode(text, model);
    for (const d of defects) if (d.bytes) bytes = d.bytes(bytes, r);
    // Over the size limit by accident, the refusal would be the size's and not the defects': draw again.
    if (bytes.length > pipeline.maxBytes && !defects.some((d) => d.oversize)) continue;
    cases.push({ name: defects.map((d) => d.name).join(" + "), model, bytes, expect: defects.map((d) => d.expect) });
  }
  return cases;
}

/** One clean file of a generated shape: what the control imports. */
export function validCsv(r: Random, frame: Frame) {
  const sheet = baseSheet(r, frame);
  return { bytes: encode(serialize(sheet), sheet), rows: sheet.rows.length };
}

export const CSV_DEFECT_NAMES = CSV_DEFECTS.map((d) => d.name);

export function csvCases(r: Random, frame: Frame, n: number): GeneratedCase[] {
  const pipeline = { base: baseSheet, defects: CSV_DEFECTS, serialize, encode, maxBytes: IMPORT_MAX_BYTES };
  return generate(pipeline, r, frame, n).map(({ model, ...generated }) => ({ ...generated, sender: model.sender }));
}

// ——— JSON bodies for POST /api/v1/enrollments/:id/results ———

type Body = {
  /** The parsed shape; replaced whole by some defects. */
  root: unknown;
  /** Raw JSON tokens to put where a marker string stands (NaN, 012 …), which JSON.stringify cannot write. */
  raw: Map<string, string>;
  indent: number;
  sender: Sender;
  /** The enrollment id in the URL, when a defect replaces it. */
  enrollmentParam?: string;
};

export type GeneratedBody = { name: string; sender: Sender; enrollmentParam?: string; body: Uint8Array; expect: RegExp[] };

function baseBody(r: Random, frame: Frame): Body {
  const date = testDate(r);
  const operator = r.pick(OPERATORS);
  const results = someCells(r, frame).map((cell) => ({
    ...cell,
    value: r.int(1, 40),
    ...(r.chance(0.5) ? { testedOn: date } : {}),
    ...(r.chance(0.5) ? { operator } : r.chance(0.2) ? { operator: null } : {}),
  }));
  return { root: { results }, raw: new Map(), indent: r.pick([0, 0, 2]), sender: "fresh" };
}

type Row = Record<string, unknown>;
const rowsOf = (body: Body): Row[] => {
  const results = (body.root as { results?: unknown } | null)?.results;
  return Array.isArray(results) ? results : [];
};
/** Runs `change` on one random result, if the body still has any. */
function withRow(body: Body, r: Random, change: (row: Row) => void) {
  const rows = rowsOf(body).filter((row) => row !== null && typeof row === "object" && !Array.isArray(row));
  if (rows.length > 0) change(r.pick(rows));
}

const fieldDefect = (name: string, field: string, expect: RegExp, values: (r: Random, frame: Frame) => unknown[]): Defect<Body> => ({
  name,
  expect,
  model: (body, r, frame) => withRow(body, r, (row) => (row[field] = r.pick(values(r, frame)))),
});

/** Puts a raw token (which JSON.stringify cannot write) as one field's value. */
const rawDefect = (name: string, field: string, expect: RegExp, tokens: string[]): Defect<Body> => ({
  name,
  expect,
  model: (body, r) =>
    withRow(body, r, (row) => {
      const marker = `@@raw${body.raw.size}@@`;
      body.raw.set(marker, r.pick(tokens));
      row[field] = marker;
    }),
});

const MALFORMED = /"code":"malformed_json"/;
const atPath = (field: string) => new RegExp(`"path":"results\\.\\d+\\.${field}"|"field":"${field === "testedOn" ? "tested_on" : field}"`);

/** In the order they are applied: changes of one field first, then changes of the whole body, then of its text and bytes. */
const JSON_DEFECTS: Defect<Body>[] = [
  rawDefect("NaN, Infinity or a non-JSON number", "value", MALFORMED, ["NaN", "Infinity", "-Infinity", "0x10", "012", ".5", "+1", "1.", "--1"]),
  rawDefect("a number too large for a double", "value", atPath("value"), ["1e309", "-1e309", "9".repeat(400)]),
  fieldDefect("number as a string", "value", atPath("value"), (r) => [String(r.int(1, 40)), "12", "NaN", "Infinity", "1e3"]),
  fieldDefect("replicate as a string", "replicate", atPath("replicate"), () => ["1", "2", "one", ""]),
  fieldDefect("wrong type of value", "value", atPath("value"), () => [true, null, {}, [12], { value: 12 }]),
  fieldDefect("wrong type of material", "material", atPath("material"), () => [12, true, null, ["F1"], { code: "F1" }]),
  fieldDefect("wrong type of response", "response", atPath("response"), () => [1, false, null, ["holes"]]),
  fieldDefect("wrong type of test date", "testedOn", atPath("testedOn"), () => [20261014, true, ["2026-10-14"], {}]),
  fieldDefect("unknown material", "material", atPath("material"), () => ["F9", "X", "=cmd()", "../F1", "F1\u200b", "Ｆ1", ""]),
  fieldDefect("unknown response", "response", atPath("response"), () => ["gloss", "hole", "@holes", ""]),
  fieldDefect("replicate out of range or fractional", "replicate", atPath("replicate"), (r, frame) => [0, -1, frame.replicates + r.int(1, 5), 1.5, 2 ** 53, 1e300]),
  fieldDefect("negative or fractional count", "value", atPath("value"), (r) => [-1, -r.int(1, 40), 0.5, r.int(1, 39) + 0.25]),
  fieldDefect("bad test date", "testedOn", atPath("testedOn"), () => ["2026-13-01", "31/12/2026", "2999-01-01", "=TODAY()", "yesterday"]),
  fieldDefect("operator that is a formula or too long", "operator", atPath("operator"), (r) => ["=cmd()", "+44 1234", "@SUM(A1)", "-x", "A".repeat(r.int(121, 400))]),
  {
    name: "huge string",
    expect: /"path":"results\.\d+\.(material|response|operator)"/,
    bulky: true,
    // Up to 750 kB (a 3-byte character 250,000 times): under the 1 MB body limit.
    model: (body, r) => withRow(body, r, (row) => (row[r.pick(["material", "response", "operator"])] = huge(r, r.pick(["F", "é", "\u202e"]), 250_000))),
  },
  { name: "Latin-1 bytes in a string", expect: /not UTF-8 text/, model: (body, r) => withRow(body, r, (row) => (row.operator = r.pick(ACCENTED_OPERATORS))), bytes: (bytes) => Buffer.from(new TextDecoder().decode(bytes), "latin1") },
  { name: "a field the API does not know", expect: /Unrecognized key/, model: (body, r) => withRow(body, r, (row) => (row[r.pick(["replicates", "Value", "lab", "unit", "status"])] = r.pick([1, "x", true]))) },
  {
    name: "__proto__ or constructor key",
    expect: /Unrecognized key/,
    model: (body, r) => {
      const key = r.pick(["__proto__", "constructor", "prototype"]);
      const value = r.pick([{ polluted: true }, { prototype: { polluted: true } }, { results: [] }]);
      // An own property, as JSON.parse makes it: plain assignment to __proto__ would set the prototype instead.
      const define = (target: object) => Object.defineProperty(target, key, { value, enumerable: true, configurable: true, writable: true });
      if (r.chance(0.5)) define(body.root as object);
      else withRow(body, r, define);
    },
  },
  {
    name: "duplicate replicate",
    expect: /"field":"replicate"/,
    model: (body, r) => {
      const rows = rowsOf(body);
      rows.splice(r.int(0, rows.length), 0, { ...r.pick(rows), value: r.int(1, 40) });
    },
  },
  { name: "rows of submitted cells", expect: /"code":"cell_submitted"/, model: (body) => void (body.sender = "submitted") },
  { name: "more than 5000 results", expect: /at most 5000/, bulky: true, model: (body, r) => void (body.root = { results: Array.from({ length: 5001 + r.int(0, 2000) }, () => ({ ...rowsOf(body)[0] })) }) },
  {
    name: "result as an array",
    expect: /"path":"results\.\d+"/,
    model: (body, r) => {
      const rows = rowsOf(body);
      const i = r.int(0, rows.length - 1);
      rows[i] = Object.values(rows[i]!) as never;
    },
  },
  {
    name: "extra nesting",
    expect: /"code":"invalid_results"/,
    model: (body, r) => void (body.root = r.pick([{ data: body.root }, { results: { results: rowsOf(body) } }, { results: [rowsOf(body)] }, { results: rowsOf(body).map((row) => ({ result: row })) }])),
  },
  { name: "no results", expect: /"path":"results"/, model: (body, r) => void (body.root = r.pick([{ results: [] }, { results: null }, { results: {} }, { results: "F1,holes,1,12" }, { results: 12 }, {}])) },
  { name: "array instead of an object", expect: /"path":""/, model: (body, r) => void (body.root = r.chance(0.5) ? rowsOf(body) : [body.root]) },
  { name: "null or a scalar body", expect: /"path":""/, model: (body, r) => void (body.root = r.pick([null, 12, "results", true])) },
  { name: "enrollment id that is not one", expect: /"code":"not_found"/, model: (body, r) => void (body.enrollmentParam = r.pick(["abc", "-1", "0", "1e3", "99999999999999999999", "1.5", "%00", "../1"])) },
  {
    name: "deep nesting",
    expect: /"code":"(invalid_results|malformed_json)"/,
    bulky: true,
    text: (text, r) => {
      const depth = r.int(1_000, 100_000);
      return r.chance(0.5) ? `${"[".repeat(depth)}${"]".repeat(depth)}` : text.replace(/"results"/, `"results":${'{"a":'.repeat(depth)}1${"}".repeat(depth)},"x"`);
    },
  },
  { name: "truncated", expect: MALFORMED, text: (text, r) => text.slice(0, r.int(1, Math.max(1, text.length - 1))) },
  {
    name: "not JSON",
    expect: MALFORMED,
    text: (_text, r) => r.pick(["{results: [", "<results/>", "results=1", "", "undefined", "NaN", "{'results': []}", '{"results": [1,]}', "[", "}", '"unterminated', '{"results":[]}garbage', "\u0000", "\uFEFF\uFEFF{}"]),
  },
  { name: "body over 1 MB", expect: /"code":"body_too_large"/, bulky: true, rare: true, oversize: true, text: (text, r) => `${text.slice(0, -1)},"pad":"${"x".repeat(MAX_BODY_BYTES + r.int(1, 100_000))}"}` },
  { name: "UTF-16 body", expect: MALFORMED, bytes: (bytes) => Buffer.concat([Buffer.from([0xff, 0xfe]), Buffer.from(new TextDecoder().decode(bytes), "utf16le")]) },
];

function serializeBody(body: Body) {
  let text = JSON.stringify(body.root, null, body.indent);
  for (const [marker, token] of body.raw) text = text.replace(`"${marker}"`, token);
  return text;
}

/** One clean body of a generated shape, for the control. */
export function validBody(r: Random, frame: Frame) {
  const body = baseBody(r, frame);
  return { body: serializeBody(body), rows: rowsOf(body).length };
}

export const JSON_DEFECT_NAMES = JSON_DEFECTS.map((d) => d.name);

export function jsonCases(r: Random, frame: Frame, n: number): GeneratedBody[] {
  const pipeline = { base: baseBody, defects: JSON_DEFECTS, serialize: serializeBody, encode: (text: string) => new TextEncoder().encode(text), maxBytes: MAX_BODY_BYTES };
  return generate(pipeline, r, frame, n).map(({ model, bytes, ...generated }) => ({ ...generated, body: bytes, sender: model.sender, enrollmentParam: model.enrollmentParam }));
}
