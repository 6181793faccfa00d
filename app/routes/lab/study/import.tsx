import { getFormProps } from "@conform-to/react";
import { parseWithZod } from "@conform-to/zod/v4";
import { createHash } from "node:crypto";
import { useRef, useState } from "react";
import { useHydrated } from "~/components/use-hydrated";
import { data, Form, Link, useNavigation } from "react-router";
import { z } from "zod";
import type { Route } from "./+types/import";
import { formWideErrors, useSchemaForm } from "~/components/forms";
import type { StudyPageHandle } from "~/components/study-frame";
import { Button, Card, Notice, SimpleTable } from "~/components/ui";
import { decodeCsvText, describeReading, IMPORT_MAX_BYTES, isZipArchive, OPTIONAL_COLUMNS, type ParsedImport, parseImportCsv, parseImportRecords, REQUIRED_COLUMNS } from "~/lib/results/import-file";
import type { RowProblem } from "~/lib/results/rows";
import { studyPageMeta } from "~/lib/study-page-meta";
import { type DraftConflict, type ImportPreview, importFrame, importResults, previewImport, ResultsError } from "~/models/results.server";
import { refuse } from "~/server/form-reply.server";
import { countOf } from "~/lib/format";
import { readWorkbookRecords } from "~/server/results-workbook.server";
import { requireStudy } from "~/server/study-context.server";
import { redirectWithToast } from "~/server/toast.server";
import { readUploadForm } from "~/server/upload-form.server";

export const handle = { pageTitle: "Import" } satisfies StudyPageHandle;

export const meta: Route.MetaFunction = ({ matches }) => studyPageMeta("Import", matches);

export async function loader({ request, context }: Route.LoaderArgs) {
  const { study, enrollment } = requireStudy(context, ["analyst"]);
  const frame = await importFrame(enrollment!);
  // After an import, the materials it touched, each linked to its entry page for checking and submitting.
  const importedIds = new Set((new URL(request.url).searchParams.get("imported") ?? "").split(",").map(Number));
  return { study: { id: study.id, editable: study.state === "testing" }, frame, imported: frame.materials.filter((m) => importedIds.has(m.id)) };
}

const MAX_MB = IMPORT_MAX_BYTES / 1024 / 1024;
const TOO_LARGE = `The file is larger than ${MAX_MB} MB; split it into smaller files.`;
const NOTHING_IMPORTED = "Nothing was imported.";
const NOTHING_TO_IMPORT = "The file cannot be imported as it is.";

// An empty file input arrives as no value at all.
const fileField = z.instanceof(File, { message: "Choose a CSV or .xlsx file." });
/** Versions the preview read, by the file's row number, for a file without a version column. */
const seenVersions = z
  .string()
  .transform((text, ctx) => {
    try {
      return JSON.parse(text) as unknown;
    } catch {
      ctx.addIssue({ code: "custom", message: "Check the file again, then import." });
      return z.NEVER;
    }
  })
  .pipe(z.record(z.string().regex(/^\d+$/), z.number().int().nonnegative()));

const importFormSchema = z.discriminatedUnion("intent", [
  z.object({ intent: z.literal("preview"), file: fileField }),
  z.object({ intent: z.literal("import"), file: fileField, digest: z.string().regex(/^[0-9a-f]{64}$/), seen: seenVersions }),
]);

const PREVIEW_ROWS = 100;

/** One row of the file as the page lists it. */
type ReportRow = { row: number; material: string; response: string; replicate: string; value: string; testedOn: string; operator: string; storedValue?: number | null; problem?: string; warning?: string };

/** What the page shows of a checked file: how it was read, its problems and conflicts, its rows, and (when it can be imported) what the confirmation sends back. */
type ImportReport = {
  fileName: string;
  reading: string;
  rowCount: number;
  blankRows: number;
  fileProblems: string[];
  problems: RowProblem[];
  conflicts: DraftConflict[];
  rows: ReportRow[];
  confirm?: { digest: string; seen: string; rows: number };
};

/** The file's bytes as rows, whichever format it is in, with a digest that ties the confirmation to the file previewed. */
async function readResultsFile(file: File): Promise<{ ok: true; parsed: ParsedImport; digest: string } | { ok: false; message: string }> {
  const bytes = new Uint8Array(await file.arrayBuffer());
  if (bytes.length === 0) return { ok: false, message: "The file is empty." };
  const digest = createHash("sha256").update(bytes).digest("hex");
  if (isZipArchive(bytes)) {
    const workbook = await readWorkbookRecords(bytes);
    return workbook.ok ? { ok: true, parsed: parseImportRecords(workbook.records), digest } : workbook;
  }
  const text = decodeCsvText(bytes);
  return text.ok ? { ok: true, parsed: parseImportCsv(text.text), digest } : text;
}

