import { getFormProps } from "@conform-to/react";
import { parseWithZod } from "@conform-to/zod/v4";
import { data, Form, useNavigation } from "react-router";
import type { Route } from "./+types/welcome";
import { fieldProps, FormErrors, formWideErrors, useSchemaForm } from "~/components/forms";
import { Button, Card, Field, MessagePage } from "~/components/ui";
import { firstPasswordSchema } from "~/lib/account-forms";
import { lookupWelcome, setFirstPassword, type WelcomeLookup } from "~/models/welcome.server";
import { redirectSignedIn } from "~/server/auth.server";
import { clientAddress, isLimited, LINK_MISSES, recordHit } from "~/server/rate-limit.server";

export const meta: Route.MetaFunction = () => [{ title: "Set your password · Ringbatch" }];

const REFUSAL: Record<Exclude<WelcomeLookup["status"], "valid">, { title: string; message: string; status: number }> = {
  unknown: { title: "This link is not valid", message: "Check that the whole link was copied from the e-mail, or ask your lab's contact to add you again.", status: 404 },
  used: { title: "This link has already been used", message: "Your password is set: sign in with your e-mail address and that password.", status: 410 },
  expired: { title: "This link has expired", message: "Links to set a first password work for 14 days. Ask your lab's contact to add you again.", status: 410 },
};

async function lookup(request: Request, token: string | undefined) {
  const key = clientAddress(request);
  if (await isLimited(LINK_MISSES, key)) throw data("Too many attempts: wait 15 minutes, then open the link again.", { status: 429 });
  const found = await lookupWelcome(token ?? "");
  if (found.status === "unknown") await recordHit(LINK_MISSES, key);
  return found;
}

export async function loader({ request, params }: Route.LoaderArgs) {
  const found = await lookup(request, params.token);
  if (found.status !== "valid") {
    const { title, message, status } = REFUSAL[found.status];
    return data({ refusal: { title, message }, account: null }, { status });
  }
  return { refusal: null, account: { name: found.user.name, email: found.user.email } };
}

const PASSWORD_FIELDS = ["password", "confirm"];

export async function action({ request, params }: Route.ActionArgs) {
  const found = await lookup(request, params.token);
  const submission = parseWithZod(await request.formData(), { schema: firstPasswordSchema });
  // The passwords are never sent back into the page.
  const refusal = (formErrors: string[] | undefined, status: number) => data({ result: submission.reply({ hideFields: PASSWORD_FIELDS, ...(formErrors && { formErrors }) }) }, { status });
  if (found.status !== "valid") return refusal([REFUSAL[found.status].title], REFUSAL[found.status].status);
  if (submission.status !== "success") return refusal(undefined, 400);
  if (!(await setFirstPassword(found, submission.value.password))) return refusal([REFUSAL.used.title], REFUSAL.used.status);
  return redirectSignedIn(found.user.id, "/lab");
}

export default function Welcome({ loaderData, actionData }: Route.ComponentProps) {
  const { refusal, account } = loaderData;
  const [form, fields] = useSchemaForm(firstPasswordSchema, { reply: actionData, id: "first-password" });
  const busy = useNavigation().state === "submitting";
  if (refusal) return <MessagePage title={refusal.title} message={refusal.message} />;
  return (
    <div className="mx-auto flex max-w-md flex-col gap-4">
      <h1 className="text-2xl font-bold">Welcome, {account!.name}</h1>
      <p>Set your password. You will sign in with {account!.email} and this password.</p>
      <Card>
        <Form method="post" className="flex flex-col gap-4" {...getFormProps(form)}>
          <FormErrors errors={formWideErrors(form)} />
          <Field label="New password" type="password" autoComplete="new-password" hint="At least 12 characters" {...fieldProps(fields.password)} />
          <Field label="Repeat the password" type="password" autoComplete="new-password" {...fieldProps(fields.confirm)} />
          <Button type="submit" disabled={busy}>
            Set password and sign in
          </Button>
        </Form>
      </Card>
    </div>
  );
}
