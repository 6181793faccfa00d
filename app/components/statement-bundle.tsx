/**
 * The recomputable bundle of a published statement: its download link and the
 * zip's SHA-256, read from the bundle summary once the page is shown.
 */
import { useEffect } from "react";
import { useFetcher } from "react-router";
import { Card } from "~/components/ui";

type BundleSummary = { sha256: string; fileName: string; bytes: number; download: string; files: { name: string; sha256: string }[] };

export function StatementBundle({ studyId }: { studyId: number }) {
  const fetcher = useFetcher<BundleSummary | { error: { message: string } }>();
  const summaryUrl = `/api/v1/studies/${studyId}/bundle`;
  useEffect(() => {
    if (fetcher.state === "idle" && !fetcher.data) fetcher.load(summaryUrl);
  }, [fetcher, summaryUrl]);
  const summary = fetcher.data;
  return (
    <Card title="Recomputable bundle">
      <p className="mb-2 text-basalt-700">
        The results (labs by code), the cell decisions with reasons, the design, the engine's settings and the figures as
        published, with a README on how each figure is computed and the command that recomputes them.
      </p>
      {!summary ? (
        <p className="text-basalt-700">Preparing the bundle…</p>
      ) : "error" in summary ? (
        <p className="text-signal-700">{summary.error.message}</p>
      ) : (
        <div className="flex flex-col gap-2">
          <a className="font-semibold text-basalt-800 underline" href={summary.download} download={summary.fileName}>
            Download {summary.fileName} ({Math.ceil(summary.bytes / 1024)} KB)
          </a>
          <p>
            SHA-256 of the zip: <code data-testid="bundle-sha256" className="break-all">{summary.sha256}</code>
          </p>
        </div>
      )}
    </Card>
  );
}
