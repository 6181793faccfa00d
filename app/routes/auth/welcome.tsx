import { data, Form, useNavigation } from "react-router";
import { z } from "zod";
import type { Route } from "./+types/welcome";
import { Button, Card, Field, MessagePage, Notice } from "~/components/ui";
import { redirectSignedIn } from "~/server/auth.server";
import { type ActionResult, FieldRefusal, formState, handleForm, refused } from "~/lib/form-results";
import { clientAddress, isLimited, LINK_MISSES, recordHit } from "~/server/rate-limit.server";
import { newPasswordField } from "~/lib/validation";
import { lookupWelcome, setFirstPassword, type WelcomeLookup } from "~/models/welcome.server";

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

const passwordSchema = z
  .object({ password: newPasswordField, confirm: z.string() })
  .refine((v) => v.password === v.confirm, { path: ["confirm"], message: "The two passwords differ." });

export async function action({ request, params }: Route.ActionArgs) {
  const found = await lookup(request, params.token);
  if (found.status !== "valid") return refused("password", { form: REFUSAL[found.status].title }, {}, REFUSAL[found.status].status);
  return handleForm("password", passwordSchema, await request.formData(), async ({ password }) => {
    if (!(await setFirstPassword(found, password))) throw new FieldRefusal("form", REFUSAL.used.title);
    return redirectSignedIn(found.user.id, "/lab");
  });
}

export default function Welcome({ loaderData, actionData }: Route.ComponentProps) {
  const { refusal, account } = loaderData;
  const state = formState(actionData as ActionResult | undefined, "password");
  const busy = useNavigation().state === "submitting";
  if (refusal) return <MessagePage title={refusal.title} message={refusal.message} />;
  return (
    <div className="mx-auto flex max-w-md flex-col gap-4">
      <h1 className="text-2xl font-bold">Welcome, {account!.name}</h1>
      <p>Set your password. You will sign in with {account!.email} and this password.</p>
      {state.errors.form && <Notice tone="error">{state.errors.form}</Notice>}
      <Card>
        <Form method="post" className="flex flex-col gap-4">
          <Field label="New password" name="password" type="password" autoComplete="new-password" hint="At least 12 characters" error={state.errors.password} required />
          <Field label="Repeat the password" name="confirm" type="password" autoComplete="new-password" error={state.errors.confirm} required />
          <Button type="submit" disabled={busy}>
            Set password and sign in
          </Button>
        </Form>
      </Card>
    </div>
  );
}
