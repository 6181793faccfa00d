import { getFormProps, type SubmissionResult } from "@conform-to/react";
import { parseWithZod } from "@conform-to/zod/v4";
import Papa from "papaparse";
import { useMemo, useState } from "react";
import { data, Form, useNavigation } from "react-router";
import { z } from "zod";
import type { Route } from "./+types/import";
import { formWideErrors, useSchemaForm } from "~/components/forms";
import type { StudyPageHandle } from "~/components/study-frame";
import { Button, Card, Notice, SimpleTable } from "~/components/ui";
import { decodeCsvText, IMPORT_MAX_BYTES, OPTIONAL_COLUMNS, parseImportCsv, recordsToRows, REQUIRED_COLUMNS } from "~/lib/results/import-csv";
import { resolveResultRows, type ResultInputRow, type RowProblem } from "~/lib/results/rows";
import { studyPageMeta } from "~/lib/study-page-meta";
import { countOf } from "~/lib/format";
import { importFrame, importResults, ResultsError } from "~/models/results.server";
import { requireStudy } from "~/server/study-context.server";
import { readUploadForm } from "~/server/upload-form.server";
import { redirectWithToast } from "~/server/toast.server";

export const handle = { pageTitle: "Import" } satisfies StudyPageHandle;

export const meta: Route.MetaFunction = ({ matches }) => studyPageMeta("Import", matches);

export async function loader({ context }: Route.LoaderArgs) {
  const { study, enrollment } = requireStudy(context, ["analyst"]);
  const { study: _study, ...frame } = await importFrame(enrollment!);
  return { study: { id: study.id, editable: study.state === "testing" }, frame };
}

const TOO_LARGE = `The file is larger than ${IMPORT_MAX_BYTES / 1024 / 1024} MB; split it into smaller files.`;

// An empty file input arrives as no value at all.
const importSchema = z.object({ file: z.instanceof(File, { message: "Choose a CSV file." }) });

/** What the page shows of a refused file: the reply beside the file field, and the file's problems listed below it. */
type ImportRefusal = { result: SubmissionResult<string[]>; fileProblems?: string[]; problems?: RowProblem[] };

export async function action({ request, context }: Route.ActionArgs) {
  const { study, user, enrollment } = requireStudy(context, ["analyst"]);
  const upload = await readUploadForm(request, "file", IMPORT_MAX_BYTES);
  if (upload.tooLarge) return data<ImportRefusal>({ result: { status: "error", error: { file: [TOO_LARGE] } } }, { status: 413 });
  const submission = parseWithZod(upload.formData, { schema: importSchema });
  const refuse = (status: number, reply: { fieldErrors?: Record<string, string[]>; formErrors?: string[] }, lists: Omit<ImportRefusal, "result"> = {}) =>
    data<ImportRefusal>({ result: submission.reply(reply), ...lists }, { status });
  if (submission.status !== "success") return refuse(400, {});
  const { file } = submission.value;
  if (file.size === 0) return refuse(400, { fieldErrors: { file: ["The file is empty."] } });
  const text = decodeCsvText(new Uint8Array(await file.arrayBuffer()));
  if (!text.ok) return refuse(400, { fieldErrors: { file: [text.message] } });
  const parsed = parseImportCsv(text.text);
  if (parsed.fileProblems.length > 0) return refuse(400, { formErrors: [NOTHING_IMPORTED] }, { fileProblems: parsed.fileProblems });
  try {
    const outcome = await importResults(enrollment!, parsed.rows, user, file.name);
    if (!outcome.ok) return refuse(400, { formErrors: [NOTHING_IMPORTED] }, { problems: outcome.problems });
    return redirectWithToast(
      `/lab/studies/${study.id}/import`,
      `Imported ${outcome.imported} results as drafts. Check them on each material's result page, then submit.`,
    );
  } catch (error) {
    if (error instanceof ResultsError) return refuse(409, { fieldErrors: { file: [error.message] } });
    throw error;
  }
}

const NOTHING_IMPORTED = "Nothing was imported.";

const PREVIEW_ROWS = 100;

export default function ImportResults({ loaderData, actionData }: Route.ComponentProps) {
  const { study, frame } = loaderData;
  const navigation = useNavigation();
  const [form, fields] = useSchemaForm(importSchema, { reply: actionData, id: "import" });
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

  const serverProblems = actionData?.problems ?? [];
  const fileProblems = actionData?.fileProblems ?? [];
  const shownRows = parsed
    ? [...parsed.rows.filter((r) => preview?.byRow.has(r.row!)), ...parsed.rows.filter((r) => !preview?.byRow.has(r.row!))].slice(0, PREVIEW_ROWS)
    : [];
  const blocked = !parsed || parsed.rows.length === 0 || parsed.fileProblems.length > 0 || (preview?.problems.length ?? 0) > 0;
  const errorText = fileError ?? fields.file.errors?.[0];

  return (
    <div className="grid gap-6 [&>*]:min-w-0">
      <Card title="The file">
        <p className="mb-2">
          One row per replicate result, with a header row: <code className="rounded bg-basalt-100 px-1">{REQUIRED_COLUMNS.join(",")}</code>, and if you like{" "}
          <code className="rounded bg-basalt-100 px-1">{OPTIONAL_COLUMNS.join(",")}</code> (test date as YYYY-MM-DD); no other columns. Save it as CSV UTF-8, at
          most 2 MB. Materials: {frame.materials.map((m) => m.code).join(", ")}; responses: {frame.responses.map((r) => r.key).join(", ")}; replicates 1 to{" "}
          {frame.replicatesPerCell}.
        </p>
        <p className="mb-4 text-basalt-700">
          All rows are imported together, or none: a file with a problem in any row changes nothing. Results already submitted are changed only by amendments.
        </p>
        {!study.editable && <Notice>Results can be imported only while the study is in testing.</Notice>}
        <Form method="post" encType="multipart/form-data" className="mt-3 grid gap-3" {...getFormProps(form)}>
          <div className="flex flex-col gap-1">
            <label htmlFor={fields.file.id} className="font-semibold text-basalt-800">
              Results file (CSV)
            </label>
            <input
              id={fields.file.id}
              name={fields.file.name}
              type="file"
              accept=".csv,text/csv"
              required
              aria-invalid={errorText ? true : undefined}
              aria-describedby={errorText ? `${fields.file.id}-error` : undefined}
              onChange={(e) => readFile(e.target.files?.[0])}
            />
            {errorText && (
              <p id={`${fields.file.id}-error`} className="text-sm font-semibold text-signal-700">
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
              {navigation.state === "submitting" ? "Importing…" : parsed ? `Import ${countOf(parsed.rows.length, "row")}` : "Import"}
            </Button>
          </div>
        </Form>
      </Card>

      {(fileProblems.length > 0 || serverProblems.length > 0) && (
        <Notice tone="error">
          <p className="font-semibold">{formWideErrors(form).join(" ")}</p>
          <ul className="ml-5 list-disc">
            {fileProblems.map((p) => (
              <li key={p}>{p}</li>
            ))}
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
            {countOf(parsed.rows.length, "row")} read;{" "}
            {preview.problems.length === 0 && parsed.fileProblems.length === 0
              ? "no problems found."
              : `${preview.problems.length + parsed.fileProblems.length} with problems — fix the file and choose it again.`}
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
          {parsed.rows.length > PREVIEW_ROWS && (
            <p className="mt-2 text-basalt-700">
              Showing {PREVIEW_ROWS} of {countOf(parsed.rows.length, "row")}.
            </p>
          )}
        </Card>
      )}
    </div>
  );
}
