/**
 * Dates that cannot be true: a receipt in the future or before the shipment
 * left, a test before the materials arrived or in the future. ISO dates
 * (YYYY-MM-DD) compare correctly as text. `today` is the server's date; a lab
 * one time zone ahead may already be on the next day, so one day of slack.
 */
import { formatDate } from "~/lib/format";

function dayAfter(isoDay: string) {
  const next = new Date(`${isoDay}T00:00:00Z`);
  next.setUTCDate(next.getUTCDate() + 1);
  return next.toISOString().slice(0, 10);
}

export function receiptDateProblem(receivedOn: string, { shippedOn, today }: { shippedOn: string | null; today: string }): string | null {
  if (receivedOn > dayAfter(today)) return "The date of receipt is in the future.";
  if (shippedOn && receivedOn < shippedOn) return `The materials left on ${formatDate(shippedOn)}; they cannot have arrived before that.`;
  return null;
}

export function testDateProblem(testedOn: string, { receivedOn }: { receivedOn: string | null }): string | null {
  if (receivedOn && testedOn < receivedOn) return `Your lab received the materials on ${formatDate(receivedOn)}; a test cannot be dated before that.`;
  return null;
}