function reportOf(fileName: string, parsed: ParsedImport, preview?: ImportPreview & { confirm?: ImportReport["confirm"] }): ImportReport {
  const problems = preview?.problems ?? [];
  const problemOf = new Map(problems.map((p) => [p.row, p.message]));
  const conflictOf = new Map((preview?.conflicts ?? []).map((c) => [c.row, c.message]));
  const previewOf = new Map((preview?.rows ?? []).map((r) => [r.row, r]));
  const rows: ReportRow[] = parsed.rows.map((r) => ({
    row: r.row!,
    material: r.material,
    response: r.response,
    replicate: String(r.replicate),
    value: String(r.value ?? ""),
    testedOn: r.testedOn ?? "",
    operator: r.operator ?? "",
    ...(previewOf.has(r.row!) ? { storedValue: previewOf.get(r.row!)!.storedValue } : {}),
    ...(problemOf.has(r.row!) || conflictOf.has(r.row!) ? { problem: problemOf.get(r.row!) ?? conflictOf.get(r.row!) } : {}),
    ...(previewOf.get(r.row!)?.warning ? { warning: previewOf.get(r.row!)!.warning } : {}),
  }));
  const flagged = rows.filter((r) => r.problem);
  return {
    fileName,
    reading: describeReading(parsed.reading),
    rowCount: parsed.rows.length,
    blankRows: parsed.blankRows.length,
    fileProblems: parsed.fileProblems,
    problems,
    conflicts: preview?.conflicts ?? [],
    rows: [...flagged, ...rows.filter((r) => !r.problem)].slice(0, PREVIEW_ROWS),
    ...(preview?.confirm ? { confirm: preview.confirm } : {}),
  };
}

export async function action({ request, context }: Route.ActionArgs) {
  const { study, user, enrollment } = requireStudy(context, ["analyst"]);
  const upload = await readUploadForm(request, "file", IMPORT_MAX_BYTES);
  if (upload.tooLarge) return data({ result: { status: "error" as const, error: { file: [TOO_LARGE] } } }, { status: 413 });
  const submission = parseWithZod(upload.formData, { schema: importFormSchema });
  if (submission.status !== "success") return refuse(submission);
  const input = submission.value;
  const read = await readResultsFile(input.file);
  if (!read.ok) return refuse(submission, { file: [read.message] });
  const { parsed, digest } = read;
  const refused = (report: ImportReport, status: number) =>
    data({ result: submission.reply({ formErrors: [input.intent === "preview" ? NOTHING_TO_IMPORT : NOTHING_IMPORTED] }), report }, { status });
  if (parsed.rows.length === 0 && parsed.fileProblems.length === 0) parsed.fileProblems.push(parsed.blankRows.length > 0 ? "No row of the file has a value yet." : "The file has no result rows.");
  if (parsed.fileProblems.length > 0) return refused(reportOf(input.file.name, parsed), 400);
  const readFrom = parsed.reading.versions ? "template" : "preview";

  if (input.intent === "preview") {
    const preview = await previewImport(enrollment!, parsed.rows, readFrom);
    if (preview.problems.length > 0 || preview.conflicts.length > 0) return refused(reportOf(input.file.name, parsed, preview), preview.conflicts.length > 0 ? 409 : 400);
    const seen = JSON.stringify(Object.fromEntries(preview.rows.map((r) => [r.row, r.readVersion])));
    return { result: submission.reply(), report: reportOf(input.file.name, parsed, { ...preview, confirm: { digest, seen, rows: parsed.rows.length } }) };
  }

  if (input.digest !== digest) return refuse(submission, { file: ["This is not the file that was checked. Check it first, then import."] }, 409);
  // A row with no version of its own is checked against the version its preview read.
  const rows = parsed.rows.map((r) => ({ ...r, readVersion: r.readVersion ?? input.seen[String(r.row)] }));
  try {
    const outcome = await importResults(enrollment!, rows, user, { fileName: input.file.name, readFrom });
    if (!outcome.ok) return refused(reportOf(input.file.name, parsed, { ...outcome, rows: [] }), outcome.conflicts.length > 0 ? 409 : 400);
    return redirectWithToast(
      `/lab/studies/${study.id}/import?imported=${outcome.materialIds.join(",")}`,
      `Imported ${outcome.imported} results as drafts. Check them on each material's result page, then submit.`,
    );
  } catch (error) {
    if (error instanceof ResultsError) return refuse(submission, { file: [error.message] }, 409);
    throw error;
  }
}

