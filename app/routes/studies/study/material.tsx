import { getFormProps } from "@conform-to/react";
import { parseWithZod } from "@conform-to/zod/v4";
import { type ChangeEvent, useMemo, useState } from "react";
import { Form, Link, useNavigation } from "react-router";
import type { Route } from "./+types/material";
import { DetailList } from "~/components/detail-list";
import { fieldProps, FormErrors, formWideErrors, useSchemaForm } from "~/components/forms";
import type { StudyPageHandle } from "~/components/study-frame";
import { Button, Card, Field, Notice } from "~/components/ui";
import { CONSTITUENT_KINDS } from "~/db/values";
import { checkMixtureDesign, kgPerM3ToLbPerYd3, M3_PER_FT3, M3_PER_YD3, type ConstituentKind } from "~/lib/batching";
import {
  convertRows,
  type EditorRow,
  FIELD_UNITS,
  FIELDS_BY_KIND,
  inputName,
  KIND_LABEL,
  parseDesignRows,
  rowsFromDesign,
  rowsFromForm,
  rowsFromTyped,
  type RowField,
  type UnitSystem,
} from "~/lib/mixture-form";
import { materialEditorSchema } from "~/lib/study-forms";
import { mayWrite } from "~/lib/write-rules";
import { studyPageMeta } from "~/lib/study-page-meta";
import { loadMaterial, saveMaterial } from "~/models/study-setup.server";
import { refuse, withRefusals } from "~/server/form-reply.server";
import { notFound } from "~/server/guards.server";
import { requireStudy } from "~/server/study-context.server";
import { redirectWithToast } from "~/server/toast.server";

export const handle = { pageTitle: "Material" } satisfies StudyPageHandle;

export const meta: Route.MetaFunction = ({ data, matches }) => studyPageMeta(`Material ${data?.material.code ?? ""}`.trim(), matches);

async function materialOf(studyId: number, param: string | undefined) {
  const id = Number(param);
  const found = Number.isSafeInteger(id) ? await loadMaterial(studyId, id) : null;
  if (!found) notFound();
  return found;
}

export async function loader({ params, context }: Route.LoaderArgs) {
  const { study, access } = requireStudy(context, ["coordinator", "admin", "reviewer"]);
  const { material, constituents } = await materialOf(study.id, params.materialId);
  return { study, material, constituents, canEdit: access === "coordinator" && mayWrite("design", study.state) };
}

export async function action({ request, params, context }: Route.ActionArgs) {
  const { study, user } = requireStudy(context, ["coordinator"]);
  const { material } = await materialOf(study.id, params.materialId);
  const formData = await request.formData();
  const submission = parseWithZod(formData, { schema: materialEditorSchema });
  const units: UnitSystem = formData.get("units") === "us" ? "us" : "si";
  // The rows are checked by the same parse the editor runs as one types; their errors join the form's.
  const design = parseDesignRows(String(formData.get("code") ?? material.code), rowsFromForm(formData), units);
  if (submission.status !== "success" || !design.ok) {
    const fieldErrors: Record<string, string[]> = {};
    if (submission.status === "error") for (const [name, messages] of Object.entries(submission.error ?? {})) if (messages) fieldErrors[name] = messages;
    for (const [name, message] of Object.entries(design.errors)) fieldErrors[name] = [message];
    return refuse(submission, fieldErrors);
  }
  const { units: _, ...header } = submission.value;
  const saved = await withRefusals(submission, () => saveMaterial(study, material, { ...header, constituents: design.design.constituents }, user.id));
  if (!saved.ok) return saved.reply;
  return redirectWithToast(`/studies/${study.id}/materials/${material.id}`, "Mixture design saved.");
}

const NEW_ROW: EditorRow = { kind: "cement", name: "", lot: "" };
const fixed = (v: number | null, digits: number) => (v === null ? "—" : v.toFixed(digits));

