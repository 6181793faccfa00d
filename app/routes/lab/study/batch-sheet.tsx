import { getFormProps } from "@conform-to/react";
import { parseWithZod } from "@conform-to/zod/v4";
import { useMemo, useState } from "react";
import { Form, Link, useNavigation } from "react-router";
import type { Route } from "./+types/batch-sheet";
import { ConcreteCaution } from "~/components/cautions";
import { fieldProps, FormErrors, formWideErrors, useSchemaForm } from "~/components/forms";
import type { StudyPageHandle } from "~/components/study-frame";
import { Button, Card, Field, Notice, SimpleTable } from "~/components/ui";
import { type BatchSheetView, computeBatchSheet } from "~/lib/batch-sheet";
import { type Constituent, isAggregate, KG_PER_LB, m3ToFt3 } from "~/lib/batching";
import { batchInputsSchema, batchVolumeAccepted, moistureAccepted, moistureField } from "~/lib/results/batch-inputs";
import { parsePlainNumber } from "~/lib/results/values";
import { studyPageMeta } from "~/lib/study-page-meta";
import { findStudyMaterial, getBatch, loadMixtureDesign, saveBatchInputs } from "~/models/batch.server";
import { ResultsError } from "~/models/results.server";
import { refuse } from "~/server/form-reply.server";
import { notFound } from "~/server/guards.server";
import { requireStudy } from "~/server/study-context.server";
import { redirectWithToast } from "~/server/toast.server";

const pageTitle = (data: { material: { code: string } }) => `Batch sheet ${data.material.code}`;

export const handle: StudyPageHandle<{ material: { code: string } }> = { pageTitle };

export const meta: Route.MetaFunction = ({ data, matches }) => studyPageMeta(data ? pageTitle(data) : "Batch sheet", matches);

async function loadSheet(context: Route.LoaderArgs["context"], params: Route.LoaderArgs["params"]) {
  const { user, study, enrollment } = requireStudy(context, ["analyst"]);
  const material = await findStudyMaterial(study.id, Number(params.materialId));
  if (!material) notFound();
  const mixture = await loadMixtureDesign(material.id, material.code);
  return { user, study, enrollment: enrollment!, material, mixture };
}

/** The mixture's aggregates, whose moisture the analyst measures today. */
function aggregatesOf(constituents: Constituent[], constituentIds: number[]) {
  return constituents.flatMap((c, index) => (isAggregate(c) ? [{ id: constituentIds[index]!, name: c.name, absorptionPercent: c.absorptionPercent }] : []));
}

export async function loader({ params, context }: Route.LoaderArgs) {
  const { study, enrollment, material, mixture } = await loadSheet(context, params);
  const batch = await getBatch(enrollment.id, material.id);
  const saved = { batchVolumeM3: batch?.batchVolumeM3 ?? null, moistureByConstituentId: batch?.aggregateMoisture ?? {} };
  return {
    study: { id: study.id, replicatesPerCell: study.replicatesPerCell, editable: study.state === "testing" },
    material: { id: material.id, code: material.code, description: material.description },
    design: mixture.design,
    designProblem: mixture.problem,
    constituentIds: mixture.constituentIds,
    aggregates: mixture.design ? aggregatesOf(mixture.design.constituents, mixture.constituentIds) : [],
    saved,
    computed: mixture.design ? computeBatchSheet(mixture.design, mixture.constituentIds, study.replicatesPerCell, saved) : null,
  };
}

export async function action({ request, params, context }: Route.ActionArgs) {
  const { enrollment, study, material, mixture } = await loadSheet(context, params);
  const schema = batchInputsSchema(mixture.design ? aggregatesOf(mixture.design.constituents, mixture.constituentIds) : []);
  const submission = parseWithZod(await request.formData(), { schema });
  if (!mixture.design) return refuse(submission, { form: [mixture.problem!] });
  if (submission.status !== "success") return refuse(submission);
  const { batchVolume, ...moisture } = submission.value;
  const moistureByConstituentId = Object.fromEntries(Object.entries(moisture).map(([field, percent]) => [field.replace("moisture-", ""), percent]));
  try {
    await saveBatchInputs(enrollment, material.id, { batchVolumeM3: batchVolume!, moistureByConstituentId });
  } catch (error) {
    if (error instanceof ResultsError) return refuse(submission, { form: [error.message] }, 409);
    throw error;
  }
  return redirectWithToast(`/lab/studies/${study.id}/batch/${material.id}`, `Saved: this sheet is kept for your batch of ${material.code}.`);
}

const kg = (x: number) => x.toFixed(2);
const lb = (x: number) => (x / KG_PER_LB).toFixed(2);

