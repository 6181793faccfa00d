/**
 * The mixture design editor's rows as typed (SI or US customary units) and
 * their translation to an SI design checked by mixtureDesignSchema. The page
 * runs this as the coordinator types and the action runs it again on save, so
 * both refuse the same rows with the same words.
 */
import {
  type Constituent,
  type ConstituentKind,
  flOzPerCwtToMlPer100kg,
  kgPerM3ToLbPerFt3,
  kgPerM3ToLbPerYd3,
  lbPerFt3ToKgPerM3,
  lbPerYd3ToKgPerM3,
  type MixtureDesign,
  mixtureDesignSchema,
  mlPer100kgToFlOzPerCwt,
} from "~/lib/batching";

export type UnitSystem = "si" | "us";

/** The numeric inputs of a row, named as the schema names them. */
export const ROW_FIELDS = [
  "ssdMassKgPerM3",
  "relativeDensity",
  "absorptionPercent",
  "dosagePer100kgCementitious",
  "volumeFractionPercent",
  "fiberDensity",
  "airContentPercent",
] as const;
export type RowField = (typeof ROW_FIELDS)[number];

export type EditorRow = { kind: ConstituentKind; name: string; lot: string } & Partial<Record<RowField, string>>;

export const KIND_LABEL: Record<ConstituentKind, string> = {
  cement: "Cement",
  scm: "SCM",
  water: "Water",
  coarse_aggregate: "Coarse aggregate",
  fine_aggregate: "Fine aggregate",
  admixture: "Admixture",
  fiber: "Fiber",
  air: "Air",
};

const MASS_FIELDS: RowField[] = ["ssdMassKgPerM3", "relativeDensity"];

/** Which inputs a row of each kind has. */
export const FIELDS_BY_KIND: Record<ConstituentKind, RowField[]> = {
  cement: MASS_FIELDS,
  scm: MASS_FIELDS,
  water: MASS_FIELDS,
  coarse_aggregate: [...MASS_FIELDS, "absorptionPercent"],
  fine_aggregate: [...MASS_FIELDS, "absorptionPercent"],
  admixture: ["dosagePer100kgCementitious"],
  fiber: ["volumeFractionPercent", "fiberDensity"],
  air: ["airContentPercent"],
};

type Conversion = { label: Record<UnitSystem, string>; toSi: (v: number) => number; fromSi: (v: number) => number };
const same = (v: number) => v;

/** Label and conversion of each input; unit definitions per NIST SP 811 (see ~/lib/batching/units). */
export const FIELD_UNITS: Record<RowField, Conversion> = {
  ssdMassKgPerM3: { label: { si: "Mass, kg/m³", us: "Mass, lb/yd³" }, toSi: lbPerYd3ToKgPerM3, fromSi: kgPerM3ToLbPerYd3 },
  relativeDensity: { label: { si: "Relative density", us: "Relative density" }, toSi: same, fromSi: same },
  absorptionPercent: { label: { si: "Absorption, %", us: "Absorption, %" }, toSi: same, fromSi: same },
  dosagePer100kgCementitious: {
    label: { si: "Dosage, mL/100 kg", us: "Dosage, fl oz/cwt" },
    toSi: flOzPerCwtToMlPer100kg,
    fromSi: mlPer100kgToFlOzPerCwt,
  },
  volumeFractionPercent: { label: { si: "Volume, % of concrete", us: "Volume, % of concrete" }, toSi: same, fromSi: same },
  fiberDensity: { label: { si: "Fiber density, kg/m³", us: "Fiber density, lb/ft³" }, toSi: lbPerFt3ToKgPerM3, fromSi: kgPerM3ToLbPerFt3 },
  airContentPercent: { label: { si: "Air, % of concrete", us: "Air, % of concrete" }, toSi: same, fromSi: same },
};

function convert(field: RowField, value: number, from: UnitSystem, to: UnitSystem) {
  if (from === to) return value;
  return from === "us" ? FIELD_UNITS[field].toSi(value) : FIELD_UNITS[field].fromSi(value);
}

