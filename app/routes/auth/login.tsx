import { getFormProps } from "@conform-to/react";
import { parseWithZod } from "@conform-to/zod/v4";
import { data, Form, Link, redirect, useNavigation, useSearchParams } from "react-router";
import type { Route } from "./+types/login";
import { fieldProps, FormErrors, useSchemaForm } from "~/components/forms";
import { Button, Card, Field } from "~/components/ui";
import { signInSchema } from "~/lib/account-forms";
import { HOME_BY_ROLE } from "~/models/user.server";
import { SignInError, signIn } from "~/server/auth.server";
import { refuse } from "~/server/form-reply.server";
import { getUser } from "~/server/guards.server";

export const meta: Route.MetaFunction = () => [{ title: "Sign in · Ringbatch" }];

export async function loader({ request }: Route.LoaderArgs) {
  const user = await getUser(request);
  if (user) throw redirect(HOME_BY_ROLE[user.role]);
  return null;
}

export async function action({ request }: Route.ActionArgs) {
  // The sign-in strategy reads the body itself; the form is checked on a copy first.
  const submission = parseWithZod(await request.clone().formData(), { schema: signInSchema });
  if (submission.status !== "success") return refuse(submission);
  const redirectTo = new URL(request.url).searchParams.get("redirectTo");
  try {
    return await signIn(request, redirectTo);
  } catch (error) {
    if (!(error instanceof SignInError)) throw error;
    return data({ result: submission.reply({ formErrors: [error.message], hideFields: ["password"] }) }, { status: error.status });
  }
}

export default function Login({ actionData }: Route.ComponentProps) {
  const navigation = useNavigation();
  const [searchParams] = useSearchParams();
  const redirectTo = searchParams.get("redirectTo");
  // An invitation's link brings the invited address along (`?email=`).
  const invitedEmail = searchParams.get("email") ?? undefined;
  const [form, fields] = useSchemaForm(signInSchema, { reply: actionData, id: "sign-in", defaultValue: { email: invitedEmail } });
  return (
    <div className="mx-auto max-w-md">
      <h1 className="mb-2 text-2xl font-bold">Sign in</h1>
      <p className="mb-6 text-basalt-700">
        Ringbatch runs interlaboratory studies of concrete test methods: coordinators, lab analysts and committee
        reviewers each sign in to their own pages.
      </p>
      <Card>
        <Form
          method="post"
          action={redirectTo ? `/login?redirectTo=${encodeURIComponent(redirectTo)}` : "/login"}
          className="flex flex-col gap-4"
          {...getFormProps(form)}
        >
          <FormErrors errors={form.errors} />
          <Field label="E-mail" type="email" autoComplete="username" {...fieldProps(fields.email)} />
          <Field label="Password" type="password" autoComplete="current-password" {...fieldProps(fields.password)} />
          <Button type="submit" disabled={navigation.state === "submitting"}>
            {navigation.state === "submitting" ? "Signing in…" : "Sign in"}
          </Button>
        </Form>
      </Card>
      <p className="mt-4">
        <Link to={invitedEmail ? `/forgot-password?email=${encodeURIComponent(invitedEmail)}` : "/forgot-password"} className="font-semibold text-basalt-700 underline">
          Forgot your password?
        </Link>
      </p>
    </div>
  );
}
