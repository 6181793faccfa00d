/** Small shared building blocks, styled once so every page looks alike. */
import type { ComponentProps, ReactNode } from "react";
import { readsAsOneWord } from "~/lib/format";

export function PageHeader({ title, subtitle, actions }: { title: string; subtitle?: ReactNode; actions?: ReactNode }) {
  return (
    <div className="mb-6 flex flex-wrap items-end justify-between gap-4">
      <div>
        <h1 className="text-2xl font-bold text-basalt-900">{title}</h1>
        {subtitle && <p className="mt-1 text-basalt-700">{subtitle}</p>}
      </div>
      {actions && <div className="flex gap-2">{actions}</div>}
    </div>
  );
}

/** A page that only says something: a refused link, a finished step. */
export function MessagePage({ title, message }: { title: string; message: ReactNode }) {
  return (
    <div className="mx-auto max-w-xl">
      <h1 className="mb-2 text-2xl font-bold">{title}</h1>
      <p className="text-basalt-700">{message}</p>
    </div>
  );
}

export function Card({ title, children, className = "" }: { title?: string; children: ReactNode; className?: string }) {
  return (
    <section className={`rounded-lg border border-basalt-100 bg-white p-5 shadow-sm ${className}`}>
      {title && <h2 className="mb-3 text-lg font-semibold text-basalt-800">{title}</h2>}
      {children}
    </section>
  );
}

const BUTTON_STYLES = {
  primary: "bg-basalt-700 text-white hover:bg-basalt-800",
  secondary: "border border-basalt-500 bg-white text-basalt-800 hover:bg-basalt-50",
  danger: "bg-signal-700 text-white hover:brightness-110",
} as const;

export type ButtonVariant = keyof typeof BUTTON_STYLES;

export function Button({
  variant = "primary",
  className = "",
  ...props
}: ComponentProps<"button"> & { variant?: ButtonVariant }) {
  return (
    <button
      className={`inline-flex min-h-11 items-center justify-center rounded-md px-4 py-2 font-semibold disabled:opacity-60 ${BUTTON_STYLES[variant]} ${className}`}
      {...props}
    />
  );
}

/** What every form control shares: its label above, then its hint and its error message below. */
// min-w-0 here and w-full on a select let a field narrow with its column: a select is otherwise as wide as its longest option, which pushed phone pages sideways.
function FieldFrame({ id, label, hint, error, children }: { id: string; label: string; hint?: string; error?: string; children: ReactNode }) {
  return (
    <div className="flex min-w-0 flex-col gap-1">
      <label htmlFor={id} className="font-semibold text-basalt-800">
        {label}
      </label>
      {children}
      {hint && (
        <p id={`${id}-hint`} className="text-sm text-basalt-700">
          {hint}
        </p>
      )}
      <FieldError id={id} error={error} />
    </div>
  );
}

/** A field's error message, which its control names in `aria-describedby`. */
function FieldError({ id, error }: { id: string; error?: string }) {
  return error ? (
    <p id={`${id}-error`} className="text-sm font-semibold text-signal-700">
      {error}
    </p>
  ) : null;
}

/** The attributes that tie a control to its frame's hint and error. */
function controlProps(id: string, name: string, error?: string, hint?: string) {
  const describedBy = [error ? `${id}-error` : null, hint ? `${id}-hint` : null].filter(Boolean).join(" ") || undefined;
  return { id, name, "aria-invalid": error ? true : undefined, "aria-describedby": describedBy };
}

const borderFor = (error?: string) => (error ? "border-signal-700" : "border-basalt-200");

/** A labelled input with its hint and its error message right below it. */
export function Field({
  label,
  name,
  error,
  hint,
  ...input
}: ComponentProps<"input"> & { label: string; name: string; error?: string; hint?: string }) {
  const id = input.id ?? `field-${name}`;
  return (
    <FieldFrame id={id} label={label} hint={hint} error={error}>
      <input
        {...controlProps(id, name, error, hint)}
        className={`min-h-11 rounded-md border bg-white px-3 py-2 text-basalt-900 ${borderFor(error)}`}
        {...input}
      />
    </FieldFrame>
  );
}

/** A labelled multi-line input, with its hint and its error message below it. */
export function TextAreaField({
  label,
  name,
  error,
  hint,
  rows = 4,
  ...textarea
}: ComponentProps<"textarea"> & { label: string; name: string; error?: string; hint?: string }) {
  const id = textarea.id ?? `field-${name}`;
  return (
    <FieldFrame id={id} label={label} hint={hint} error={error}>
      <textarea {...controlProps(id, name, error, hint)} rows={rows} className={`rounded-md border bg-white px-3 py-2 ${borderFor(error)}`} {...textarea} />
    </FieldFrame>
  );
}

