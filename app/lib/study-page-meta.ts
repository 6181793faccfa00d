/**
 * The browser tab's title of a study's page, "Results — FF-2026-A · Ringbatch":
 * the page's name and the study code its parent route loaded.
 */
type MetaMatch = { data?: unknown } | undefined;

export function studyPageMeta(pageTitle: string, matches: readonly MetaMatch[]) {
  const code = matches.map((match) => (match?.data as { study?: { code?: string } } | undefined)?.study?.code).findLast((found) => found !== undefined);
  return [{ title: `${pageTitle} — ${code ?? "Study"} · Ringbatch` }];
}
