import { getFormProps } from "@conform-to/react";
import { parseWithZod } from "@conform-to/zod/v4";
import { data, Form, useNavigation } from "react-router";
import type { Route } from "./+types/setup";
import { fieldProps, FormErrors, useSchemaForm } from "~/components/forms";
import { Button, Card, Field, MessagePage } from "~/components/ui";
import { firstAdminSchema, SETUP_LINK_MINUTES } from "~/lib/first-admin-form";
import { createFirstAdmin, setupLinkValid } from "~/models/first-use.server";
import { redirectSignedIn } from "~/server/auth.server";
import { refuse, withRefusals } from "~/server/form-reply.server";
import { clientAddress, isLimited, LINK_MISSES, recordHit } from "~/server/rate-limit.server";

export const meta: Route.MetaFunction = () => [{ title: "Create the first administrator · Ringbatch" }];

const GONE = {
  title: "This setup link does not work",
  message: `A setup link works once, for ${SETUP_LINK_MINUTES} minutes, and only while the database has no accounts. Start the server again to print a new one.`,
};

async function checkLink(request: Request, token: string | undefined) {
  const address = clientAddress(request);
  if (await isLimited(LINK_MISSES, address)) throw data("Too many attempts: wait 15 minutes, then open the link again.", { status: 429 });
  const valid = await setupLinkValid(token ?? "");
  if (!valid) await recordHit(LINK_MISSES, address);
  return valid;
}

export async function loader({ request, params }: Route.LoaderArgs) {
  if (!(await checkLink(request, params.token))) return data({ gone: true }, { status: 404 });
  return { gone: false };
}

export async function action({ request, params }: Route.ActionArgs) {
  if (!(await checkLink(request, params.token))) return data({ gone: true }, { status: 404 });
  const submission = parseWithZod(await request.formData(), { schema: firstAdminSchema });
  if (submission.status !== "success") return refuse(submission);
  const created = await withRefusals(submission, () => createFirstAdmin(params.token, submission.value));
  if (!created.ok) return created.reply;
  return redirectSignedIn(created.value.id, "/admin/users");
}

export default function Setup({ loaderData, actionData }: Route.ComponentProps) {
  const busy = useNavigation().state === "submitting";
  const [form, fields] = useSchemaForm(firstAdminSchema, { reply: actionData, id: "first-admin" });
  if (loaderData.gone) return <MessagePage title={GONE.title} message={GONE.message} />;
  return (
    <div className="mx-auto flex max-w-md flex-col gap-4">
      <h1 className="text-2xl font-bold">Create the first administrator</h1>
      <p>
        This database has no accounts yet. The administrator you create here adds labs, coordinators and reviewers. The
        link works once.
      </p>
      <Card>
        <Form method="post" className="flex flex-col gap-4" {...getFormProps(form)}>
          <FormErrors errors={form.errors} />
          <Field label="Your name" autoComplete="name" {...fieldProps(fields.name)} />
          <Field label="E-mail" type="email" autoComplete="username" {...fieldProps(fields.email)} />
          <Field label="Password" type="password" autoComplete="new-password" hint="At least 12 characters" {...fieldProps(fields.password)} />
          <Field label="Repeat the password" type="password" autoComplete="new-password" {...fieldProps(fields.confirm)} />
          <Button type="submit" disabled={busy}>
            Create administrator and sign in
          </Button>
        </Form>
      </Card>
    </div>
  );
}
