import { getFormProps } from "@conform-to/react";
import { Form, useNavigation } from "react-router";
import { FormErrors, formWideErrors, NewPasswordFields, useSchemaForm } from "~/components/forms";
import { Button, Card, MessagePage } from "~/components/ui";
import { firstPasswordSchema } from "~/lib/account-forms";

type Props = {
  loaderData: { refusal: { title: string; message: string } | null; account: { name: string; email: string } | null };
  actionData: unknown;
  title: (name: string) => string;
  label: string;
};

/** The page an e-mailed password link opens: a refusal that says why, or the new password typed twice. */
export function SetPasswordPage({ loaderData, actionData, title, label }: Props) {
  const { refusal, account } = loaderData;
  const [form, fields] = useSchemaForm(firstPasswordSchema, { reply: actionData, id: "set-password" });
  const busy = useNavigation().state === "submitting";
  if (refusal || !account) return <MessagePage title={refusal?.title ?? "This link is not valid"} message={refusal?.message ?? ""} />;
  return (
    <div className="mx-auto flex max-w-md flex-col gap-4">
      <h1 className="text-2xl font-bold">{title(account.name)}</h1>
      <p>You will sign in with {account.email} and this password.</p>
      <Card>
        <Form method="post" className="flex flex-col gap-4" {...getFormProps(form)}>
          <FormErrors errors={formWideErrors(form)} />
          <NewPasswordFields label={label} password={fields.password} confirm={fields.confirm} />
          <Button type="submit" disabled={busy}>
            Set password and sign in
          </Button>
        </Form>
      </Card>
    </div>
  );
}