export default function MaterialPage({ loaderData, actionData }: Route.ComponentProps) {
  const { study, material, constituents, canEdit } = loaderData;
  const [form, fields] = useSchemaForm(materialEditorSchema, {
    reply: actionData,
    id: "mixture-design",
    defaultValue: { code: material.code, description: material.description, units: "si" },
  });
  // After a refused save without scripts, the page starts from what was typed.
  const returned = form.initialValue as Record<string, unknown> | undefined;
  const [units, setUnits] = useState<UnitSystem>(returned?.units === "us" ? "us" : "si");
  const [rows, setRows] = useState<EditorRow[]>(() => (returned?.c ? rowsFromTyped(returned) : rowsFromDesign(constituents, "si")));
  const busy = useNavigation().state === "submitting";
  // The same parse the action runs: live errors and checks as the coordinator types.
  const live = useMemo(() => parseDesignRows(material.code, rows, units), [material.code, rows, units]);
  const check = live.ok ? checkMixtureDesign(live.design) : null;
  const serverErrors = Object.fromEntries(Object.entries(form.allErrors).map(([name, messages]) => [name, messages[0]]));
  const errors: Record<string, string | undefined> = { ...live.errors, ...serverErrors };

  const update = (index: number, patch: Partial<EditorRow>) => setRows((rs) => rs.map((r, i) => (i === index ? { ...r, ...patch } : r)));
  // What every typed input of a constituent row shares: its name in the form, the value as typed, its error.
  const rowInput = (i: number, row: EditorRow, field: "name" | "lot" | RowField) => ({
    id: `row-${i}-${field}`,
    name: inputName(i, field),
    value: row[field] ?? "",
    disabled: !canEdit,
    onChange: (e: ChangeEvent<HTMLInputElement>) => update(i, { [field]: e.target.value }),
    error: errors[inputName(i, field)],
  });
  const switchUnits = (next: UnitSystem) => {
    setRows((rs) => convertRows(rs, units, next));
    setUnits(next);
  };

  return (
    <div className="flex flex-col gap-6">
      <p className="text-basalt-700">
        Material {material.code}: mixture design per 1 m³ (or per 1 yd³ in US customary units), SSD basis.{" "}
        <Link to={`/studies/${study.id}/setup`} className="font-semibold text-basalt-700 underline">
          Back to setup
        </Link>
      </p>
      <p className="text-basalt-700">Local codes, specifications and licensed engineers govern the mixture; these checks support, not replace, their judgement.</p>
      <Form method="post" className="flex flex-col gap-6" {...getFormProps(form)}>
        <FormErrors errors={formWideErrors(form)} />
        <Card title="Material">
          <div className="grid gap-4 md:grid-cols-2">
            <Field label="Material code" {...fieldProps(fields.code)} disabled={!canEdit} />
            <Field label="Description" {...fieldProps(fields.description)} disabled={!canEdit} />
          </div>
        </Card>
        <Card title="Constituents">
          <fieldset className="mb-4 flex flex-wrap gap-4">
            <legend className="mb-1 font-semibold text-basalt-800">Units</legend>
            <input type="hidden" name="units" value={units} />
            {(["si", "us"] as const).map((u) => (
              <label key={u} className="flex items-center gap-2">
                <input type="radio" name="unitChoice" checked={units === u} onChange={() => switchUnits(u)} />
                {u === "si" ? "SI (kg/m³, mL/100 kg)" : "US customary (lb/yd³, fl oz/cwt)"}
              </label>
            ))}
          </fieldset>
          {errors.constituents && <Notice tone="error">{errors.constituents}</Notice>}
          <ol className="flex flex-col gap-4">
            {rows.map((row, i) => (
              <li key={i} className="rounded-md border border-basalt-100 p-3">
                <fieldset className="grid gap-3 md:grid-cols-4">
                  <legend className="font-semibold text-basalt-800">Row {i + 1}</legend>
                  <div className="flex flex-col gap-1">
                    <label htmlFor={`row-${i}-kind`} className="font-semibold text-basalt-800">
                      Kind
                    </label>
                    <select
                      id={`row-${i}-kind`}
                      name={inputName(i, "kind")}
                      value={row.kind}
                      disabled={!canEdit}
                      onChange={(e) => update(i, { kind: e.target.value as ConstituentKind })}
                      className="min-h-11 rounded-md border border-basalt-200 bg-white px-3 py-2"
                    >
                      {CONSTITUENT_KINDS.map((k) => (
                        <option key={k} value={k}>
                          {KIND_LABEL[k]}
                        </option>
                      ))}
                    </select>
                  </div>
                  <Field label="Name" {...rowInput(i, row, "name")} />
                  <Field label="Lot" {...rowInput(i, row, "lot")} />
                  {FIELDS_BY_KIND[row.kind].map((field) => (
                    <Field key={field} label={FIELD_UNITS[field].label[units]} inputMode="decimal" {...rowInput(i, row, field)} />
                  ))}
                  {check && <p className="self-end text-sm text-basalt-700">Absolute volume {check.absoluteVolume.rows[i]!.volumeM3.toFixed(4)} m³</p>}
                </fieldset>
                {canEdit && (
                  <Button type="button" variant="secondary" className="mt-2" onClick={() => setRows((rs) => rs.filter((_, j) => j !== i))}>
                    Remove row {i + 1}
                  </Button>
                )}
              </li>
            ))}
          </ol>
          {canEdit && (
            <Button type="button" variant="secondary" className="mt-4" onClick={() => setRows((rs) => [...rs, NEW_ROW])}>
              Add constituent
            </Button>
          )}
        </Card>
        <Card title="Checks">
          {check ? (
            <div aria-live="polite" className="flex flex-col gap-3">
              <DetailList
                className="grid gap-3 md:grid-cols-4"
                items={[
                  [
                    "Absolute volume",
                    `${check.absoluteVolume.totalM3.toFixed(3)} m³ per m³ (${(check.absoluteVolume.totalM3 * (M3_PER_YD3 / M3_PER_FT3)).toFixed(2)} ft³ per yd³)`,
                  ],
                  ["w/cm", fixed(check.waterCementitiousRatio, 3)],
                  ["SCM replacement", `${fixed(check.scmReplacementPercent, 1)} % of cementitious`],
                  ["Cementitious", `${check.totalCementitiousKgPerM3.toFixed(0)} kg/m³ (${kgPerM3ToLbPerYd3(check.totalCementitiousKgPerM3).toFixed(0)} lb/yd³)`],
                ]}
              />
              {check.warnings.map((w) => (
                <Notice key={w.code} tone="caution">
                  {w.message}
                </Notice>
              ))}
            </div>
          ) : (
            <p aria-live="polite">Correct the marked fields to see the absolute volume, w/cm and SCM replacement.</p>
          )}
        </Card>
        {canEdit && (
          <div>
            <Button type="submit" disabled={busy}>
              Save mixture design
            </Button>
          </div>
        )}
      </Form>
    </div>
  );
}
