/**
 * The demo scenario — entirely fictional. A state-level paving consortium runs
 * a finishability study of four paving mixtures in eight labs. Every name,
 * address and number here is invented.
 */
import { DEMO_ADMIN_EMAIL } from "../app/lib/demo";
import { startingPackingList } from "../app/lib/packing-list";

export const DEMO_PASSWORD = "ringbatch-demo";

export const DEMO_LABS = [
  { name: "Quarrow County Materials Lab", address: "14 Kiln Road, Quarrow", accreditationNumber: "QA-4410" },
  { name: "Tessel Ready-Mix QC", address: "201 Batchplant Way, Lower Tessel", accreditationNumber: "QA-5172" },
  { name: "Vantoller Testing Services", address: "9 Ashgrove Court, Vantoller", accreditationNumber: "QA-3095" },
  { name: "Ostrade Highway District Lab", address: "77 Depot Street, Ostrade", accreditationNumber: "QA-6238" },
  { name: "Brimmel Aggregates Quality Lab", address: "3 Pit Lane, Brimmel Falls", accreditationNumber: "QA-2851" },
  { name: "Corvane Engineering Testing", address: "450 Survey Avenue, Corvane", accreditationNumber: "QA-7764" },
  { name: "Halloway Polytechnic Concrete Lab", address: "Building C, Halloway Polytechnic", accreditationNumber: "QA-1987" },
  { name: "Pellinor Inspection Works", address: "12 Gauge Row, Pellinor", accreditationNumber: "QA-8320" },
] as const;

export const DEMO_PEOPLE = {
  admin: { email: DEMO_ADMIN_EMAIL, name: "Ines Marwick" },
  coordinator: { email: "coordinator@ringbatch.example", name: "Dr. Talia Brennock" },
  analysts: [
    "Omar Feldane",
    "Priya Castellow",
    "Joaquin Merrivale",
    "Hanne Oduya",
    "Sefton Raleigh-Ng",
    "Mireille Akande",
    "Bo Lindqvar",
    "Rosalind Quennel",
  ].map((name, i) => ({ email: `analyst${i + 1}@ringbatch.example`, name })),
  reviewers: ["Aurelio Danforth", "Wren Kasimova", "Dagny Oyelaran"].map((name, i) => ({
    email: `reviewer${i + 1}@ringbatch.example`,
    name,
  })),
};

type Constituent = {
  kind: "cement" | "scm" | "water" | "coarse_aggregate" | "fine_aggregate" | "admixture" | "fiber" | "air";
  name: string;
  lot?: string;
  ssdMassKgPerM3?: number;
  relativeDensity?: number;
  absorptionPercent?: number;
  dosageMlPer100Kg?: number;
  volumeFractionPercent?: number;
  fiberDensityKgPerM3?: number;
  airContentPercent?: number;
};

const cement = (kg: number): Constituent => ({ kind: "cement", name: "Portland cement Type I/II", lot: "C-2611", ssdMassKgPerM3: kg, relativeDensity: 3.15 });
const water = (kg: number): Constituent => ({ kind: "water", name: "Batch water", ssdMassKgPerM3: kg, relativeDensity: 1.0 });
const coarse: Constituent = { kind: "coarse_aggregate", name: "Crushed limestone 25 mm", lot: "G-0418", ssdMassKgPerM3: 1100, relativeDensity: 2.7, absorptionPercent: 0.8 };
const naturalSand = (kg: number): Constituent => ({ kind: "fine_aggregate", name: "Natural river sand", lot: "S-0993", ssdMassKgPerM3: kg, relativeDensity: 2.63, absorptionPercent: 1.2 });
const air: Constituent = { kind: "air", name: "Entrained air (design)", airContentPercent: 6 };
const waterReducer: Constituent = { kind: "admixture", name: "Mid-range water reducer", lot: "A-7720", dosageMlPer100Kg: 300 };
const airEntrainer: Constituent = { kind: "admixture", name: "Air-entraining admixture", lot: "A-1184", dosageMlPer100Kg: 45 };