export default function ImportResults({ loaderData, actionData }: Route.ComponentProps) {
  const { study, frame, imported } = loaderData;
  const navigation = useNavigation();
  const [form, fields] = useSchemaForm(importFormSchema, { reply: actionData, id: "import" });
  const checkButton = useRef<HTMLButtonElement>(null);
  const [tooLarge, setTooLarge] = useState(false);
  const report = actionData && "report" in actionData ? actionData.report : undefined;
  const busy = navigation.state !== "idle";
  const errorText = (tooLarge ? TOO_LARGE : undefined) ?? fields.file.errors?.[0];
  const base = `/lab/studies/${study.id}`;

  return (
    <div className="grid gap-6 [&>*]:min-w-0">
      {imported.length > 0 && <CheckAndSubmitCard base={base} imported={imported} />}
      <ResultsTemplateCard base={base} />

      <Card title="The file">
        <p className="mb-2">
          CSV (comma- or semicolon-separated, decimal point or decimal comma, UTF-8) or an .xlsx workbook, at most {MAX_MB} MB, with a header row naming the columns{" "}
          <code className="rounded bg-basalt-100 px-1 break-all">{REQUIRED_COLUMNS.join(",")}</code> and, if you like, <code className="rounded bg-basalt-100 px-1 break-all">{OPTIONAL_COLUMNS.join(",")}</code>. Materials:{" "}
          {frame.materials.map((m) => m.code).join(", ")}; responses: {frame.responses.map((r) => `${r.key} (${r.name.toLowerCase()})`).join(", ")}; replicates 1 to{" "}
          {frame.replicatesPerCell}.
        </p>
        <p className="mb-4 text-basalt-700">
          All rows are imported together, or none: a file with a problem in any row changes nothing. Results already submitted change only by amendments.
        </p>
        {!study.editable && <Notice>Results can be imported only while the study is in testing.</Notice>}
        <Form method="post" encType="multipart/form-data" className="mt-3 grid gap-3" {...getFormProps(form)}>
          <div className="flex flex-col gap-1">
            <label htmlFor={fields.file.id} className="font-semibold text-basalt-800">
              Results file (CSV or .xlsx)
            </label>
            <input
              id={fields.file.id}
              name={fields.file.name}
              type="file"
              accept=".csv,text/csv,.xlsx,application/vnd.openxmlformats-officedocument.spreadsheetml.sheet"
              required
              aria-invalid={errorText ? true : undefined}
              aria-describedby={errorText ? `${fields.file.id}-error` : undefined}
              onChange={(e) => {
                const file = e.target.files?.[0];
                setTooLarge(Boolean(file && file.size > IMPORT_MAX_BYTES));
                // Checked at once; the button stays for a browser without JavaScript.
                if (file && file.size <= IMPORT_MAX_BYTES) e.target.form?.requestSubmit(checkButton.current);
              }}
            />
            {errorText && (
              <p id={`${fields.file.id}-error`} className="text-sm font-semibold text-signal-700">
                {errorText}
              </p>
            )}
          </div>
          {busy && (
            <div>
              <label htmlFor="import-progress" className="text-sm">
                {navigation.formData?.get("intent") === "import" ? "Importing the file" : "Checking the file"}
              </label>
              <progress id="import-progress" className="block h-3 w-full" />
            </div>
          )}
          <div>
            <Button ref={checkButton} type="submit" name="intent" value="preview" variant={report?.confirm ? "secondary" : undefined} disabled={busy || tooLarge}>
              Check the file
            </Button>
          </div>
          {report?.confirm && (
            <>
              <input type="hidden" name="digest" value={report.confirm.digest} />
              <input type="hidden" name="seen" value={report.confirm.seen} />
            </>
          )}
        </Form>
      </Card>

      {report && <ImportReportView report={report} formId={form.id} errors={formWideErrors(form)} editable={study.editable} busy={busy} />}
    </div>
  );
}