export default function BatchSheetPage({ loaderData, actionData }: Route.ComponentProps) {
  const { study, material, design, designProblem, constituentIds, aggregates, saved, computed } = loaderData;
  const navigation = useNavigation();
  const schema = useMemo(() => batchInputsSchema(aggregates), [aggregates]);
  const [form, fields] = useSchemaForm(schema, { reply: actionData, id: `batch-${material.id}` });
  const [volumeText, setVolumeText] = useState(saved.batchVolumeM3 === null ? (computed ? String(Number(computed.suggestion.volumeM3.toFixed(4))) : "") : String(saved.batchVolumeM3));
  const [moistureText, setMoistureText] = useState<Record<string, string>>(() =>
    Object.fromEntries(constituentIds.map((id) => [String(id), saved.moistureByConstituentId[String(id)] === undefined ? "" : String(saved.moistureByConstituentId[String(id)])])),
  );

  // The sheet follows the inputs as typed; invalid inputs leave the last good sheet in view.
  let live: BatchSheetView | null = computed;
  if (design) {
    const volume = parsePlainNumber(volumeText);
    const moisture: Record<string, number> = {};
    for (const [id, text] of Object.entries(moistureText)) {
      const mc = parsePlainNumber(text);
      if (mc !== null && moistureAccepted(mc)) moisture[id] = mc;
    }
    if (volume !== null && batchVolumeAccepted(volume)) live = computeBatchSheet(design, constituentIds, study.replicatesPerCell, { batchVolumeM3: volume, moistureByConstituentId: moisture });
  }

  return (
    <div className="grid gap-6 [&>*]:min-w-0">
      <div className="flex flex-wrap items-center justify-between gap-3">
        <p>{material.description}</p>
        <span className="no-print flex gap-2">
          <Button type="button" variant="secondary" onClick={() => window.print()}>
            Print
          </Button>
          <Link to={`/lab/studies/${study.id}/results/${material.id}`} className="inline-flex min-h-11 items-center font-semibold text-basalt-700 underline">
            Enter results
          </Link>
        </span>
      </div>
      <ConcreteCaution heavy />
      {designProblem && <Notice tone="error">{designProblem}</Notice>}
      {design && computed && (
        <>
          <Card title="Batch volume and today's moisture">
            <p className="mb-3">
              Suggested batch volume: <span className="font-semibold">{computed.suggestion.summary}</span>
            </p>
            <ol className="mb-4 ml-5 list-decimal text-basalt-700" aria-label="Arithmetic of the suggested batch volume">
              {computed.suggestion.steps.map((s) => (
                <li key={s.text}>{s.text}</li>
              ))}
            </ol>
            <Form method="post" className="no-print mt-3 grid gap-4 sm:grid-cols-2 lg:grid-cols-3" {...getFormProps(form)}>
              <div className="sm:col-span-2 lg:col-span-3">
                <FormErrors errors={formWideErrors(form)} />
              </div>
              {/* Controlled, so the sheet below follows every keystroke; the typed text stays after a refusal. */}
              <Field
                label="Batch volume (m³)"
                {...fieldProps(fields.batchVolume)}
                defaultValue={undefined}
                inputMode="decimal"
                value={volumeText}
                onChange={(e) => setVolumeText(e.target.value)}
                hint={`${m3ToFt3(parsePlainNumber(volumeText) ?? 0).toFixed(2)} ft³`}
              />
              {aggregates.map((a) => (
                <Field
                  key={a.id}
                  label={`Moisture content of ${a.name} (% of oven-dry mass)`}
                  {...fieldProps(fields[moistureField(a.id)]!)}
                  defaultValue={undefined}
                  inputMode="decimal"
                  value={moistureText[String(a.id)] ?? ""}
                  onChange={(e) => setMoistureText({ ...moistureText, [String(a.id)]: e.target.value })}
                  hint={`Absorption ${a.absorptionPercent} %; measured on today's stockpile`}
                />
              ))}
              <div className="flex items-end">
                <Button type="submit" disabled={!study.editable || navigation.state !== "idle"}>
                  Save batch sheet
                </Button>
              </div>
            </Form>
          </Card>
          <Card title={`What to weigh for ${live?.batchVolumeM3.toFixed(4) ?? "—"} m³`}>
            {live?.sheet ? <SheetTable view={live} /> : <p>Enter the moisture content of {live?.missingMoisture.join(" and ")} to compute the sheet.</p>}
          </Card>
        </>
      )}
    </div>
  );
}

function SheetTable({ view }: { view: BatchSheetView }) {
  const sheet = view.sheet!;
  const v = view.batchVolumeM3;
  return (
    <>
      {sheet.warnings.map((w) => (
        <Notice key={w.code} tone="error">
          {w.message}
        </Notice>
      ))}
      <SimpleTable
        caption="Batch sheet"
        headers={["Constituent", "Lot", "Weigh out", "How it is computed"]}
        rows={sheet.rows.map((row) => [
          row.name,
          row.lot ?? "—",
          <span key="amount" className="font-semibold" data-testid={`amount-${row.index}`}>
            {row.unit === "kg" ? `${kg(row.amount)} kg (${lb(row.amount)} lb)` : `${row.amount.toFixed(0)} mL`}
          </span>,
          explain(row, v, sheet.cementitiousKg),
        ])}
      />
      <p className="mt-3">
        Total mass weighed: <span className="font-semibold">{kg(sheet.totalMassKg)} kg</span> · cementitious {kg(sheet.cementitiousKg)} kg
      </p>
    </>
  );
}

type SheetRow = NonNullable<BatchSheetView["sheet"]>["rows"][number];

function explain(row: SheetRow, volume: number, cementitiousKg: number): string {
  if (row.aggregate) {
    const a = row.aggregate;
    return `SSD ${kg(a.ssdMassKg)} kg × (1 + ${a.moistureContentPercent} %) / (1 + ${a.absorptionPercent} %); free water ${kg(a.freeWaterKg)} kg`;
  }
  if (row.water) {
    return `design water ${kg(row.water.designWaterKg)} kg − free water of the aggregates ${kg(row.water.freeWaterFromAggregatesKg)} kg`;
  }
  if (row.kind === "admixture") return `dosage × ${kg(cementitiousKg)} kg cementitious / 100`;
  if (row.kind === "fiber") return `volume fraction × fiber density × ${volume.toFixed(4)} m³`;
  return `design mass × ${volume.toFixed(4)} m³`;
}