/** Mixture designs per m³ (SSD); each closes to 1.000 m³ by absolute volume within ±0.5 %. */
export const DEMO_MATERIALS: { code: string; description: string; constituents: Constituent[] }[] = [
  {
    code: "M1",
    description: "Reference paving mix: portland cement only, natural sand, w/cm 0.45",
    constituents: [cement(335), water(150), coarse, naturalSand(727), air, waterReducer, airEntrainer],
  },
  {
    code: "M2",
    description: "Fly ash variant: 20 % Class F fly ash, w/cm 0.44",
    constituents: [
      cement(268),
      { kind: "scm", name: "Class F fly ash", lot: "F-3302", ssdMassKgPerM3: 67, relativeDensity: 2.35 },
      water(148),
      coarse,
      naturalSand(713),
      air,
      waterReducer,
      airEntrainer,
    ],
  },
  {
    code: "M3",
    description: "Slag variant: 35 % slag cement, w/cm 0.45",
    constituents: [
      cement(218),
      { kind: "scm", name: "Slag cement Grade 100", lot: "K-5519", ssdMassKgPerM3: 117, relativeDensity: 2.9 },
      water(150),
      coarse,
      naturalSand(718),
      air,
      waterReducer,
      airEntrainer,
    ],
  },
  {
    code: "M4",
    description: "Sand blend variant: half natural, half manufactured sand, w/cm 0.45",
    constituents: [
      cement(335),
      water(150),
      coarse,
      naturalSand(363),
      { kind: "fine_aggregate", name: "Manufactured limestone sand", lot: "S-2240", ssdMassKgPerM3: 370, relativeDensity: 2.68, absorptionPercent: 1.8 },
      air,
      waterReducer,
      airEntrainer,
    ],
  },
];

/**
 * An overlay mixture: its cementitious materials, water and sand per m³, with
 * the 12.5 mm stone, 0.5 % macro-fiber, 6 % air and admixtures they all share.
 */
function overlayConstituents(cementitious: Constituent[], waterKg: number, sandKg: number): Constituent[] {
  return [
    ...cementitious,
    water(waterKg),
    { ...coarse, name: "Crushed limestone 12.5 mm", ssdMassKgPerM3: 950 },
    naturalSand(sandKg),
    { kind: "fiber", name: "Polypropylene macro-fiber", lot: "P-0601", volumeFractionPercent: 0.5, fiberDensityKgPerM3: 910 },
    { ...air, airContentPercent: 6 },
    waterReducer,
    airEntrainer,
  ];
}

const flyAsh: Constituent = { kind: "scm", name: "Class F fly ash", lot: "F-3302", ssdMassKgPerM3: 97, relativeDensity: 2.35 };

/** The second study's overlay mixtures carry fibers. */
export const DEMO_OVERLAY_MATERIALS: typeof DEMO_MATERIALS = [
  {
    code: "F1",
    description: "Bonded overlay, 0.5 % polypropylene macro-fiber",
    constituents: overlayConstituents([cement(390)], 160, 770),
  },
  {
    code: "F2",
    description: "Bonded overlay, 0.5 % fiber with 25 % fly ash",
    constituents: overlayConstituents([cement(293), flyAsh], 158, 742),
  },
];

export const FLOAT_FINISHING_RESPONSES = [
  { key: "holes", name: "Passes to close the preformed holes", unit: "passes", kind: "count" as const, plausibleMin: 1, plausibleMax: 40 },
  { key: "surface", name: "Passes to reach the target surface", unit: "passes", kind: "count" as const, plausibleMin: 1, plausibleMax: 40 },
];

/** Small deterministic generator (mulberry32) so the demo is the same on every machine. */
export function generator(seed: number) {
  let state = seed >>> 0;
  return () => {
    state = (state + 0x6d2b79f5) >>> 0;
    let t = state;
    t = Math.imul(t ^ (t >>> 15), t | 1);
    t ^= t + Math.imul(t ^ (t >>> 7), t | 61);
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
  };
}

function normal(next: () => number) {
  return Math.sqrt(-2 * Math.log(1 - next())) * Math.cos(2 * Math.PI * next());
}

