import { SimpleTable } from "~/components/ui";

/** A labelled multi-line field with its hint and error beside it, like Field for single lines. */
export function TextAreaField({
  name,
  label,
  error,
  defaultValue,
  hint,
  rows = 4,
}: {
  name: string;
  label: string;
  error?: string;
  defaultValue?: string;
  hint?: string;
  rows?: number;
}) {
  const id = `field-${name}`;
  return (
    <div className="flex flex-col gap-1">
      <label htmlFor={id} className="font-semibold text-basalt-800">
        {label}
      </label>
      {hint && (
        <p id={`${id}-hint`} className="text-sm text-basalt-700">
          {hint}
        </p>
      )}
      <textarea
        id={id}
        name={name}
        rows={rows}
        defaultValue={defaultValue}
        aria-invalid={error ? true : undefined}
        aria-describedby={[error ? `${id}-error` : null, hint ? `${id}-hint` : null].filter(Boolean).join(" ") || undefined}
        className={`rounded-md border bg-white px-3 py-2 ${error ? "border-signal-700" : "border-basalt-200"}`}
      />
      {error && (
        <p id={`${id}-error`} className="text-sm font-semibold text-signal-700">
          {error}
        </p>
      )}
    </div>
  );
}

/** The standing caution on every page that carries a precision statement. */
export function StatementCaution() {
  return (
    <p className="rounded-md border-l-4 border-ochre-600 bg-ochre-100 px-4 py-3 text-ochre-800">
      A precision statement from Ringbatch supports, and does not replace, the procedures of the standards body and the judgement of licensed
      engineers; local codes and specifications govern the acceptance of concrete.
    </p>
  );
}

export function StatementTexts({ textE691, textC670 }: { textE691: string; textC670: string }) {
  return (
    <div className="grid gap-4 lg:grid-cols-2">
      {(
        [
          ["E691 form", textE691],
          ["C670 form", textC670],
        ] as const
      ).map(([title, text]) => (
        <div key={title}>
          <h3 className="mb-1 font-semibold text-basalt-800">{title}</h3>
          <div className="whitespace-pre-line rounded border border-basalt-100 bg-basalt-50 p-3">{text}</div>
        </div>
      ))}
    </div>
  );
}

export function ExcludedCells({ excluded }: { excluded: { lab: string; material: string; response: string; reason: string }[] }) {
  return excluded.length === 0 ? (
    <p>No cell was excluded.</p>
  ) : (
    <SimpleTable caption="Cells left out of the analysis" headers={["Lab", "Material", "Response", "Reason"]} rows={excluded.map((e) => [e.lab, e.material, e.response, e.reason])} />
  );
}
