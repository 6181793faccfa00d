/** The study's own fields, shared by the new-study form and the setup page. */
import { Field, SelectField, TextAreaField } from "~/components/ui";
import type { FieldErrors } from "~/lib/forms";

export type StudyFieldValues = {
  code: string;
  title: string;
  testMethod: string;
  replicatesPerCell: string;
  significanceLevel: string;
  targetSurfaceRating: string;
  enrollmentDeadline: string;
  shipDate: string;
  resultsDue: string;
  notes: string;
};

/** `fixed` names fields the study's state no longer lets change, with the sentence shown beside them (they stay read-only). */
export function StudyFields({ values, errors, fixed = {} }: { values: Partial<StudyFieldValues>; errors: FieldErrors; fixed?: Partial<Record<"replicatesPerCell" | "significanceLevel", string>> }) {
  return (
    <div className="grid gap-4 md:grid-cols-2">
      <Field label="Study code" name="code" defaultValue={values.code} error={errors.code} hint="Letters, digits and hyphens, e.g. FF-2027-A" required />
      <Field label="Title" name="title" defaultValue={values.title} error={errors.title} required />
      <Field label="Test method" name="testMethod" defaultValue={values.testMethod} error={errors.testMethod} required />
      <Field
        label="Replicates per cell"
        name="replicatesPerCell"
        type="number"
        inputMode="numeric"
        min={2}
        max={10}
        defaultValue={values.replicatesPerCell}
        error={errors.replicatesPerCell}
        readOnly={Boolean(fixed.replicatesPerCell)}
        hint={fixed.replicatesPerCell}
        required
      />
      <Field
        label="Significance level for consistency flags"
        name="significanceLevel"
        inputMode="decimal"
        defaultValue={values.significanceLevel}
        error={errors.significanceLevel}
        readOnly={Boolean(fixed.significanceLevel)}
        hint={fixed.significanceLevel ?? "E691 uses 0.005"}
        required
      />
      <SelectField
        label="Target surface rating (1–3 visual scale)"
        name="targetSurfaceRating"
        defaultValue={values.targetSurfaceRating}
        error={errors.targetSurfaceRating}
        options={[
          { value: "", label: "None (not a float finishing study)" },
          { value: "1", label: "1 — smoothest" },
          { value: "2", label: "2" },
          { value: "3", label: "3" },
        ]}
      />
      <Field label="Enrollment deadline" name="enrollmentDeadline" type="date" defaultValue={values.enrollmentDeadline} error={errors.enrollmentDeadline} />
      <Field label="Ship date" name="shipDate" type="date" defaultValue={values.shipDate} error={errors.shipDate} />
      <Field label="Results due" name="resultsDue" type="date" defaultValue={values.resultsDue} error={errors.resultsDue} />
      <div className="md:col-span-2">
        <TextAreaField label="Notes" name="notes" defaultValue={values.notes} error={errors.notes} />
      </div>
    </div>
  );
}
