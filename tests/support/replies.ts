/**
 * Reads an action's answer the way the page does: the first error beside each
 * field and the values as typed (Conform's reply), or the confirmation that
 * travels with a redirect.
 */
import { takeToast } from "~/server/toast.server";
import type { RouteOutcome } from "./routes";

type Reply = { error?: Record<string, string[] | null> | null; initialValue?: Record<string, unknown> | null };

/** The first message per field of a refused form ("form" for refusals of the whole form). */
export function errorsOf(outcome: RouteOutcome): Record<string, string | undefined> {
  const reply = outcome.data?.result as Reply | undefined;
  return Object.fromEntries(Object.entries(reply?.error ?? {}).map(([field, messages]) => [field, messages?.[0]]));
}

/** What was typed into a refused form. */
export function valuesOf(outcome: RouteOutcome): Record<string, unknown> {
  return (outcome.data?.result as Reply | undefined)?.initialValue ?? {};
}

/** The confirmation a redirect carries to the next page, or null. */
export async function toastOf(outcome: RouteOutcome) {
  const setCookie = outcome.headers.get("Set-Cookie");
  if (!setCookie) return null;
  const { toast } = await takeToast(new Request("http://ringbatch.test/", { headers: { Cookie: setCookie.split(";")[0]! } }));
  return toast?.message ?? null;
}

/** An action's outcome with its refusal and its confirmation read out, as the page shows them. */
export async function readReply(outcome: RouteOutcome) {
  return { ...outcome, errors: errorsOf(outcome), values: valuesOf(outcome), done: await toastOf(outcome) };
}
