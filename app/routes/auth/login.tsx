import { data, Form, redirect, useNavigation, useSearchParams } from "react-router";
import type { Route } from "./+types/login";
import { Button, Card, Field, Notice } from "~/components/ui";
import { SignInError, signIn } from "~/server/auth.server";
import { getUser } from "~/server/guards.server";
import { HOME_BY_ROLE } from "~/models/user.server";

export const meta: Route.MetaFunction = () => [{ title: "Sign in · Ringbatch" }];

export async function loader({ request }: Route.LoaderArgs) {
  const user = await getUser(request);
  if (user) throw redirect(HOME_BY_ROLE[user.role]);
  return null;
}

export async function action({ request }: Route.ActionArgs) {
  const redirectTo = new URL(request.url).searchParams.get("redirectTo");
  try {
    return await signIn(request, redirectTo);
  } catch (error) {
    if (error instanceof SignInError) return data({ error: error.message }, { status: error.status });
    throw error;
  }
}

export default function Login({ actionData }: Route.ComponentProps) {
  const navigation = useNavigation();
  const [searchParams] = useSearchParams();
  const redirectTo = searchParams.get("redirectTo");
  return (
    <div className="mx-auto max-w-md">
      <h1 className="mb-2 text-2xl font-bold">Sign in</h1>
      <p className="mb-6 text-basalt-700">
        Ringbatch runs interlaboratory studies of concrete test methods: coordinators, lab analysts and committee
        reviewers each sign in to their own pages.
      </p>
      <Card>
        <Form method="post" action={redirectTo ? `/login?redirectTo=${encodeURIComponent(redirectTo)}` : "/login"} className="flex flex-col gap-4">
          {actionData?.error && <Notice tone="error">{actionData.error}</Notice>}
          <Field label="E-mail" name="email" type="email" autoComplete="username" required />
          <Field label="Password" name="password" type="password" autoComplete="current-password" required />
          <Button type="submit" disabled={navigation.state === "submitting"}>
            {navigation.state === "submitting" ? "Signing in…" : "Sign in"}
          </Button>
        </Form>
      </Card>
    </div>
  );
}
