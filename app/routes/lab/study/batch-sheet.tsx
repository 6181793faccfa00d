import { getFormProps } from "@conform-to/react";
import { parseWithZod } from "@conform-to/zod/v4";
import { useMemo, useState } from "react";
import { Form, Link, useNavigation } from "react-router";
import type { Route } from "./+types/batch-sheet";
import { ConcreteCaution } from "~/components/cautions";
import { PrintFrame } from "~/components/print-frame";
import { StudyTargets } from "~/components/study-targets";
import { fieldProps, FormErrors, formWideErrors, useSchemaForm } from "~/components/forms";
import type { StudyPageHandle } from "~/components/study-frame";
import { Button, Card, Field, Notice } from "~/components/ui";
import { type BatchSheetView, computeBatchSheet } from "~/lib/batch-sheet";
import { type Constituent, isAggregate, KG_PER_LB, m3ToFt3, mixingSequence } from "~/lib/batching";
import { batchInputsSchema, batchVolumeAccepted, mixerCapacityAccepted, moistureAccepted, moistureField } from "~/lib/results/batch-inputs";
import { parsePlainNumber } from "~/lib/results/values";
import { studyPageMeta } from "~/lib/study-page-meta";
import { findStudyMaterial, freshTargets, getBatch, loadMixtureDesign, saveBatchInputs } from "~/models/batch.server";
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

/** The study's plan for one specimen, which the suggested batch volume comes from. */
const specimenPlan = (study: { replicatesPerCell: number; specimenVolumeM3: number | null; wastePercent: number | null }) => ({
  replicatesPerCell: study.replicatesPerCell,
  specimenVolumeM3: study.specimenVolumeM3,
  wastePercent: study.wastePercent,
});

export async function loader({ params, context, request }: Route.LoaderArgs) {
  const { study, enrollment, material, mixture } = await loadSheet(context, params);
  const [batch, targets] = await Promise.all([getBatch(enrollment.id, material.id), freshTargets(study.id)]);
  // A mixer size in the address (?mixer=0.06) shows that split without saving it; otherwise the lab's last one.
  const asked = parsePlainNumber(new URL(request.url).searchParams.get("mixer") ?? "");
  const mixerCapacityM3 = asked !== null && mixerCapacityAccepted(asked) ? asked : enrollment.mixerCapacityM3;
  const saved = { batchVolumeM3: batch?.batchVolumeM3 ?? null, moistureByConstituentId: batch?.aggregateMoisture ?? {}, mixerCapacityM3 };
  const plan = specimenPlan(study);
  return {
    study: { id: study.id, code: study.code, editable: study.state === "testing", targetSurfaceRating: study.targetSurfaceRating, ...plan },
    labCode: enrollment.labCode,
    material: { id: material.id, code: material.code, description: material.description },
    targets,
    design: mixture.design,
    designProblem: mixture.problem,
    constituentIds: mixture.constituentIds,
    aggregates: mixture.design ? aggregatesOf(mixture.design.constituents, mixture.constituentIds) : [],
    sequence: mixture.design ? mixingSequence(mixture.design.constituents.map((c) => c.kind)) : [],
    saved,
    computed: mixture.design ? computeBatchSheet(mixture.design, mixture.constituentIds, plan, saved) : null,
  };
}

export async function action({ request, params, context }: Route.ActionArgs) {
  const { enrollment, study, material, mixture } = await loadSheet(context, params);
  const schema = batchInputsSchema(mixture.design ? aggregatesOf(mixture.design.constituents, mixture.constituentIds) : []);
  const submission = parseWithZod(await request.formData(), { schema });
  if (!mixture.design) return refuse(submission, { form: [mixture.problem!] });
  if (submission.status !== "success") return refuse(submission);
  const { batchVolume, mixerCapacity, ...moisture } = submission.value;
  const moistureByConstituentId = Object.fromEntries(Object.entries(moisture).map(([field, percent]) => [field.replace("moisture-", ""), percent as number]));
  try {
    await saveBatchInputs(enrollment, material.id, { batchVolumeM3: batchVolume!, moistureByConstituentId, mixerCapacityM3: mixerCapacity ?? null });
  } catch (error) {
    if (error instanceof ResultsError) return refuse(submission, { form: [error.message] }, 409);
    throw error;
  }
  return redirectWithToast(`/lab/studies/${study.id}/batch/${material.id}`, `Saved: this sheet is kept for your batch of ${material.code}.`);
}

const kg = (x: number) => x.toFixed(2);
const lb = (x: number) => (x / KG_PER_LB).toFixed(2);

