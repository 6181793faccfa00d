import Papa from "papaparse";
import { useMemo, useState } from "react";
import { data, Form, Link, useNavigation } from "react-router";
import type { Route } from "./+types/import";
import { Button, Card, Notice, PageHeader, SimpleTable } from "~/components/ui";
import { requireStudy } from "~/server/study-context.server";
import { decodeCsvText, IMPORT_MAX_BYTES, OPTIONAL_COLUMNS, parseImportCsv, recordsToRows, REQUIRED_COLUMNS } from "~/lib/results/import-csv";
import { resolveResultRows, type ResultInputRow, type RowProblem } from "~/lib/results/rows";
import { importFrame, importResults, ResultsError } from "~/models/results.server";
import { readUploadForm } from "~/server/upload-form.server";

export const meta: Route.MetaFunction = () => [{ title: "Import results · Ringbatch" }];

export async function loader({ context }: Route.LoaderArgs) {
  const { enrollment } = requireStudy(context, ["analyst"]);
  const { study, ...frame } = await importFrame(enrollment!);
  return { study: { id: study.id, code: study.code, editable: study.state === "testing" }, labCode: enrollment!.labCode, frame };
}

type ImportReply = { imported?: number; fileError?: string; fileProblems?: string[]; problems?: RowProblem[] };

const TOO_LARGE = `The file is larger than ${IMPORT_MAX_BYTES / 1024 / 1024} MB; split it into smaller files.`;

export async function action({ request, context }: Route.ActionArgs): Promise<ImportReply | ReturnType<typeof data<ImportReply>>> {
  const { user, enrollment } = requireStudy(context, ["analyst"]);
  const upload = await readUploadForm(request, "file", IMPORT_MAX_BYTES);
  if (upload.tooLarge) return data({ fileError: TOO_LARGE }, { status: 413 });
  const file = upload.formData.get("file");
  if (!(file instanceof File) || (file.size === 0 && file.name === "")) return data({ fileError: "Choose a CSV file." }, { status: 400 });
  if (file.size === 0) return data({ fileError: "The file is empty." }, { status: 400 });
  const text = decodeCsvText(new Uint8Array(await file.arrayBuffer()));
  if (!text.ok) return data({ fileError: text.message }, { status: 400 });
  const parsed = parseImportCsv(text.text);
  if (parsed.fileProblems.length > 0) return data({ fileProblems: parsed.fileProblems }, { status: 400 });
  try {
    const outcome = await importResults(enrollment!, parsed.rows, user, file.name);
    return outcome.ok ? { imported: outcome.imported } : data({ problems: outcome.problems }, { status: 400 });
  } catch (error) {
    if (error instanceof ResultsError) return data({ fileError: error.message }, { status: 409 });
    throw error;
  }
}

const PREVIEW_ROWS = 100;

