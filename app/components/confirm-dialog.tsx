/**
 * A step that cannot be undone, behind a second look: the button opens a
 * native dialog that says what will happen, and only the dialog's own button
 * submits the surrounding form. Place it inside the <Form> it submits.
 */
import { type ReactNode, useId, useRef } from "react";
import { Button } from "~/components/ui";

export function ConfirmStep({
  label,
  title,
  consequences,
  confirmLabel,
  variant = "primary",
  disabled,
  name,
  value,
}: {
  label: string;
  title: string;
  consequences: ReactNode;
  confirmLabel: string;
  variant?: "primary" | "danger" | "secondary";
  disabled?: boolean;
  /** Sent with the form when the person confirms, e.g. confirmUnusual=yes. */
  name?: string;
  value?: string;
}) {
  const dialog = useRef<HTMLDialogElement>(null);
  const headingId = useId();
  return (
    <>
      <Button type="button" variant={variant} disabled={disabled} onClick={() => dialog.current?.showModal()}>
        {label}
      </Button>
      <dialog ref={dialog} aria-labelledby={headingId} className="m-auto max-w-lg rounded-md p-6 shadow-lg backdrop:bg-basalt-900/40">
        <h2 id={headingId} className="mb-3 text-lg font-semibold">
          {title}
        </h2>
        <div className="mb-4 grid gap-2 text-basalt-800">{consequences}</div>
        <div className="flex flex-wrap justify-end gap-3">
          <Button type="button" variant="secondary" onClick={() => dialog.current?.close()}>
            Go back
          </Button>
          <Button type="submit" variant={variant} name={name} value={value} onClick={() => dialog.current?.close()}>
            {confirmLabel}
          </Button>
        </div>
      </dialog>
    </>
  );
}
