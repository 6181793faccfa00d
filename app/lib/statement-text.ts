/**
 * Draft precision statement texts generated from a frozen analysis, in the
 * two forms a committee expects: the ASTM E691 form (repeatability and
 * reproducibility limits r and R with s_r and s_R, per material, with their
 * confidence intervals) and the ASTM C670 form (1s and d2s limits, or 1s % and
 * d2s % for both precisions when the coefficient of variation is the steadier
 * figure — one rule, one form per response). Precision figures are rounded to
 * three significant digits (ASTM E691 asks for two or three). The coordinator
 * edits the wording; the figures stay those of the snapshot.
 */
import {
  c670Form,
  formatSignificant,
  STATEMENT_SIGNIFICANT_DIGITS,
  type C670Form,
  type ComputedGroup,
  type StudyAnalysis,
} from "~/lib/precision";
import { ALPHA_LABEL, figureDecimals, formatFigure } from "~/lib/review/format";

export type SnapshotResponse = { key: string; name: string; unit: string; decimals: number };

export type StatementSnapshot = {
  study: { code: string; title: string; testMethod: string };
  dataVersion: number;
  frozenAt: string;
  labs: number;
  replicates: number;
  materials: { code: string; description: string }[];
  responses: SnapshotResponse[];
  analysis: StudyAnalysis;
};

const computedGroups = (analysis: StudyAnalysis, response: string) =>
  analysis.groups.filter((g): g is ComputedGroup => g.status === "computed" && g.response === response);

const plural = (n: number, one: string, many = `${one}s`) => `${n} ${n === 1 ? one : many}`;

/** The rounding rule every precision figure of the statement follows. */
export const ROUNDING_RULE = `Precision figures are rounded to ${STATEMENT_SIGNIFICANT_DIGITS} significant digits (ASTM E691 asks for two or three); averages keep one decimal more than the results.`;

/** A precision figure under the statement's rounding rule. */
export const sig = (x: number | null | undefined) => formatSignificant(x, STATEMENT_SIGNIFICANT_DIGITS);

/**
 * The C670 form of a response: the engine's choice (one rule for both
 * precisions, see `c670Form`); snapshots frozen before it existed get it
 * recomputed from their groups.
 */
export function responseForm(analysis: StudyAnalysis, response: string): C670Form {
  const stored = analysis.levelFits?.find((fit) => fit.response === response)?.c670Form;
  if (stored) return stored;
  return c670Form(computedGroups(analysis, response).map((g) => ({ level: g.mean, sr: g.sr, sR: g.sR })));
}

/** The practices' minimums the study falls short of, as a paragraph; empty when it meets them. */
export function warningsParagraph(analysis: StudyAnalysis) {
  const warnings = analysis.warnings ?? [];
  if (warnings.length === 0) return null;
  return ["Limitations of the study design:", ...warnings.map((w) => `- ${w.message}.`)].join("\n");
}

/** "95 % confidence interval 0.58 to 1.66; ISO 5725-1 ±49 %" for one figure, from the group's uncertainty. */
function intervalsLine(g: ComputedGroup, u: string) {
  const x = g.uncertainty;
  if (!x) return null;
  return (
    `  95 % confidence intervals: σ_r ${sig(x.sr.lower)} to ${sig(x.sr.upper)}${u} (${x.sr.method}); ` +
    `σ_R ${sig(x.sR.lower)} to ${sig(x.sR.upper)}${u} (${x.sR.method}); ` +
    `ISO 5725-1: s_r ± ${(100 * x.Ar).toFixed(0)} %, s_R ± ${(100 * x.AR).toFixed(0)} % (γ = ${x.gamma.toFixed(2)})`
  );
}

function studyDesignSentence(snapshot: StatementSnapshot) {
  return (
    `These figures come from an interlaboratory study (${snapshot.study.code}) in which ${plural(snapshot.labs, "laboratory", "laboratories")} ` +
    `tested ${plural(snapshot.materials.length, "material")} (${snapshot.materials.map((m) => m.code).join(", ")}), ` +
    `with ${plural(snapshot.replicates, "replicate result")} per material and response in each laboratory.`
  );
}

function exclusionsParagraph(snapshot: StatementSnapshot) {
  const excluded = snapshot.analysis.excluded;
  if (excluded.length === 0) return "Every submitted cell was used; none was left out.";
  return [
    `${plural(excluded.length, "cell was", "cells were")} left out of the analysis after investigation:`,
    ...excluded.map((e) => `- lab ${e.lab}, material ${e.material}, ${e.response}: ${e.reason}`),
  ].join("\n");
}

const unitSuffix = (unit: string) => (unit ? ` ${unit}` : "");

