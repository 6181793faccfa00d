/**
 * The browser tab's title of a study's page, "Results — FF-2026-A · Ringbatch":
 * the page's name and the study code its parent route loaded.
 */
type MetaMatch = { data?: unknown } | undefined;
type FrameData = { study?: { code?: string }; round?: { code?: string } } | undefined;

/** Proficiency rounds' parents load the study as `round`. */
export function studyPageMeta(pageTitle: string, matches: readonly MetaMatch[]) {
  const code = matches
    .map((match) => {
      const data = match?.data as FrameData;
      return data?.study?.code ?? data?.round?.code;
    })
    .findLast((found) => found !== undefined);
  return [{ title: `${pageTitle} — ${code ?? "Study"} · Ringbatch` }];
}
