/** The study's own fields, shared by the new-study form and the setup page. */
import type { FieldMetadata } from "@conform-to/react";
import { fieldProps } from "~/components/forms";
import { Field, SelectField, TextAreaField } from "~/components/ui";

type StudyFieldName =
  | "code"
  | "title"
  | "testMethod"
  | "replicatesPerCell"
  | "significanceLevel"
  | "targetSurfaceRating"
  | "specimenVolumeM3"
  | "wastePercent"
  | "enrollmentDeadline"
  | "shipDate"
  | "resultsDue"
  | "notes";

/** The Conform fields of a form built on `studyFields` (from `~/lib/study-forms`). */
export type StudyFieldsMeta = { [Name in StudyFieldName]: FieldMetadata<unknown> };

const SURFACE_RATINGS = [
  { value: "", label: "None (not a float finishing study)" },
  { value: "1", label: "1 — smoothest" },
  { value: "2", label: "2" },
  { value: "3", label: "3" },
];

/** `fixed` names fields the study's state no longer lets change, with the sentence shown beside them (they stay read-only). */
export function StudyFields({ fields, fixed = {} }: { fields: StudyFieldsMeta; fixed?: Partial<Record<"replicatesPerCell" | "significanceLevel", string>> }) {
  return (
    <div className="grid gap-4 md:grid-cols-2">
      <Field label="Study code" hint="Letters, digits and hyphens, e.g. FF-2027-A" {...fieldProps(fields.code)} />
      <Field label="Title" {...fieldProps(fields.title)} />
      <Field label="Test method" {...fieldProps(fields.testMethod)} />
      <Field
        label="Replicates per cell"
        type="number"
        inputMode="numeric"
        readOnly={Boolean(fixed.replicatesPerCell)}
        hint={fixed.replicatesPerCell}
        {...fieldProps(fields.replicatesPerCell)}
      />
      <Field
        label="Significance level for consistency flags"
        inputMode="decimal"
        readOnly={Boolean(fixed.significanceLevel)}
        hint={fixed.significanceLevel ?? "E691 uses 0.005"}
        {...fieldProps(fields.significanceLevel)}
      />
      <Field
        label="Specimen volume (m³)"
        inputMode="decimal"
        hint="Concrete in one specimen; the float finishing form, 3 ft × 2 ft × 3 in, takes 0.0425 m³"
        {...fieldProps(fields.specimenVolumeM3)}
      />
      <Field label="Waste allowance (%)" inputMode="decimal" hint="Extra concrete for spillage and what sticks to the mixer" {...fieldProps(fields.wastePercent)} />
      <SelectField label="Target surface rating (1–3 visual scale)" options={SURFACE_RATINGS} {...fieldProps(fields.targetSurfaceRating)} />
      <Field label="Enrollment deadline" type="date" {...fieldProps(fields.enrollmentDeadline)} />
      <Field label="Ship date" type="date" {...fieldProps(fields.shipDate)} />
      <Field label="Results due" type="date" {...fieldProps(fields.resultsDue)} />
      <div className="md:col-span-2">
        <TextAreaField label="Notes" {...fieldProps(fields.notes)} />
      </div>
    </div>
  );
}
