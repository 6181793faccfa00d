import { sampleStandardDeviation } from "simple-statistics";
import { algorithmA, type RobustEstimate } from "./algorithm-a";
import { assignedValueUncertaintyNegligible, consensusUncertainty } from "./assigned-value";
import { interpretScore, type ScoreVerdict } from "./interpretation";
import { zetaScore, zPrimeScore, zScore } from "./scores";
import { sigmaPtFromPrecision } from "./sigma-pt";

/** How the assigned value of one material × response is set. */
export type AssignedValueChoice =
  | { method: "consensus" }
  | { method: "reference"; value: number; uncertainty: number };

/** How σ_pt of one material × response is set. */
export type SigmaPtChoice =
  /** σ_r and σ_R of the method at a level (the assigned value), from its published precision */
  | { method: "precision"; atLevel: (level: number) => { sr: number; sR: number } }
  | { method: "robust" }
  | { method: "fixed"; value: number };

export interface LabEntry {
  labCode: string;
  /** the lab's replicate results for this material × response */
  values: readonly number[];
  /** the lab's own standard uncertainty of its reported result, when it gives one */
  uncertainty?: number | null;
}

export interface LabScore {
  labCode: string;
  /** the lab's result: the average of its replicates (ISO 13528 5.5.2) */
  result: number;
  z: number;
  zPrime: number | null;
  zeta: number | null;
  /** the score the verdict rests on: z′ when u(x_pt) is not negligible, else z */
  scoreKind: "z" | "z′";
  score: number;
  verdict: ScoreVerdict;
  zetaVerdict: ScoreVerdict | null;
}

export interface GroupScores {
  assignedValue: number;
  assignedUncertainty: number;
  assignedMethod: AssignedValueChoice["method"];
  sigmaPt: number;
  sigmaMethod: SigmaPtChoice["method"];
  /** Algorithm A on the labs' results; always computed, shown beside a reference value too */
  robust: RobustEstimate;
  uncertaintyNegligible: boolean;
  labs: LabScore[];
}

/** A choice that cannot be applied to the data, with the reason in plain words. */
export class ScoringRefusal extends Error {}

function labResult(values: readonly number[]): number {
  return values.reduce((sum, value) => sum + value, 0) / values.length;
}

/**
 * Scores every lab for one material × response: assigned value and its
 * uncertainty (consensus by Algorithm A or a reference value), σ_pt (from the
 * method's published precision at the assigned value's level, the round's
 * robust s*, or a fixed value), then z, z′ and ζ with their verdicts.
 */
export function scoreGroup(
  entries: readonly LabEntry[],
  assigned: AssignedValueChoice,
  sigma: SigmaPtChoice,
  replicatesPerLab: number,
): GroupScores {
  const withResults = entries.filter((entry) => entry.values.length > 0);
  if (withResults.length < 2) throw new ScoringRefusal("Scores need results from at least 2 labs.");
  const results = withResults.map((entry) => labResult(entry.values));
  const robust = algorithmA(results);

  const assignedValue = assigned.method === "consensus" ? robust.robustMean : assigned.value;
  // When more than half the labs report the same result, s* is 0 and would give u(x_pt) = 0; the plain
  // standard deviation of the results stands in for s* there (our rule, so the uncertainty is never understated to nothing).
  const spreadForUncertainty = robust.degenerate ? sampleStandardDeviation(results) : robust.robustSd;
  const assignedUncertainty = assigned.method === "consensus" ? consensusUncertainty(spreadForUncertainty, robust.count) : assigned.uncertainty;

  let sigmaPt: number;
  if (sigma.method === "fixed") sigmaPt = sigma.value;
  else if (sigma.method === "robust") sigmaPt = robust.robustSd;
  else {
    const { sr, sR } = sigma.atLevel(assignedValue);
    sigmaPt = sigmaPtFromPrecision(sR, sr, replicatesPerLab);
  }
  if (!(sigmaPt > 0)) {
    throw new ScoringRefusal(
      sigma.method === "robust"
        ? "The robust s* is zero (more than half the labs reported the same result); choose σ_pt from the published precision or a fixed value."
        : "σ_pt must be greater than zero.",
    );
  }

  const uncertaintyNegligible = assignedValueUncertaintyNegligible(assignedUncertainty, sigmaPt);
  const labs = withResults.map((entry, index): LabScore => {
    const result = results[index];
    const z = zScore(result, assignedValue, sigmaPt);
    const zPrime = uncertaintyNegligible ? null : zPrimeScore(result, assignedValue, sigmaPt, assignedUncertainty);
    const zeta =
      entry.uncertainty != null && entry.uncertainty > 0
        ? zetaScore(result, entry.uncertainty, assignedValue, assignedUncertainty)
        : null;
    const score = zPrime ?? z;
    return {
      labCode: entry.labCode,
      result,
      z,
      zPrime,
      zeta,
      scoreKind: zPrime === null ? "z" : "z′",
      score,
      verdict: interpretScore(score),
      zetaVerdict: zeta === null ? null : interpretScore(zeta),
    };
  });
  return {
    assignedValue,
    assignedUncertainty,
    assignedMethod: assigned.method,
    sigmaPt,
    sigmaMethod: sigma.method,
    robust,
    uncertaintyNegligible,
    labs,
  };
}