/** Typed text to a number; blank or junk stays unparsed so the schema names it. */
function parseNumber(text: string | undefined): number | undefined {
  if (text === undefined || text.trim() === "") return undefined;
  const n = Number(text.trim().replace(",", "."));
  return Number.isFinite(n) ? n : undefined;
}

/** Shows a value rounded for editing (mass to 0.1, others to 3 significant decimals). */
export function formatForEditing(field: RowField, value: number) {
  const digits = field === "relativeDensity" ? 3 : field === "ssdMassKgPerM3" ? 1 : 2;
  return String(Number(value.toFixed(digits)));
}

/** Rewrites every number of the rows into the other unit system. */
export function convertRows(rows: EditorRow[], from: UnitSystem, to: UnitSystem): EditorRow[] {
  return rows.map((row) => {
    const next: EditorRow = { ...row };
    for (const field of FIELDS_BY_KIND[row.kind]) {
      const n = parseNumber(row[field]);
      if (n !== undefined) next[field] = formatForEditing(field, convert(field, n, from, to));
    }
    return next;
  });
}

/** Rows for the editor from stored SI constituents. */
export function rowsFromDesign(constituents: Constituent[], units: UnitSystem): EditorRow[] {
  return constituents.map((c) => {
    const row: EditorRow = { kind: c.kind, name: c.name, lot: c.lot ?? "" };
    for (const field of FIELDS_BY_KIND[c.kind]) {
      const value = (c as unknown as Record<string, number | undefined>)[field];
      if (value !== undefined) row[field] = formatForEditing(field, convert(field, value, "si", units));
    }
    return row;
  });
}

export type DesignParse =
  | { ok: true; design: MixtureDesign; errors: Record<string, string> }
  | { ok: false; design: null; errors: Record<string, string> };

/** Form name of one row input, e.g. `c.2.relativeDensity`. */
export const inputName = (index: number, field: RowField | "kind" | "name" | "lot") => `c.${index}.${field}`;

/** The SI design of the rows, checked by mixtureDesignSchema; errors keyed by input name. */
export function parseDesignRows(name: string, rows: EditorRow[], units: UnitSystem): DesignParse {
  const constituents = rows.map((row) => {
    const c: Record<string, unknown> = { kind: row.kind, name: row.name, lot: row.lot || undefined };
    for (const field of FIELDS_BY_KIND[row.kind] ?? []) {
      const n = parseNumber(row[field]);
      c[field] = n === undefined ? undefined : convert(field, n, units, "si");
    }
    return c;
  });
  const parsed = mixtureDesignSchema.safeParse({ name, constituents });
  if (parsed.success) return { ok: true, design: parsed.data, errors: {} };
  const errors: Record<string, string> = {};
  for (const issue of parsed.error.issues) {
    const [, index, field] = issue.path.map(String);
    const key = index === undefined ? "constituents" : inputName(Number(index), (field ?? "kind") as RowField);
    errors[key] ??= issue.message;
  }
  return { ok: false, design: null, errors };
}

/** The rows as a refused form's typed values hold them: `{ c: { "0": { kind, name, … } } }`. */
export function rowsFromTyped(typed: unknown): EditorRow[] {
  const byIndex = (typed as { c?: Record<string, Record<string, unknown>> } | null | undefined)?.c ?? {};
  return rowsFromForm(Object.entries(byIndex).flatMap(([index, row]) => Object.entries(row ?? {}).map(([field, value]): [string, unknown] => [`c.${index}.${field}`, value])));
}

/** The editor's rows as the form submitted them. */
export function rowsFromForm(entries: Iterable<[string, unknown]>): EditorRow[] {
  const rows: EditorRow[] = [];
  for (const [key, value] of entries) {
    const match = /^c\.(\d+)\.(\w+)$/.exec(key);
    if (!match || typeof value !== "string") continue;
    const index = Number(match[1]);
    if (index > 200) continue;
    rows[index] ??= { kind: "cement", name: "", lot: "" };
    (rows[index] as Record<string, string>)[match[2]!] = value;
  }
  return rows.filter(Boolean);
}