/** E691 form: s_r, s_R, r and R for each material level. */
export function e691Text(snapshot: StatementSnapshot) {
  const sections = snapshot.responses.flatMap((response) => {
    const groups = computedGroups(snapshot.analysis, response.key);
    if (groups.length === 0) return [];
    const d = figureDecimals(response.decimals);
    const u = unitSuffix(response.unit);
    return [
      [
        `${response.name}${response.unit ? ` (${response.unit})` : ""}:`,
        ...groups.flatMap((g) => {
          const line =
            `- ${g.material}, average ${formatFigure(g.mean, d.mean)}${u}: s_r = ${sig(g.sr)}, s_R = ${sig(g.sR)}, ` +
            `r = ${sig(g.r)}, R = ${sig(g.R)}`;
          const intervals = intervalsLine(g, u);
          return intervals ? [line, intervals] : [line];
        }),
      ].join("\n"),
    ];
  });
  return [
    `Precision of the ${snapshot.study.testMethod.toLowerCase()}`,
    `${studyDesignSentence(snapshot)} The data were analysed following ASTM E691; lab consistency was checked with the h and k statistics at the ${ALPHA_LABEL[snapshot.analysis.alpha] ?? snapshot.analysis.alpha} significance level, ` +
      "and the cell spreads and averages were screened in the order of ISO 5725-2 (Cochran's test, then Grubbs' single test, then the double test where the single test found nothing) at 5 % and 1 %.",
    ...(warningsParagraph(snapshot.analysis) ? [warningsParagraph(snapshot.analysis)!] : []),
    ...sections,
    ROUNDING_RULE,
    "The repeatability limit r (2.8 s_r) is the difference between two results from one laboratory on the same material that should be exceeded only about once in twenty cases. " +
      "The reproducibility limit R (2.8 s_R) is the same for two results from different laboratories.",
    exclusionsParagraph(snapshot),
  ].join("\n\n");
}

function c670Block(groups: ComputedGroup[], which: "r" | "R", percent: boolean, unit: string) {
  const lines = groups.map((g) => {
    if (percent) {
      const one = which === "r" ? g.oneSrPercent : g.oneSRPercent;
      const d2s = which === "r" ? g.d2srPercent : g.d2sRPercent;
      return `- ${g.material}: 1s % = ${sig(one)} %, d2s % = ${sig(d2s)} %`;
    }
    const one = which === "r" ? g.oneSr : g.oneSR;
    const d2s = which === "r" ? g.d2sr : g.d2sR;
    return `- ${g.material}: 1s = ${sig(one)}${unit}, d2s = ${sig(d2s)}${unit}`;
  });
  const who = which === "r" ? "one operator in one laboratory" : "operators in different laboratories";
  const kind = which === "r" ? "single-operator" : "multilaboratory";
  const figure = percent ? `the ${kind} coefficient of variation (1s %)` : `the ${kind} standard deviation (1s)`;
  const lead =
    `${which === "r" ? "Single-operator" : "Multilaboratory"} precision: ${figure} was found as below. ` +
    `Two properly conducted tests by ${who} on the same material should not differ by more than the d2s${percent ? " %" : ""} limit${percent ? " (in percent of their average)" : ""}.`;
  return [lead, ...lines].join("\n");
}

/** C670 form: 1s and d2s (or their percent forms) for single-operator and multilaboratory precision. */
export function c670Text(snapshot: StatementSnapshot) {
  const sections = snapshot.responses.flatMap((response) => {
    const groups = computedGroups(snapshot.analysis, response.key);
    if (groups.length === 0) return [];
    const u = unitSuffix(response.unit);
    const form = responseForm(snapshot.analysis, response.key);
    const percent = form.form === "percent";
    return [
      `${response.name}${response.unit ? ` (${response.unit})` : ""}: ${percent ? "percent form" : `in ${response.unit || "the response's units"}`} — ${form.reason}.\n` +
        `${c670Block(groups, "r", percent, u)}\n${c670Block(groups, "R", percent, u)}`,
    ];
  });
  return [
    `Precision and bias of the ${snapshot.study.testMethod.toLowerCase()}`,
    `${studyDesignSentence(snapshot)} The limits follow ASTM C670: 1s is the standard deviation and d2s = 2√2 × 1s the acceptable range of two results. ` +
      "Each response is given in one form for both precisions: in percent (1s %, d2s %) when the coefficient of variation is steadier across the materials than the standard deviation, otherwise in the response's units.",
    ...(warningsParagraph(snapshot.analysis) ? [warningsParagraph(snapshot.analysis)!] : []),
    ...sections,
    ROUNDING_RULE,
    "Bias: no accepted reference value exists for these materials, so no statement on bias is made.",
    exclusionsParagraph(snapshot),
  ].join("\n\n");
}
