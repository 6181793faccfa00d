/**
 * Download links for a study's results or analysis tables, as CSV and as a
 * spreadsheet. The files come from the API with the page's own sign-in, so
 * they hold what the reader's role may see (lab codes only for reviewers).
 */
const LABEL = { results: "Results", analysis: "Analysis tables" } as const;

export function StudyDownloads({ studyId, what, query = "" }: { studyId: number; what: keyof typeof LABEL; query?: string }) {
  const base = `/api/v1/studies/${studyId}/${what}`;
  const link = "inline-flex min-h-11 items-center font-semibold text-basalt-700 underline";
  return (
    <p className="mb-2 flex flex-wrap items-center gap-x-3 text-sm">
      <span className="text-basalt-700">Download {LABEL[what].toLowerCase()}:</span>
      <a href={`${base}.xlsx${query}`} download className={link}>
        <span className="sr-only">{LABEL[what]} as </span>spreadsheet (.xlsx)
      </a>
      <a href={`${base}.csv${query}`} download className={link}>
        <span className="sr-only">{LABEL[what]} as </span>CSV
      </a>
    </p>
  );
}