export default function BatchSheetPage({ loaderData, actionData }: Route.ComponentProps) {
  const { study, labCode, material, targets, design, designProblem, constituentIds, aggregates, sequence, saved, computed } = loaderData;
  const navigation = useNavigation();
  const schema = useMemo(() => batchInputsSchema(aggregates), [aggregates]);
  const [form, fields] = useSchemaForm(schema, {
    reply: actionData,
    id: `batch-${material.id}`,
  });
  const textOf = (x: number | null | undefined) => (x === null || x === undefined ? "" : String(Number(x.toFixed(4))));
  const [volumeText, setVolumeText] = useState(textOf(saved.batchVolumeM3 ?? computed?.suggestion?.volumeM3));
  const [mixerText, setMixerText] = useState(textOf(saved.mixerCapacityM3));
  const [moistureText, setMoistureText] = useState<Record<string, string>>(() =>
    Object.fromEntries(constituentIds.map((id) => [String(id), textOf(saved.moistureByConstituentId[String(id)])])),
  );

  // The sheet follows the inputs as typed; invalid inputs leave the last good sheet in view.
  let live: BatchSheetView | null = computed;
  if (design) {
    const volume = parsePlainNumber(volumeText);
    const mixer = parsePlainNumber(mixerText);
    const moisture: Record<string, number> = {};
    for (const [id, text] of Object.entries(moistureText)) {
      const mc = parsePlainNumber(text);
      if (mc !== null && moistureAccepted(mc)) moisture[id] = mc;
    }
    if (volume !== null && batchVolumeAccepted(volume)) {
      live = computeBatchSheet(design, constituentIds, study, {
        batchVolumeM3: volume,
        moistureByConstituentId: moisture,
        mixerCapacityM3: mixer !== null && mixerCapacityAccepted(mixer) ? mixer : null,
      });
    }
  }

  return (
    <PrintFrame header={`Batch sheet ${material.code} · ${study.code} · lab ${labCode ?? "—"}`}>
      <div className="grid gap-6 [&>*]:min-w-0">
        <div className="no-print flex flex-wrap items-center justify-between gap-3">
          <p>{material.description}</p>
          <span className="flex gap-2">
            <Button type="button" variant="secondary" onClick={() => window.print()}>
              Print
            </Button>
            <Link to={`/lab/studies/${study.id}/results/${material.id}`} className="inline-flex min-h-11 items-center font-semibold text-basalt-700 underline">
              Enter results
            </Link>
          </span>
        </div>
        <p className="hidden print:block">{material.description}</p>
        <Card title="Targets">
          <StudyTargets targets={targets} targetSurfaceRating={study.targetSurfaceRating} />
        </Card>
        <ConcreteCaution heavy />
        {designProblem && <Notice tone="error">{designProblem}</Notice>}
        {design && computed && (
          <>
            <Card title="Batch volume, mixer and today's moisture" className="no-print">
              {computed.suggestion ? (
                <>
                  <p className="mb-3">
                    Suggested batch volume: <span className="font-semibold">{computed.suggestion.summary}</span>
                  </p>
                  <ol className="mb-4 ml-5 list-decimal text-basalt-700" aria-label="Arithmetic of the suggested batch volume">
                    {computed.suggestion.steps.map((s) => (
                      <li key={s.text}>{s.text}</li>
                    ))}
                  </ol>
                </>
              ) : (
                <p className="mb-3">
                  The study gives no specimen volume for its test method, so there is no suggested volume: enter the batch volume your specimens need.
                </p>
              )}
              <Form method="post" className="mt-3 grid gap-4 sm:grid-cols-2 lg:grid-cols-3" {...getFormProps(form)}>
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
                <Field
                  label="Mixer capacity (m³, usable)"
                  {...fieldProps(fields.mixerCapacity!)}
                  defaultValue={undefined}
                  inputMode="decimal"
                  value={mixerText}
                  onChange={(e) => setMixerText(e.target.value)}
                  hint={
                    mixerText.trim()
                      ? `${m3ToFt3(parsePlainNumber(mixerText) ?? 0).toFixed(2)} ft³; kept for your lab's next sheets`
                      : "Blank: the batch is one mix"
                  }
                />
                {aggregates.map((a) => (
                  <Field
                    key={a.id}
                    label={`Moisture content of ${a.name} (% of oven-dry mass)`}
                    {...fieldProps(fields[moistureField(a.id)]!)}
                    defaultValue={undefined}
                    inputMode="decimal"
                    value={moistureText[String(a.id)] ?? ""}
                    onChange={(e) =>
                      setMoistureText({
                        ...moistureText,
                        [String(a.id)]: e.target.value,
                      })
                    }
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
            <Card title={live?.batchVolumeM3 ? `What to weigh for ${live.batchVolumeM3.toFixed(4)} m³` : "What to weigh"}>
              {live?.sheet && live.split ? (
                <SheetTable view={live} />
              ) : live?.batchVolumeM3 ? (
                <p>Enter the moisture content of {live.missingMoisture.join(" and ")} to compute the sheet.</p>
              ) : (
                <p>Enter the batch volume to compute the sheet.</p>
              )}
              <dl className="mt-4 grid gap-4 sm:grid-cols-3" aria-label="To fill in at the mixer">
                {["Date", "Operator", "Time of batching"].map((label) => (
                  <div key={label} className="flex items-end gap-2">
                    <dt className="font-semibold">{label}</dt>
                    <dd className="h-7 flex-1 border-b border-basalt-700" />
                  </div>
                ))}
              </dl>
            </Card>
            <Card title="Mixing sequence">
              <ol className="ml-5 list-decimal">
                {sequence.map((step) => (
                  <li key={step}>{step}</li>
                ))}
              </ol>
              <p className="mt-2 text-sm text-basalt-700">
                Common practice for laboratory mixing, in the order ASTM C192 gives for machine mixing. The study's protocol governs where it differs.
              </p>
            </Card>
          </>
        )}
      </div>
    </PrintFrame>
  );
}

/** An empty box to tick on the printed sheet as each constituent goes in. */
const TickBox = () => <span aria-hidden="true" className="inline-block h-5 w-5 border-2 border-basalt-700 align-middle" />;

function SheetTable({ view }: { view: BatchSheetView }) {
  const sheet = view.sheet!;
  const split = view.split!;
  const v = view.batchVolumeM3!;
  const mixes = Array.from({ length: split.mixes }, (_, i) => i + 1);
  const amount = (row: SheetRow, share: number) =>
    row.unit === "kg" ? `${kg(row.amount * share)} kg (${lb(row.amount * share)} lb)` : `${(row.amount * share).toFixed(0)} mL`;
  return (
    <>
      {sheet.warnings.map((w) => (
        <Notice key={w.code} tone="error">
          {w.message}
        </Notice>
      ))}
      <p className="mb-3" data-testid="mix-split">
        {split.mixes === 1
          ? "One mix."
          : `${split.mixes} equal mixes of ${split.volumePerMixM3.toFixed(4)} m³ (${m3ToFt3(split.volumePerMixM3).toFixed(2)} ft³) each; weigh each mix's amounts separately.`}
      </p>
      {/* Drawn here rather than with SimpleTable: on paper the arithmetic column gives way to the tick boxes. */}
      <div className="relative overflow-x-auto print:overflow-visible" role="region" aria-label="Batch sheet" tabIndex={0}>
        <table className="w-full border-collapse text-left">
          <caption className="sr-only">Batch sheet</caption>
          <thead>
            <tr className="border-b-2 border-basalt-200">
              <th scope="col" className="px-3 py-2">
                Constituent
              </th>
              <th scope="col" className="px-3 py-2">
                Lot
              </th>
              <th scope="col" className="px-3 py-2">
                {split.mixes === 1 ? "Weigh out" : "Whole batch"}
              </th>
              {split.mixes > 1 && (
                <th scope="col" className="px-3 py-2">
                  Per mix
                </th>
              )}
              {mixes.map((m) => (
                <th key={m} scope="col" className="whitespace-nowrap px-2 py-2 text-center">
                  {split.mixes === 1 ? "Weighed" : `Mix ${m}`}
                </th>
              ))}
              <th scope="col" className="px-3 py-2 print:hidden">
                How it is computed
              </th>
            </tr>
          </thead>
          <tbody>
            {sheet.rows.map((row) => (
              <tr key={row.index} className="border-b border-basalt-100 align-top">
                <td className="px-3 py-2">{row.name}</td>
                <td className="whitespace-nowrap px-3 py-2">{row.lot ?? "—"}</td>
                <td className="whitespace-nowrap px-3 py-2 font-semibold tabular-nums" data-testid={`amount-${row.index}`}>
                  {amount(row, 1)}
                </td>
                {split.mixes > 1 && (
                  <td className="whitespace-nowrap px-3 py-2 font-semibold tabular-nums" data-testid={`per-mix-${row.index}`}>
                    {amount(row, split.fractionPerMix)}
                  </td>
                )}
                {mixes.map((m) => (
                  <td key={m} className="px-2 py-2 text-center">
                    <TickBox />
                  </td>
                ))}
                <td className="px-3 py-2 text-sm print:hidden">{explain(row, v, sheet.cementitiousKg)}</td>
              </tr>
            ))}
          </tbody>
        </table>
      </div>
      <p className="mt-3">
        Total mass weighed: <span className="font-semibold tabular-nums">{kg(sheet.totalMassKg)} kg</span> · cementitious{" "}
        <span className="tabular-nums">{kg(sheet.cementitiousKg)} kg</span>
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
