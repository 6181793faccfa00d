/**
 * Draft precision statement texts generated from a frozen analysis, in the
 * two forms a committee expects: the ASTM E691 form (repeatability and
 * reproducibility limits r and R with s_r and s_R, per material) and the ASTM
 * C670 form (1s and d2s limits, or 1s % and d2s % when the coefficient of
 * variation is the steadier figure). The coordinator edits the wording; the
 * figures stay those of the snapshot.
 */
import type { ComputedGroup, StudyAnalysis } from "~/lib/precision";
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

function relativeSpread(values: number[]) {
  if (values.length < 2) return Number.POSITIVE_INFINITY;
  const mean = values.reduce((a, b) => a + b, 0) / values.length;
  if (mean === 0) return Number.POSITIVE_INFINITY;
  const sd = Math.sqrt(values.reduce((a, v) => a + (v - mean) ** 2, 0) / (values.length - 1));
  return sd / Math.abs(mean);
}

/**
 * C670 offers the percent form when the coefficient of variation stays
 * steadier across levels than the standard deviation does (common practice):
 * compare the relative spread of s and of CV over the materials.
 */
export function percentFormSteadier(groups: readonly ComputedGroup[], which: "r" | "R") {
  const sds = groups.map((g) => (which === "r" ? g.sr : g.sR));
  const cvs = groups.map((g) => (which === "r" ? g.cvr : g.cvR));
  if (groups.length < 2 || cvs.some((cv) => cv === null)) return false;
  return relativeSpread(cvs as number[]) < relativeSpread(sds);
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
        ...groups.map(
          (g) =>
            `- ${g.material}, average ${formatFigure(g.mean, d.mean)}${u}: s_r = ${formatFigure(g.sr, d.sd)}, s_R = ${formatFigure(g.sR, d.sd)}, ` +
            `r = ${formatFigure(g.r, d.limit)}, R = ${formatFigure(g.R, d.limit)}`,
        ),
      ].join("\n"),
    ];
  });
  return [
    `Precision of the ${snapshot.study.testMethod.toLowerCase()}`,
    `${studyDesignSentence(snapshot)} The data were analysed following ASTM E691; lab consistency was checked with the h and k statistics at the ${ALPHA_LABEL[snapshot.analysis.alpha] ?? snapshot.analysis.alpha} significance level.`,
    ...sections,
    "The repeatability limit r (2.8 s_r) is the difference between two results from one laboratory on the same material that should be exceeded only about once in twenty cases. " +
      "The reproducibility limit R (2.8 s_R) is the same for two results from different laboratories.",
    exclusionsParagraph(snapshot),
  ].join("\n\n");
}

function c670Block(groups: ComputedGroup[], which: "r" | "R", decimals: ReturnType<typeof figureDecimals>, unit: string) {
  const percent = percentFormSteadier(groups, which);
  const lines = groups.map((g) => {
    if (percent) {
      const one = which === "r" ? g.oneSrPercent : g.oneSRPercent;
      const d2s = which === "r" ? g.d2srPercent : g.d2sRPercent;
      return `- ${g.material}: 1s % = ${formatFigure(one, 1)} %, d2s % = ${formatFigure(d2s, 1)} %`;
    }
    const one = which === "r" ? g.oneSr : g.oneSR;
    const d2s = which === "r" ? g.d2sr : g.d2sR;
    return `- ${g.material}: 1s = ${formatFigure(one, decimals.sd)}${unit}, d2s = ${formatFigure(d2s, decimals.limit)}${unit}`;
  });
  const who = which === "r" ? "one operator in one laboratory" : "operators in different laboratories";
  const lead =
    which === "r"
      ? `Single-operator precision: ${percent ? "the single-operator coefficient of variation (1s %)" : "the single-operator standard deviation (1s)"} was found as below. ` +
        `Two properly conducted tests by ${who} on the same material should not differ by more than the d2s${percent ? " %" : ""} limit.`
      : `Multilaboratory precision: ${percent ? "the multilaboratory coefficient of variation (1s %)" : "the multilaboratory standard deviation (1s)"} was found as below. ` +
        `Two properly conducted tests by ${who} on the same material should not differ by more than the d2s${percent ? " %" : ""} limit.`;
  return [lead, ...lines].join("\n");
}

/** C670 form: 1s and d2s (or their percent forms) for single-operator and multilaboratory precision. */
export function c670Text(snapshot: StatementSnapshot) {
  const sections = snapshot.responses.flatMap((response) => {
    const groups = computedGroups(snapshot.analysis, response.key);
    if (groups.length === 0) return [];
    const d = figureDecimals(response.decimals);
    const u = unitSuffix(response.unit);
    return [`${response.name}${response.unit ? ` (${response.unit})` : ""}:\n${c670Block(groups, "r", d, u)}\n${c670Block(groups, "R", d, u)}`];
  });
  return [
    `Precision and bias of the ${snapshot.study.testMethod.toLowerCase()}`,
    `${studyDesignSentence(snapshot)} The limits follow ASTM C670: 1s is the standard deviation and d2s = 2√2 × 1s the acceptable range of two results.`,
    ...sections,
    "Bias: no accepted reference value exists for these materials, so no statement on bias is made.",
    exclusionsParagraph(snapshot),
  ].join("\n\n");
}