export default function ImportResults({ loaderData, actionData }: Route.ComponentProps) {
  const { study, frame } = loaderData;
  const reply = actionData as ImportReply | undefined;
  const navigation = useNavigation();
  const [fileError, setFileError] = useState<string | null>(null);
  const [progress, setProgress] = useState<number | null>(null);
  const [parsed, setParsed] = useState<{ rows: ResultInputRow[]; fileProblems: string[] } | null>(null);

  const preview = useMemo(() => {
    if (!parsed) return null;
    const { problems } = resolveResultRows({ ...frame, submittedCells: new Set(frame.submittedCells) }, parsed.rows, { valueRequired: true });
    return { problems, byRow: new Map(problems.map((p) => [p.row, p.message])) };
  }, [parsed, frame]);

  const readFile = async (file: File | undefined) => {
    setParsed(null);
    setFileError(null);
    if (!file) return;
    if (file.size > IMPORT_MAX_BYTES) {
      setFileError(TOO_LARGE);
      return;
    }
    // The same check of the encoding as on submit, so a Latin-1 export is caught before the preview.
    const decoded = decodeCsvText(new Uint8Array(await file.arrayBuffer()));
    if (!decoded.ok) {
      setFileError(decoded.message);
      return;
    }
    const records: string[][] = [];
    setProgress(0);
    Papa.parse<string[]>(file, {
      delimiter: ",",
      chunkSize: 64 * 1024,
      chunk: (chunk) => {
        records.push(...chunk.data);
        setProgress(Math.min(1, chunk.meta.cursor / file.size));
      },
      complete: () => {
        setProgress(1);
        setParsed(recordsToRows(records));
      },
      error: () => setFileError("The file could not be read."),
    });
  };

  const serverProblems = reply?.problems ?? [];
  const shownRows = parsed ? [...parsed.rows.filter((r) => preview?.byRow.has(r.row!)), ...parsed.rows.filter((r) => !preview?.byRow.has(r.row!))].slice(0, PREVIEW_ROWS) : [];
  const blocked = !parsed || parsed.rows.length === 0 || parsed.fileProblems.length > 0 || (preview?.problems.length ?? 0) > 0;
  const errorText = fileError ?? reply?.fileError;

  return (
    <>
      <PageHeader
        title="Import results from CSV"
        subtitle={`${study.code} · your lab code ${loaderData.labCode ?? "—"}`}
        actions={
          <Link to={`/lab/studies/${study.id}`} className="inline-flex min-h-11 items-center font-semibold text-basalt-700 underline">
            Back to the study
          </Link>
        }
      />
      <div className="grid gap-6 [&>*]:min-w-0">
        <Card title="The file">
          <p className="mb-2">
            One row per replicate result, with a header row: <code className="rounded bg-basalt-100 px-1">{REQUIRED_COLUMNS.join(",")}</code>, and if you like{" "}
            <code className="rounded bg-basalt-100 px-1">{OPTIONAL_COLUMNS.join(",")}</code> (test date as YYYY-MM-DD); no other columns. Save it as CSV UTF-8, at most 2 MB. Materials:{" "}
            {frame.materials.map((m) => m.code).join(", ")}; responses: {frame.responses.map((r) => r.key).join(", ")}; replicates 1 to {frame.replicatesPerCell}.
          </p>
          <p className="mb-4 text-basalt-700">All rows are imported together, or none: a file with a problem in any row changes nothing. Results already submitted are changed only by amendments.</p>
          {reply?.imported !== undefined && <Notice tone="success">Imported {reply.imported} results as drafts. Check them on each material's result page, then submit.</Notice>}
          {!study.editable && <Notice>Results can be imported only while the study is in testing.</Notice>}
          <Form method="post" encType="multipart/form-data" className="mt-3 grid gap-3">
            <div className="flex flex-col gap-1">
              <label htmlFor="import-file" className="font-semibold text-basalt-800">
                Results file (CSV)
              </label>
              <input
                id="import-file"
                name="file"
                type="file"
                accept=".csv,text/csv"
                required
                aria-invalid={errorText ? true : undefined}
                aria-describedby={errorText ? "import-file-error" : undefined}
                onChange={(e) => readFile(e.target.files?.[0])}
              />
              {errorText && (
                <p id="import-file-error" className="text-sm font-semibold text-signal-700">
                  {errorText}
                </p>
              )}
            </div>
            {progress !== null && progress < 1 && (
              <div>
                <label htmlFor="import-progress" className="text-sm">
                  Reading the file
                </label>
                <progress id="import-progress" className="h-3 w-full" max={1} value={progress} />
              </div>
            )}
            <div>
              <Button type="submit" disabled={!study.editable || navigation.state !== "idle" || (parsed !== null && blocked)}>
                {navigation.state === "submitting" ? "Importing…" : parsed ? `Import ${parsed.rows.length} rows` : "Import"}
              </Button>
            </div>
          </Form>
        </Card>

        {(reply?.fileProblems || serverProblems.length > 0) && (
          <Notice tone="error">
            <p className="font-semibold">Nothing was imported.</p>
            <ul className="ml-5 list-disc">
              {reply?.fileProblems?.map((p) => <li key={p}>{p}</li>)}
              {serverProblems.slice(0, 50).map((p) => (
                <li key={`${p.row}-${p.field}`}>
                  Row {p.row}: {p.message}
                </li>
              ))}
            </ul>
          </Notice>
        )}

        {parsed && preview && (
          <Card title="Preview">
            <p className="mb-3" role="status">
              {parsed.rows.length} rows read; {preview.problems.length === 0 && parsed.fileProblems.length === 0 ? "no problems found." : `${preview.problems.length + parsed.fileProblems.length} with problems — fix the file and choose it again.`}
            </p>
            {parsed.fileProblems.length > 0 && (
              <ul className="mb-3 ml-5 list-disc text-signal-700">
                {parsed.fileProblems.map((p) => (
                  <li key={p}>{p}</li>
                ))}
              </ul>
            )}
            <SimpleTable
              caption="Rows of the file, those with problems first"
              headers={["Row", "Material", "Response", "Replicate", "Value", "Test date", "Operator", "Problem"]}
              rows={shownRows.map((r) => [
                r.row,
                r.material,
                r.response,
                r.replicate,
                r.value,
                r.testedOn ?? "",
                r.operator ?? "",
                preview.byRow.has(r.row!) ? (
                  <span key="p" className="font-semibold text-signal-700">
                    {preview.byRow.get(r.row!)}
                  </span>
                ) : (
                  "—"
                ),
              ])}
            />
            {parsed.rows.length > PREVIEW_ROWS && <p className="mt-2 text-basalt-700">Showing {PREVIEW_ROWS} of {parsed.rows.length} rows.</p>}
          </Card>
        )}
      </div>
    </>
  );
}
