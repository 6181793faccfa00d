/**
 * The batch sheet's inputs: the batch volume and today's moisture content of
 * each aggregate. One schema per mixture (its aggregates name the fields),
 * checked in the browser as typed and again by the action.
 */
import { z } from "zod";
import { parsePlainNumber } from "./values";

// Wide bounds of a laboratory batch and of stockpile moisture (common practice); they catch unit slips.
export const MAX_BATCH_M3 = 3;
export const MAX_MOISTURE_PERCENT = 30;

export const moistureField = (constituentId: number | string) => `moisture-${constituentId}`;

/** A plain decimal within the bounds, or the message. */
function boundedNumber(message: string, accepts: (n: number) => boolean) {
  return z.string({ message }).transform((text, ctx) => {
    const n = parsePlainNumber(text);
    if (n === null || !accepts(n)) {
      ctx.addIssue({ code: "custom", message });
      return z.NEVER;
    }
    return n;
  });
}

export const batchVolumeAccepted = (m3: number) => m3 > 0 && m3 <= MAX_BATCH_M3;
export const moistureAccepted = (percent: number) => percent >= 0 && percent <= MAX_MOISTURE_PERCENT;

/** A lab mixer's usable capacity, m³: the same wide bounds as a batch. */
export const mixerCapacityAccepted = batchVolumeAccepted;

/** `batchVolume` in m³, `mixerCapacity` in m³ (blank: one mix), and one `moisture-<constituent id>` in % per aggregate. */
export function batchInputsSchema(aggregates: { id: number; name: string }[]) {
  const shape: Record<string, z.ZodType<number | undefined, string | undefined>> = {
    batchVolume: boundedNumber(`Enter the batch volume in m³, more than 0 and at most ${MAX_BATCH_M3}.`, batchVolumeAccepted),
    mixerCapacity: boundedNumber(`Enter your mixer's usable capacity in m³, more than 0 and at most ${MAX_BATCH_M3}, or leave it blank.`, mixerCapacityAccepted).optional(),
  };
  for (const a of aggregates) {
    shape[moistureField(a.id)] = boundedNumber(`Enter today's moisture content of ${a.name}, 0 to ${MAX_MOISTURE_PERCENT} % of oven-dry mass.`, moistureAccepted);
  }
  return z.object(shape);
}
