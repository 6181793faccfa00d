/**
 * Proficiency rounds of the demo consortium — entirely fictional. The
 * consortium's precision study of the float finishing test was published
 * (seed/toolkit-demo.ts), and it now runs rounds for twelve labs: the eight of the demo
 * studies and four more that joined for proficiency testing.
 */

export const ROUND_EXTRA_LABS = [
  { name: "Drummond Flats Materials Lab", address: "58 Levee Road, Drummond Flats", accreditationNumber: "QA-9013" },
  { name: "Kestrel Ridge Ready-Mix QC", address: "2 Silo Lane, Kestrel Ridge", accreditationNumber: "QA-4487" },
  { name: "Sallowmere Testing Cooperative", address: "31 Chainage Street, Sallowmere", accreditationNumber: "QA-6652" },
  { name: "Ardency Bridge Inspection Lab", address: "7 Girder Walk, Ardency", accreditationNumber: "QA-3349" },
] as const;

export const ROUND_EXTRA_ANALYSTS = ["Ilsa Marchetti-Obi", "Tobiah Grennan", "Kalinda Royce", "Mateus Vantwest"].map((name, i) => ({
  email: `analyst${i + 9}@ringbatch.example`,
  name,
}));

/** Results of the earlier round (autumn 2025), in which every lab scored satisfactory. */
export const PREVIOUS_ROUND_SEED = 2511;

export const ROUND_MATERIALS = [
  { code: "R1", description: "Reference paving mix (as M1 of the published study), lot PT26-1A" },
  { code: "R2", description: "Fly ash paving mix (as M2 of the published study), lot PT26-1B" },
];

/** Typical pass counts of the round materials. */
export const ROUND_BASE = { R1: { holes: 8, surface: 14 }, R2: { holes: 7, surface: 12 } } as const;

/**
 * The published round's planted results, by lab index (0–11):
 * - lab 9 (Kestrel Ridge Ready-Mix QC) needs far more passes on R1's target surface: an unsatisfactory score;
 * - lab 3 (Ostrade Highway District Lab) is a little high on R2's holes: a questionable score.
 */
export const PUBLISHED_ROUND_PLANTS = [
  { labIndex: 9, material: "R1", response: "surface", values: [21, 22] },
  { labIndex: 3, material: "R2", response: "holes", values: [9, 9] },
] as const;

/** Homogeneity results (10 samples × 2) before shipping, and stability results after testing, per material and response. */
export const ROUND_CHECKS: Record<string, { homogeneity: [number, number][]; stability: number[] }> = {
  "R1:holes": { homogeneity: [[8, 8], [7, 9], [8, 8], [9, 7], [8, 8], [8, 9], [8, 7], [8, 8], [7, 9], [8, 8]], stability: [8, 8, 8] },
  "R1:surface": { homogeneity: [[14, 14], [13, 15], [14, 14], [15, 13], [14, 14], [13, 15], [14, 14], [14, 15], [14, 13], [14, 14]], stability: [14, 14, 14] },
  "R2:holes": { homogeneity: [[7, 7], [6, 8], [7, 7], [8, 6], [7, 7], [7, 8], [7, 6], [7, 7], [6, 8], [7, 7]], stability: [7, 7, 7] },
  "R2:surface": { homogeneity: [[12, 12], [11, 13], [12, 12], [13, 11], [12, 12], [11, 13], [12, 12], [12, 13], [12, 11], [12, 12]], stability: [12, 12, 12] },
};
