import { getFormProps } from "@conform-to/react";
import { parseWithZod } from "@conform-to/zod/v4";
import { Form, Link, redirect, useNavigation } from "react-router";
import type { Route } from "./+types/forgot-password";
import { fieldProps, FormErrors, useSchemaForm } from "~/components/forms";
import { Button, Card, Field } from "~/components/ui";
import { passwordResetRequestSchema } from "~/lib/account-forms";
import { requestPasswordReset } from "~/models/password-link.server";
import { HOME_BY_ROLE, normaliseEmail } from "~/models/user.server";
import { refuse } from "~/server/form-reply.server";
import { getUser } from "~/server/guards.server";
import { ACCOUNT_RESET_REQUESTS, ADDRESS_RESET_REQUESTS, clientAddress, consume } from "~/server/rate-limit.server";

export const meta: Route.MetaFunction = () => [{ title: "Forgot your password? · Ringbatch" }];

export async function loader({ request }: Route.LoaderArgs) {
  const user = await getUser(request);
  if (user) throw redirect(HOME_BY_ROLE[user.role]);
  return { email: new URL(request.url).searchParams.get("email") ?? "" };
}

export async function action({ request }: Route.ActionArgs) {
  const submission = parseWithZod(await request.formData(), { schema: passwordResetRequestSchema });
  if (submission.status !== "success") return refuse(submission);
  const address = await consume(ADDRESS_RESET_REQUESTS, clientAddress(request));
  if (!address.allowed) {
    return refuse(submission, { email: [`Too many requests from this address. Wait ${Math.ceil(address.retryAfterSeconds / 60)} minutes, then try again.`] }, 429);
  }
  const email = normaliseEmail(submission.value.email);
  // Past the per-account limit nothing more is sent, but the answer stays the same.
  if ((await consume(ACCOUNT_RESET_REQUESTS, email)).allowed) await requestPasswordReset(email, request);
  return { sentTo: email };
}

export default function ForgotPassword({ loaderData, actionData }: Route.ComponentProps) {
  const busy = useNavigation().state === "submitting";
  const [form, fields] = useSchemaForm(passwordResetRequestSchema, { reply: actionData, id: "forgot-password", defaultValue: { email: loaderData.email } });
  if (actionData && "sentTo" in actionData) {
    return (
      <div className="mx-auto flex max-w-md flex-col gap-4">
        <h1 className="text-2xl font-bold">Check your e-mail</h1>
        <p role="status">
          If {actionData.sentTo} belongs to an active Ringbatch account, a link to set a new password is on its way. It works once, for 30 minutes.
        </p>
        <p>Nothing arrived after a few minutes? Check the spam folder, or ask your study coordinator or an administrator.</p>
        <Link to="/login" className="font-semibold text-basalt-700 underline">
          Back to sign in
        </Link>
      </div>
    );
  }
  return (
    <div className="mx-auto flex max-w-md flex-col gap-4">
      <h1 className="text-2xl font-bold">Forgot your password?</h1>
      <p>Enter the e-mail address you sign in with. We send a link to set a new password.</p>
      <Card>
        <Form method="post" className="flex flex-col gap-4" {...getFormProps(form)}>
          <FormErrors errors={form.errors} />
          <Field label="E-mail" type="email" autoComplete="username" {...fieldProps(fields.email)} />
          <Button type="submit" disabled={busy}>
            Send the link
          </Button>
        </Form>
      </Card>
      <Link to="/login" className="font-semibold text-basalt-700 underline">
        Back to sign in
      </Link>
    </div>
  );
}
