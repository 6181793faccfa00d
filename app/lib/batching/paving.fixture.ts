import type { MixtureDesign } from "./types";

/**
 * An invented paving mixture (not a real supplier's design), per m³, SSD
 * basis. Values are typical of the trade so the hand arithmetic in the
 * tests reads like a real check.
 */
export const inventedPavingMix: MixtureDesign = {
  name: "Reference paving mix (invented)",
  constituents: [
    {
      kind: "cement",
      name: "Type I/II portland cement",
      lot: "C-24-117",
      ssdMassKgPerM3: 280,
      relativeDensity: 3.15,
    },
    {
      kind: "scm",
      name: "Class F fly ash",
      lot: "FA-0932",
      ssdMassKgPerM3: 70,
      relativeDensity: 2.5,
    },
    { kind: "water", name: "Potable water", ssdMassKgPerM3: 140, relativeDensity: 1 },
    {
      kind: "coarse_aggregate",
      name: "No. 57 crushed limestone",
      lot: "CA-7",
      ssdMassKgPerM3: 1100,
      relativeDensity: 2.7,
      absorptionPercent: 0.8,
    },
    {
      kind: "fine_aggregate",
      name: "Natural concrete sand",
      lot: "FA-3",
      ssdMassKgPerM3: 720,
      relativeDensity: 2.62,
      absorptionPercent: 1.2,
    },
    { kind: "admixture", name: "Air-entraining admixture", dosagePer100kgCementitious: 30 },
    { kind: "admixture", name: "Water-reducing admixture", dosagePer100kgCementitious: 300 },
    { kind: "air", name: "Air", airContentPercent: 6 },
  ],
};
