import { consistencyTails, type SignificanceLevel } from "./significance";

const PERCENT: Record<SignificanceLevel, string> = { 0.005: "0.5 %", 0.01: "1 %", 0.05: "5 %" };

/**
 * What the significance choice changes, in words: only the h and k critical
 * values. ASTM E691's 0.5 % takes h from Student's t at 0.995 and k from F at
 * 0.995; ISO 5725-2's α takes h from the two-sided t (1 − α/2) and k from F at
 * 1 − α. Cochran and Grubbs are always judged at 5 % (straggler) and 1 % (outlier).
 */
export function significanceDescription(alpha: SignificanceLevel): string {
  const tails = consistencyTails(alpha);
  const practice = alpha === 0.005 ? "ASTM E691's 0.5 % level" : `ISO 5725-2's ${PERCENT[alpha]} level`;
  const hRule =
    alpha === 0.005
      ? "h critical values use Student's t at 0.995 (p − 2 degrees of freedom), applied on both sides (0.5 % in each tail)"
      : `h critical values use the two-sided Student's t at ${1 - tails.h} (α/2 in each tail, p − 2 degrees of freedom)`;
  return (
    `${practice}: ${hRule}; k critical values use the F quantile at ${1 - tails.k} with (n − 1, (p − 1)(n − 1)) degrees of freedom. ` +
    "The choice changes nothing else: Cochran's and Grubbs' tests are always judged at 5 % (straggler) and 1 % (outlier)."
  );
}
