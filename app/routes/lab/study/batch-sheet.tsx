import { useState } from "react";
import { data, Form, Link, useNavigation } from "react-router";
import type { Route } from "./+types/batch-sheet";
import { ConcreteCaution } from "~/components/cautions";
import { Button, Card, Field, Notice, PageHeader, SimpleTable } from "~/components/ui";
import { type BatchSheetView, computeBatchSheet } from "~/lib/batch-sheet";
import { isAggregate, KG_PER_LB, m3ToFt3 } from "~/lib/batching";
import { notFound } from "~/server/guards.server";
import { requireStudy } from "~/server/study-context.server";
import { parsePlainNumber } from "~/lib/results/values";
import { findStudyMaterial, getBatch, loadMixtureDesign, saveBatchInputs } from "~/models/batch.server";
import { ResultsError } from "~/models/results.server";

export const meta: Route.MetaFunction = ({ data }) => [{ title: `Batch sheet ${data?.material.code ?? ""} · Ringbatch` }];

// Wide bounds of a laboratory batch and of stockpile moisture (common practice); they catch unit slips.
const MAX_BATCH_M3 = 3;
const MAX_MOISTURE_PERCENT = 30;

async function loadSheet(context: Route.LoaderArgs["context"], params: Route.LoaderArgs["params"]) {
  const { user, study, enrollment } = requireStudy(context, ["analyst"]);
  const material = await findStudyMaterial(study.id, Number(params.materialId));
  if (!material) notFound();
  const mixture = await loadMixtureDesign(material.id, material.code);
  return { user, study, enrollment: enrollment!, material, mixture };
}

export async function loader({ params, context }: Route.LoaderArgs) {
  const { study, enrollment, material, mixture } = await loadSheet(context, params);
  const batch = await getBatch(enrollment.id, material.id);
  const saved = { batchVolumeM3: batch?.batchVolumeM3 ?? null, moistureByConstituentId: batch?.aggregateMoisture ?? {} };
  return {
    study: { id: study.id, code: study.code, replicatesPerCell: study.replicatesPerCell, editable: study.state === "testing" },
    labCode: enrollment.labCode,
    material: { id: material.id, code: material.code, description: material.description },
    design: mixture.design,
    designProblem: mixture.problem,
    constituentIds: mixture.constituentIds,
    saved,
    computed: mixture.design ? computeBatchSheet(mixture.design, mixture.constituentIds, study.replicatesPerCell, saved) : null,
  };
}

export async function action({ request, params, context }: Route.ActionArgs) {
  const { enrollment, study, material, mixture } = await loadSheet(context, params);
  if (!mixture.design) return data({ errors: { form: mixture.problem! } as Record<string, string> }, { status: 400 });
  const form = await request.formData();
  const errors: Record<string, string> = {};
  const volume = parsePlainNumber(String(form.get("batchVolume") ?? ""));
  if (volume === null || volume <= 0 || volume > MAX_BATCH_M3) errors.batchVolume = `Enter the batch volume in m³, more than 0 and at most ${MAX_BATCH_M3}.`;
  const moisture: Record<string, number> = {};
  mixture.design.constituents.forEach((c, index) => {
    if (!isAggregate(c)) return;
    const id = String(mixture.constituentIds[index]);
    const mc = parsePlainNumber(String(form.get(`moisture-${id}`) ?? ""));
    if (mc === null || mc < 0 || mc > MAX_MOISTURE_PERCENT) errors[`moisture-${id}`] = `Enter today's moisture content of ${c.name}, 0 to ${MAX_MOISTURE_PERCENT} % of oven-dry mass.`;
    else moisture[id] = mc;
  });
  if (Object.keys(errors).length > 0) return data({ errors }, { status: 400 });
  try {
    await saveBatchInputs(enrollment, material.id, { batchVolumeM3: volume!, moistureByConstituentId: moisture });
  } catch (error) {
    if (error instanceof ResultsError) return data({ errors: { form: error.message } as Record<string, string> }, { status: 409 });
    throw error;
  }
  const inputs = { batchVolumeM3: volume!, moistureByConstituentId: moisture };
  return { saved: true, errors: {} as Record<string, string>, computed: computeBatchSheet(mixture.design, mixture.constituentIds, study.replicatesPerCell, inputs) };
}

const kg = (x: number) => x.toFixed(2);
const lb = (x: number) => (x / KG_PER_LB).toFixed(2);

export default function BatchSheetPage({ loaderData, actionData }: Route.ComponentProps) {
  const { study, material, design, designProblem, constituentIds, saved, computed } = loaderData;
  const errors = actionData?.errors ?? {};
  const navigation = useNavigation();
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
      if (mc !== null && mc >= 0 && mc <= MAX_MOISTURE_PERCENT) moisture[id] = mc;
    }
    if (volume !== null && volume > 0 && volume <= MAX_BATCH_M3) live = computeBatchSheet(design, constituentIds, study.replicatesPerCell, { batchVolumeM3: volume, moistureByConstituentId: moisture });
  }

  return (
    <>
      <PageHeader
        title={`Batch sheet — ${material.code}`}
        subtitle={
          <>
            {study.code} · your lab code {loaderData.labCode ?? "—"} · {material.description}
          </>
        }
        actions={
          <span className="no-print flex gap-2">
            <Button type="button" variant="secondary" onClick={() => window.print()}>
              Print
            </Button>
            <Link to={`/lab/studies/${study.id}/results/${material.id}`} className="inline-flex min-h-11 items-center font-semibold text-basalt-700 underline">
              Enter results
            </Link>
          </span>
        }
      />
      <div className="grid gap-6 [&>*]:min-w-0">
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
              {errors.form && <Notice tone="error">{errors.form}</Notice>}
              {actionData && "saved" in actionData && <Notice tone="success">Saved: this sheet is kept for your batch of {material.code}.</Notice>}
              <Form method="post" className="no-print mt-3 grid gap-4 sm:grid-cols-2 lg:grid-cols-3">
                <Field
                  label="Batch volume (m³)"
                  name="batchVolume"
                  inputMode="decimal"
                  value={volumeText}
                  onChange={(e) => setVolumeText(e.target.value)}
                  hint={`${m3ToFt3(parsePlainNumber(volumeText) ?? 0).toFixed(2)} ft³`}
                  error={errors.batchVolume}
                />
                {design.constituents.map((c, index) =>
                  isAggregate(c) ? (
                    <Field
                      key={constituentIds[index]}
                      label={`Moisture content of ${c.name} (% of oven-dry mass)`}
                      name={`moisture-${constituentIds[index]}`}
                      inputMode="decimal"
                      value={moistureText[String(constituentIds[index])] ?? ""}
                      onChange={(e) => setMoistureText({ ...moistureText, [String(constituentIds[index])]: e.target.value })}
                      hint={`Absorption ${c.absorptionPercent} %; measured on today's stockpile`}
                      error={errors[`moisture-${constituentIds[index]}`]}
                    />
                  ) : null,
                )}
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
    </>
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
