/**
 * The lab's batch sheet from its inputs, computed the same way on the server
 * (for the stored sheet) and in the browser (while the analyst types).
 */
import { batchSheet, type Constituent, isAggregate, splitIntoMixes, suggestBatchVolume } from "~/lib/batching";

export type BatchSheetView = ReturnType<typeof computeBatchSheet>;

/** What the study says about one specimen of its test method; null until the coordinator sets it. */
export interface SpecimenPlan {
  replicatesPerCell: number;
  specimenVolumeM3: number | null;
  wastePercent: number | null;
}

export interface BatchSheetInputs {
  batchVolumeM3: number | null;
  moistureByConstituentId: Record<string, number>;
  mixerCapacityM3: number | null;
}

/**
 * The suggested volume (one specimen per replicate, from the study's specimen
 * volume and waste allowance) and, once every aggregate has the day's moisture
 * content, the sheet for the chosen volume, split into equal mixes that fit
 * the lab's mixer. Moisture contents are keyed by the constituent's id, as stored.
 */
export function computeBatchSheet(design: { name: string; constituents: Constituent[] }, constituentIds: number[], plan: SpecimenPlan, inputs: BatchSheetInputs) {
  const suggestion =
    plan.specimenVolumeM3 === null
      ? null
      : suggestBatchVolume({ specimens: plan.replicatesPerCell, specimenVolumeM3: plan.specimenVolumeM3, ...(plan.wastePercent === null ? {} : { wasteFraction: plan.wastePercent / 100 }) });
  const volume = inputs.batchVolumeM3 ?? suggestion?.volumeM3 ?? null;
  const moistureByIndex: Record<number, number> = {};
  const missingMoisture: string[] = [];
  design.constituents.forEach((c, index) => {
    if (!isAggregate(c)) return;
    const mc = inputs.moistureByConstituentId[String(constituentIds[index])];
    if (mc === undefined) missingMoisture.push(c.name);
    else moistureByIndex[index] = mc;
  });
  const sheet = volume !== null && missingMoisture.length === 0 ? batchSheet(design, { batchVolumeM3: volume, moistureContentPercent: moistureByIndex }) : null;
  const split = volume === null ? null : splitIntoMixes(volume, inputs.mixerCapacityM3);
  return { suggestion, batchVolumeM3: volume, missingMoisture, sheet, split };
}