/** After an import: each material it touched, linked to the entry page where its drafts are checked and submitted. */
function CheckAndSubmitCard({ base, imported }: { base: string; imported: { id: number; code: string }[] }) {
  return (
    <Card title="Check and submit">
      <p className="mb-2">The results are stored as drafts. Look at each material's page, then submit it there:</p>
      <ul className="ml-5 list-disc" aria-label="Imported materials">
        {imported.map((m) => (
          <li key={m.id}>
            <Link to={`${base}/results/${m.id}`} className="font-semibold text-basalt-700 underline">
              Results of {m.code}
            </Link>
          </li>
        ))}
      </ul>
    </Card>
  );
}

function ResultsTemplateCard({ base }: { base: string }) {
  return (
    <Card title="Results template">
      <p className="mb-3">
        One row per replicate of every material you have not submitted yet, with the drafts already stored. Fill in the value, test date (YYYY-MM-DD) and operator,
        and import it below; rows left without a value are skipped.
      </p>
      <div className="mb-3 flex flex-wrap gap-3">
        <a href={`${base}/import/template.xlsx`} download className="inline-flex min-h-11 items-center rounded-md bg-basalt-800 px-4 font-semibold text-white">
          Download template (.xlsx)
        </a>
        <a href={`${base}/import/template.csv`} download className="inline-flex min-h-11 items-center rounded-md border border-basalt-700 px-4 font-semibold text-basalt-800">
          Download template (CSV)
        </a>
      </div>
      <p className="text-basalt-700">
        <strong>Why the version column:</strong> it records which saved value each row was read at. If someone in your lab saves a different value after you download
        the template, the import names that result and their value and imports nothing, so no one's work is overwritten. A file of your own without a version column
        works too: then the check below records the values stored at that moment, and the import is refused if any of them changes before you confirm.
      </p>
    </Card>
  );
}

function ImportReportView({ report, formId, errors, editable, busy }: { report: ImportReport; formId: string; errors: string[]; editable: boolean; busy: boolean }) {
  // Scripts keep the chosen file in its field after the check; a page served without them comes back with the field empty.
  const hydrated = useHydrated();
  const troubles = report.fileProblems.length + report.problems.length + report.conflicts.length;
  return (
    <Card title={`Preview of ${report.fileName}`}>
      <p className="mb-3" role="status">
        <span className="font-semibold">{report.reading}</span> {report.rowCount} {report.rowCount === 1 ? "row" : "rows"} with a value
        {report.blankRows > 0 && `, ${report.blankRows} without (skipped)`};{" "}
        {troubles === 0 ? "no problems found." : `${troubles} ${troubles === 1 ? "problem" : "problems"} — fix the file and choose it again.`}
      </p>
      {troubles > 0 && (
        <Notice tone="error">
          {errors.length > 0 && <p className="font-semibold">{errors.join(" ")}</p>}
          <ul className="ml-5 list-disc" aria-label="Problems of the file">
            {report.fileProblems.map((p) => (
              <li key={p}>{p}</li>
            ))}
            {[...report.problems, ...report.conflicts].slice(0, 50).map((p) => (
              <li key={`${p.row}-${p.message}`}>
                Row {p.row}: {p.message}
              </li>
            ))}
          </ul>
        </Notice>
      )}
      {report.confirm && (
        <div className="my-4 grid gap-2">
          {!hydrated && (
            <p className="text-basalt-700" data-testid="choose-again">
              Your browser runs this page without JavaScript, so it forgot the chosen file after the check: choose the same file again under “The file”, then
              import. The import is refused if the file differs from the one checked.
            </p>
          )}
          <Button type="submit" form={formId} name="intent" value="import" disabled={!editable || busy} className="w-fit">
            Import {countOf(report.confirm.rows, "row")}
          </Button>
        </div>
      )}
      {report.rows.length > 0 && (
        <SimpleTable
          caption="Rows of the file, those with problems first"
          headers={["Row", "Material", "Response", "Replicate", "Value", "Stored now", "Test date", "Operator", "Problem"]}
          rows={report.rows.map((r) => [
            r.row,
            r.material,
            r.response,
            r.replicate,
            r.value,
            r.storedValue === undefined ? "" : (r.storedValue ?? "—"),
            r.testedOn,
            r.operator,
            r.problem ? (
              <span key="p" className="font-semibold text-signal-700">
                {r.problem}
              </span>
            ) : r.warning ? (
              <span key="w" className="text-ochre-800">
                {r.warning}
              </span>
            ) : (
              "—"
            ),
          ])}
        />
      )}
      {report.rowCount > report.rows.length && (
        <p className="mt-2 text-basalt-700">
          Showing {report.rows.length} of {report.rowCount} rows.
        </p>
      )}
    </Card>
  );
}