/** Typical pass counts of each mixture: the fly ash mix finishes easiest, the manufactured sand hardest. */
const BASE_PASSES: Record<string, { holes: number; surface: number }> = {
  M1: { holes: 8, surface: 14 },
  M2: { holes: 7, surface: 12 },
  M3: { holes: 9, surface: 15 },
  M4: { holes: 11, surface: 18 },
  F1: { holes: 10, surface: 17 },
  F2: { holes: 9, surface: 15 },
};

export type DemoResult = { labIndex: number; material: string; response: "holes" | "surface"; replicate: number; value: number };

/**
 * Replicate pass counts for every lab, material and response. Lab biases and
 * replicate scatter are about one pass; `plants` overwrites chosen cells.
 */
export function demoResults(materialCodes: string[], replicates: number, seed: number, plants: DemoResult[] = []) {
  const next = generator(seed);
  const out: DemoResult[] = [];
  for (let labIndex = 0; labIndex < DEMO_LABS.length; labIndex++) {
    for (const material of materialCodes) {
      for (const response of ["holes", "surface"] as const) {
        const labBias = 0.8 * normal(next);
        for (let replicate = 1; replicate <= replicates; replicate++) {
          const value = Math.max(1, Math.round(BASE_PASSES[material]![response] + labBias + 0.9 * normal(next)));
          out.push({ labIndex, material, response, replicate, value });
        }
      }
    }
  }
  for (const plant of plants) {
    const target = out.find(
      (r) => r.labIndex === plant.labIndex && r.material === plant.material && r.response === plant.response && r.replicate === plant.replicate,
    );
    if (target) target.value = plant.value;
  }
  return out;
}

/**
 * The checking study's planted problems:
 * - between-lab: Brimmel (lab index 4) needs far more passes on M2's target surface — an h flag;
 * - within-lab: Vantoller (lab index 2) scatters widely on M3's holes — a k flag.
 */
export const CHECKING_STUDY_PLANTS: DemoResult[] = [
  { labIndex: 4, material: "M2", response: "surface", replicate: 1, value: 19 },
  { labIndex: 4, material: "M2", response: "surface", replicate: 2, value: 20 },
  { labIndex: 4, material: "M2", response: "surface", replicate: 3, value: 19 },
  { labIndex: 2, material: "M3", response: "holes", replicate: 1, value: 5 },
  { labIndex: 2, material: "M3", response: "holes", replicate: 2, value: 9 },
  { labIndex: 2, material: "M3", response: "holes", replicate: 3, value: 15 },
];

export const CHECKING_STUDY_SEED = 20262;

/**
 * The demo's packing list for a set of materials: the constituent lots of
 * startingPackingList, with quantities for about 0.12 m³ of each mixture
 * (enough for the replicates and the fresh-property checks), solids in 25 kg
 * bags and admixtures in 1 L bottles. Fictional quantities for the demo only.
 */
export function demoPackingList(materials: { code: string; constituents: Constituent[] }[], cubicMetres = 0.12) {
  const perMaterial = (c: Constituent) =>
    c.kind === "admixture"
      ? ((c.dosageMlPer100Kg ?? 0) / 100) * 4 * cubicMetres // mL per 100 kg of about 400 kg/m³ cementitious, as litres
      : c.kind === "fiber"
        ? ((c.volumeFractionPercent ?? 0) / 100) * (c.fiberDensityKgPerM3 ?? 0) * cubicMetres
        : (c.ssdMassKgPerM3 ?? 0) * cubicMetres;
  const totals = new Map<string, number>();
  for (const m of materials) for (const c of m.constituents) totals.set(`${c.name}\u0000${c.lot ?? ""}`, (totals.get(`${c.name}\u0000${c.lot ?? ""}`) ?? 0) + perMaterial(c));
  const list = startingPackingList(materials.flatMap((m) => m.constituents.map((c) => ({ materialCode: m.code, kind: c.kind, name: c.name, lot: c.lot ?? "" }))));
  return list.map((line) => {
    const key = `${line.description.replace(/ \([^)]*\)$/, "")}\u0000${line.lot}`;
    const quantity = Math.max(1, Math.ceil(totals.get(key) ?? 1));
    return { description: line.description, unit: line.unit, lot: line.lot, quantity, containerCount: line.unit === "L" ? quantity : Math.ceil(quantity / 25) };
  });
}
