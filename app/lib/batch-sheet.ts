/**
 * The lab's batch sheet from its inputs, computed the same way on the server
 * (for the stored sheet) and in the browser (while the analyst types).
 */
import { batchSheet, type Constituent, isAggregate, suggestBatchVolume } from "~/lib/batching";

export type BatchSheetView = ReturnType<typeof computeBatchSheet>;

/**
 * The suggested volume (one specimen per replicate) and, once every aggregate
 * has the day's moisture content, the sheet for the chosen volume.
 * Moisture contents are keyed by the constituent's id, as stored.
 */
export function computeBatchSheet(
  design: { name: string; constituents: Constituent[] },
  constituentIds: number[],
  replicates: number,
  inputs: { batchVolumeM3: number | null; moistureByConstituentId: Record<string, number> },
) {
  const suggestion = suggestBatchVolume({ specimens: replicates });
  const volume = inputs.batchVolumeM3 ?? suggestion.volumeM3;
  const moistureByIndex: Record<number, number> = {};
  const missingMoisture: string[] = [];
  design.constituents.forEach((c, index) => {
    if (!isAggregate(c)) return;
    const mc = inputs.moistureByConstituentId[String(constituentIds[index])];
    if (mc === undefined) missingMoisture.push(c.name);
    else moistureByIndex[index] = mc;
  });
  const sheet = missingMoisture.length === 0 ? batchSheet(design, { batchVolumeM3: volume, moistureContentPercent: moistureByIndex }) : null;
  return { suggestion, batchVolumeM3: volume, missingMoisture, sheet };
}
