/**
 * Study planner: how many labs and replicates a precision study needs, and what
 * that design costs each lab in concrete and constituents.
 *
 * Uncertainty: ISO 5725-1's A_r and A_R (σ_r within s_r·(1 ± A_r), σ_R within
 * s_R·(1 ± A_R), about 95 %) for a guessed γ = σ_R/σ_r. Cost: concrete per lab =
 * materials × replicates × specimen volume × (1 + waste), and the constituent
 * masses that volume takes, from the batching module's mixture designs.
 */
import {
  admixtureVolumeMl,
  DEFAULT_WASTE_FRACTION,
  FLOAT_FINISHING_SPECIMEN_M3,
  fiberMassKg,
  totalCementitiousKgPerM3,
  type Constituent,
} from "~/lib/batching";
import {
  ISO_RECOMMENDED_LABS,
  RECOMMENDED_LABS,
  RECOMMENDED_MATERIALS,
  RECOMMENDED_REPLICATES,
  repeatabilityUncertainty,
  reproducibilityUncertainty,
} from "~/lib/precision";

/** γ = σ_R/σ_r when nothing better is known (a common guess for concrete tests). */
export const DEFAULT_GAMMA = 2;
/** Target half-width of σ_R's uncertainty, as a fraction (±30 %). */
export const DEFAULT_TARGET_AR = 0.3;
/** The labs and replicates the table shows. */
export const PLANNER_LABS = [3, 6, 8, 10, 12, 15, 20, 25, 30, 40] as const;
export const PLANNER_REPLICATES = [2, 3, 4, 5] as const;
/** The search for the smallest design goes up to this many labs and replicates. */
const SEARCH_MAX_LABS = 100;
const SEARCH_MAX_REPLICATES = 10;

export interface PlanCell {
  labs: number;
  replicates: number;
  Ar: number;
  AR: number;
  /** A_R at or below the target */
  meetsTarget: boolean;
  /** at least 6 labs and 2 replicates (ASTM E691) */
  meetsMinimums: boolean;
}

export interface PlannedMaterial {
  code: string;
  constituents: readonly Constituent[];
}

export interface ConstituentAmount {
  name: string;
  kind: Constituent["kind"];
  /** kg, or mL for admixtures */
  amount: number;
  unit: "kg" | "mL";
}

export interface DesignCost {
  labs: number;
  replicates: number;
  materials: number;
  /** m³ of concrete per lab: materials × replicates × specimen volume × (1 + waste) */
  volumePerLabM3: number;
  /** the arithmetic on one line */
  volumeText: string;
  /** per constituent, what one lab needs (summed over the materials that use it) */
  perLab: ConstituentAmount[];
  /** per constituent, what the study ships in total (per lab × labs) */
  total: ConstituentAmount[];
}

export interface StudyPlan {
  gamma: number;
  targetAR: number;
  table: PlanCell[];
  /** the design with the fewest results per material (labs × replicates) that meets the target and the minimums; fewer labs on a tie */
  smallest: PlanCell | null;
  /** the practices' minimums, in words */
  minimums: string[];
}

function cell(labs: number, replicates: number, gamma: number, targetAR: number): PlanCell {
  const Ar = repeatabilityUncertainty(labs, replicates);
  const AR = reproducibilityUncertainty(labs, replicates, gamma);
  return { labs, replicates, Ar, AR, meetsTarget: AR <= targetAR, meetsMinimums: labs >= RECOMMENDED_LABS && replicates >= RECOMMENDED_REPLICATES };
}

/**
 * The planner's table of labs × replicates with A_r and A_R for a guessed
 * γ = σ_R/σ_r, and the smallest design meeting the target A_R and the
 * practices' minimums (searched up to 100 labs and 10 replicates).
 */
