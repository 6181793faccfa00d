/**
 * Checks a form in the browser with the same zod schema its action uses, so a
 * mistake is shown beside its field before anything is sent. The server checks
 * again; its errors win once it has answered.
 */
import { type FormEvent, useState } from "react";
import type { z } from "zod";
import { type FieldErrors, parseForm } from "~/lib/forms";

export function useSchemaCheck(schema: z.ZodType, serverErrors: FieldErrors) {
  const [browserErrors, setBrowserErrors] = useState<FieldErrors | null>(null);
  // A new answer from the server replaces what the browser found (compared by content: callers rebuild the object).
  const serverKey = JSON.stringify(serverErrors);
  const [answered, setAnswered] = useState(serverKey);
  if (answered !== serverKey) {
    setAnswered(serverKey);
    setBrowserErrors(null);
  }
  const onSubmit = (event: FormEvent<HTMLFormElement>) => {
    const formData = new FormData(event.currentTarget);
    const submitter = (event.nativeEvent as SubmitEvent).submitter;
    if (submitter instanceof HTMLButtonElement && submitter.name) formData.set(submitter.name, submitter.value);
    const checked = parseForm(schema, formData);
    if (checked.ok) {
      setBrowserErrors(null);
      return;
    }
    event.preventDefault();
    setBrowserErrors(checked.errors);
  };
  return { errors: browserErrors ?? serverErrors, onSubmit };
}
