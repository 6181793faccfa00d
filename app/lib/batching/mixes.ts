import type { ConstituentKind } from "./types";

export interface MixSplit {
  /** How many equal mixes the batch takes. */
  mixes: number;
  /** Concrete per mix, m³. */
  volumePerMixM3: number;
  /** Each batch quantity is multiplied by this to give one mix's quantity (1 / mixes). */
  fractionPerMix: number;
}

/**
 * Splits a batch into the fewest equal mixes that each fit the mixer:
 * mixes = ⌈V / capacity⌉, each V / mixes. Without a capacity the batch is one mix.
 */
export function splitIntoMixes(batchVolumeM3: number, mixerCapacityM3: number | null): MixSplit {
  if (!(batchVolumeM3 > 0)) throw new RangeError("The batch volume must be above 0");
  if (mixerCapacityM3 !== null && !(mixerCapacityM3 > 0)) throw new RangeError("The mixer capacity must be above 0");
  // A hair of tolerance so 0.15 / 0.05 (2.9999999999999996 or 3.0000000000000004 in floating point) is three mixes, not four.
  const mixes = mixerCapacityM3 === null ? 1 : Math.max(1, Math.ceil(batchVolumeM3 / mixerCapacityM3 - 1e-9));
  return { mixes, volumePerMixM3: batchVolumeM3 / mixes, fractionPerMix: 1 / mixes };
}

/**
 * The order of charging a laboratory mixer, for the constituent kinds the
 * mixture has. Common practice for laboratory mixing, following the order of
 * ASTM C192 for machine mixing (from memory): coarse aggregate, some of the
 * water and the admixture solution before the mixer turns; then, with it
 * running, fine aggregate, cement and the rest of the water; mix 3 minutes,
 * rest 3 minutes covered, mix 2 minutes more. Fibers go in with the
 * aggregates (common practice), so they spread before the paste forms.
 */
export function mixingSequence(kinds: readonly ConstituentKind[]): string[] {
  const has = (kind: ConstituentKind) => kinds.includes(kind);
  const steps = ["Butter the mixer with a little mortar of the same mixture, or wet it and let it drain, so it does not rob the first mix of paste."];
  const first = [has("coarse_aggregate") && "the coarse aggregate", has("fiber") && "the fibers", has("water") && "about a third of the water", has("admixture") && "the admixture, in that water"].filter(Boolean);
  if (first.length > 0) steps.push(`With the mixer stopped, add ${listed(first as string[])}.`);
  const running = [has("fine_aggregate") && "the fine aggregate", has("cement") && "the cement", has("scm") && "the supplementary cementitious materials", has("water") && "the rest of the water"].filter(Boolean);
  if (running.length > 0) steps.push(`Start the mixer; add ${listed(running as string[])}.`);
  steps.push("Mix 3 minutes once everything is in, rest 3 minutes with the mixer covered, then mix 2 minutes more.");
  steps.push("Discharge into a clean, damp pan; remix by hand or shovel so the batch is uniform, then take the fresh-property tests first.");
  return steps;
}

function listed(items: string[]): string {
  if (items.length <= 1) return items.join("");
  return `${items.slice(0, -1).join(", ")} and ${items.at(-1)}`;
}
