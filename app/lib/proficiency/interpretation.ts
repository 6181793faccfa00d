export const SCORE_VERDICTS = ["satisfactory", "questionable", "unsatisfactory"] as const;
export type ScoreVerdict = (typeof SCORE_VERDICTS)[number];

/**
 * ISO 13528:2022 9.4.1 and ISO/IEC 17043: |score| ≤ 2.0 satisfactory;
 * 2.0 < |score| < 3.0 questionable (a warning signal); |score| ≥ 3.0
 * unsatisfactory (an action signal). The same limits serve z, z′ and ζ.
 */
export function interpretScore(score: number): ScoreVerdict {
  const size = Math.abs(score);
  if (size <= 2) return "satisfactory";
  if (size < 3) return "questionable";
  return "unsatisfactory";
}

/** What a lab is expected to do after each verdict, in plain words. */
export const VERDICT_ADVICE: Record<ScoreVerdict, string> = {
  satisfactory: "No action needed. Keep the result on file as evidence of competence.",
  questionable:
    "A warning signal. Review the test record (batching, timing, operator, equipment) and watch the next round; two questionable scores in a row, or on both materials, call for a full investigation.",
  unsatisfactory:
    "An action signal. Investigate the cause (calculation, transcription, procedure, equipment, operator), correct it, check that the correction works, and record the investigation as your quality system requires.",
};