export function SelectField({
  label,
  name,
  error,
  options,
  ...select
}: ComponentProps<"select"> & { label: string; name: string; error?: string; options: { value: string; label: string }[] }) {
  const id = select.id ?? `field-${name}`;
  return (
    <FieldFrame id={id} label={label} error={error}>
      <select {...controlProps(id, name, error)} className={`min-h-11 w-full rounded-md border bg-white px-3 py-2 ${borderFor(error)}`} {...select}>
        {options.map((o) => (
          <option key={o.value} value={o.value}>
            {o.label}
          </option>
        ))}
      </select>
    </FieldFrame>
  );
}

/**
 * A choice among a few options shown side by side as radio buttons, with its
 * error message below. Left to itself it starts at `defaultValue`; a page that
 * reacts to the choice passes `value` and `onChange`.
 */
export function RadioField({
  label,
  id,
  name,
  options,
  defaultValue,
  error,
  value,
  onChange,
}: {
  label: string;
  id: string;
  name: string;
  options: readonly { value: string; label: string }[];
  defaultValue?: string;
  error?: string;
  value?: string;
  onChange?: (value: string) => void;
}) {
  const checkedState = (option: string) => (onChange ? { checked: value === option, onChange: () => onChange(option) } : { defaultChecked: defaultValue === option });
  return (
    <fieldset aria-describedby={error ? `${id}-error` : undefined}>
      <legend className="mb-1 font-semibold text-basalt-800">{label}</legend>
      <div className="flex flex-wrap gap-4">
        {options.map((o) => (
          <label key={o.value} className="inline-flex min-h-11 items-center gap-2">
            <input type="radio" name={name} value={o.value} className="size-5" {...checkedState(o.value)} />
            {o.label}
          </label>
        ))}
      </div>
      <FieldError id={id} error={error} />
    </fieldset>
  );
}

const NOTICE_STYLES = {
  info: "border-basalt-200 bg-basalt-50 text-basalt-900",
  success: "border-leaf-700 bg-leaf-100 text-leaf-700",
  error: "border-signal-700 bg-signal-100 text-signal-700",
  caution: "border-ochre-600 bg-ochre-100 text-ochre-800",
} as const;

export function Notice({ tone = "info", children }: { tone?: keyof typeof NOTICE_STYLES; children: ReactNode }) {
  return (
    <div role={tone === "error" ? "alert" : "status"} className={`rounded-md border-l-4 px-4 py-3 ${NOTICE_STYLES[tone]}`}>
      {children}
    </div>
  );
}

export function Badge({ children, tone = "neutral" }: { children: ReactNode; tone?: "neutral" | "ochre" | "leaf" | "signal" }) {
  const styles = {
    neutral: "bg-basalt-100 text-basalt-800",
    ochre: "bg-ochre-100 text-ochre-800",
    leaf: "bg-leaf-100 text-leaf-700",
    signal: "bg-signal-100 text-signal-700",
  }[tone];
  return <span className={`inline-block rounded px-2 py-0.5 text-sm font-semibold ${styles}`}>{children}</span>;
}

/** A cell that is a code, a date or a figure keeps to one line. */
export const oneWordCell = (cell: ReactNode) => (typeof cell === "string" || typeof cell === "number") && readsAsOneWord(String(cell));

/** A plain table with accessible headers; pages pass header labels and rows. */
export function SimpleTable({ caption, headers, rows }: { caption: string; headers: string[]; rows: ReactNode[][] }) {
  return (
    // A wide table scrolls sideways; the region takes focus so a keyboard can scroll it too.
    <div className="relative overflow-x-auto" role="region" aria-label={caption} tabIndex={0}>
      <table className="w-full border-collapse text-left">
        <caption className="sr-only">{caption}</caption>
        <thead>
          <tr className="border-b-2 border-basalt-200">
            {headers.map((h) => (
              <th key={h} scope="col" className="px-3 py-2 font-semibold text-basalt-800">
                {h}
              </th>
            ))}
          </tr>
        </thead>
        <tbody>
          {rows.map((row, i) => (
            <tr key={i} className="border-b border-basalt-100">
              {row.map((cell, j) => (
                <td key={j} className={`px-3 py-2 align-top ${oneWordCell(cell) ? "keep-whole" : ""}`}>
                  {cell}
                </td>
              ))}
            </tr>
          ))}
        </tbody>
      </table>
    </div>
  );
}