export function planStudy(input: { gamma?: number; targetAR?: number } = {}): StudyPlan {
  const gamma = input.gamma ?? DEFAULT_GAMMA;
  const targetAR = input.targetAR ?? DEFAULT_TARGET_AR;
  if (!(gamma >= 1 && Number.isFinite(gamma))) throw new RangeError(`γ = σ_R/σ_r must be at least 1, got ${gamma}`);
  if (!(targetAR > 0 && targetAR < 1)) throw new RangeError(`the target must lie between 0 and 1 (e.g. 0.3 for ±30 %), got ${targetAR}`);
  const table = PLANNER_LABS.flatMap((labs) => PLANNER_REPLICATES.map((replicates) => cell(labs, replicates, gamma, targetAR)));
  let smallest: PlanCell | null = null;
  for (let labs = RECOMMENDED_LABS; labs <= SEARCH_MAX_LABS; labs++) {
    for (let replicates = RECOMMENDED_REPLICATES; replicates <= SEARCH_MAX_REPLICATES; replicates++) {
      const candidate = cell(labs, replicates, gamma, targetAR);
      if (!candidate.meetsTarget) continue;
      const size = labs * replicates;
      const best = smallest === null ? Number.POSITIVE_INFINITY : smallest.labs * smallest.replicates;
      if (size < best || (size === best && smallest !== null && labs < smallest.labs)) smallest = candidate;
      break; // more replicates only cost more for these labs
    }
  }
  return {
    gamma,
    targetAR,
    table,
    smallest,
    minimums: [
      `ASTM E691: at least ${RECOMMENDED_LABS} labs (ISO 5725-1 recommends at least ${ISO_RECOMMENDED_LABS})`,
      `at least ${RECOMMENDED_MATERIALS} materials, better 5 or more, to see how precision depends on level`,
      `at least ${RECOMMENDED_REPLICATES} replicates per lab and material`,
    ],
  };
}

const round = (x: number, decimals: number) => Number(x.toFixed(decimals));

/**
 * What a design costs: concrete per lab = materials × replicates × specimen
 * volume × (1 + waste) (specimen volume and waste from the batching module),
 * and per constituent the SSD mass (fiber mass, admixture volume) that
 * concrete takes, per lab and for all labs. Materials without a design count
 * in the volume only.
 */
export function designCost(input: {
  labs: number;
  replicates: number;
  materials: readonly PlannedMaterial[] | number;
  specimenVolumeM3?: number;
  wasteFraction?: number;
}): DesignCost {
  const { labs, replicates, specimenVolumeM3 = FLOAT_FINISHING_SPECIMEN_M3, wasteFraction = DEFAULT_WASTE_FRACTION } = input;
  const designs = typeof input.materials === "number" ? [] : input.materials;
  const materials = typeof input.materials === "number" ? input.materials : input.materials.length;
  const perMaterialM3 = replicates * specimenVolumeM3 * (1 + wasteFraction);
  const volumePerLabM3 = materials * perMaterialM3;
  const amounts = new Map<string, ConstituentAmount>();
  const add = (c: Constituent, amount: number, unit: "kg" | "mL") => {
    const key = `${c.kind}\u0000${c.name}`;
    const entry = amounts.get(key);
    if (entry) entry.amount += amount;
    else amounts.set(key, { name: c.name, kind: c.kind, amount, unit });
  };
  for (const design of designs) {
    const cementitious = totalCementitiousKgPerM3({ name: design.code, constituents: [...design.constituents] });
    for (const c of design.constituents) {
      switch (c.kind) {
        case "cement":
        case "scm":
        case "water":
        case "coarse_aggregate":
        case "fine_aggregate":
          add(c, c.ssdMassKgPerM3 * perMaterialM3, "kg");
          break;
        case "fiber":
          add(c, fiberMassKg(c.volumeFractionPercent, c.fiberDensity, perMaterialM3), "kg");
          break;
        case "admixture":
          add(c, admixtureVolumeMl(c.dosagePer100kgCementitious, cementitious * perMaterialM3), "mL");
          break;
        case "air":
          break;
      }
    }
  }
  const perLab = [...amounts.values()].map((a) => ({ ...a, amount: round(a.amount, 2) }));
  return {
    labs,
    replicates,
    materials,
    volumePerLabM3,
    volumeText: `${materials} materials × ${replicates} replicates × ${specimenVolumeM3} m³ × ${(1 + wasteFraction).toFixed(2)} = ${volumePerLabM3.toFixed(3)} m³ per lab`,
    perLab,
    total: [...amounts.values()].map((a) => ({ ...a, amount: round(a.amount * labs, 1) })),
  };
}

/**
 * γ = σ_R/σ_r from an earlier study of the same method: the median over its
 * computed groups of s_R/s_r (groups with s_r = 0 left out); null when none.
 */
export function gammaFromEarlierStudy(groups: readonly { status: string; sr?: number; sR?: number }[]): number | null {
  const ratios = groups
    .filter((g): g is { status: "computed"; sr: number; sR: number } => g.status === "computed" && (g.sr ?? 0) > 0)
    .map((g) => g.sR / g.sr)
    .sort((a, b) => a - b);
  if (ratios.length === 0) return null;
  const middle = Math.floor(ratios.length / 2);
  const median = ratios.length % 2 === 1 ? ratios[middle] : (ratios[middle - 1] + ratios[middle]) / 2;
  return Math.max(1, median);
}
