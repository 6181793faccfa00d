import type { Route } from "./+types/new";
import { fieldProps, PostForm, useSchemaForm } from "~/components/forms";
import { Card, Field, PageHeader, SelectField, TextAreaField } from "~/components/ui";
import { newRoundSchema } from "~/lib/round-forms";
import { createRound, publishedPrecisionStudies } from "~/models/round.server";
import { submitForm } from "~/server/form-reply.server";
import { requireRole } from "~/server/guards.server";
import { redirectWithToast } from "~/server/toast.server";

export const meta: Route.MetaFunction = () => [{ title: "New round · Ringbatch" }];

export async function loader({ request }: Route.LoaderArgs) {
  await requireRole(request, "coordinator");
  const url = new URL(request.url);
  return { sources: await publishedPrecisionStudies(), from: url.searchParams.get("from") ?? "" };
}

export async function action({ request }: Route.ActionArgs) {
  const user = await requireRole(request, "coordinator");
  return submitForm(request, newRoundSchema, (value) => createRound(user.id, value), (created) => redirectWithToast(`/rounds/${created.id}`, `Round ${created.code} created. Invite the labs next.`));
}

export default function NewRound({ loaderData, actionData }: Route.ComponentProps) {
  const { sources, from } = loaderData;
  const [form, fields] = useSchemaForm(newRoundSchema, {
    reply: actionData,
    id: "new-round",
    defaultValue: { sourceStudyId: from, replicatesPerCell: "2", materials: "R1 \nR2 " },
  });
  return (
    <>
      <PageHeader title="New proficiency round" subtitle="Lab codes are drawn afresh for every round, as labs accept their invitations." />
      <Card>
        <PostForm form={form} submitLabel="Create round">
          <SelectField
            label="From a published study"
            {...fieldProps(fields.sourceStudyId)}
            options={[{ value: "", label: "None: float finishing test, σ_pt from this round or a fixed value" }, ...sources.map((s) => ({ value: String(s.id), label: `${s.code} — ${s.title}` }))]}
          />
          <p className="text-sm text-basalt-700">
            A published study gives the round its test method, responses and precision figures, so σ_pt can follow the method's reproducibility.
          </p>
          <Field label="Round code" hint="Such as PT-2027-1." {...fieldProps(fields.code)} />
          <Field label="Title" {...fieldProps(fields.title)} />
          <Field label="Test method (when not from a published study)" {...fieldProps(fields.testMethod)} />
          <Field label="Replicates per lab and material" type="number" hint="Usually 1 or 2; each lab's result is the average of its replicates." {...fieldProps(fields.replicatesPerCell)} />
          <TextAreaField
            label="Materials (one to three)"
            rows={3}
            hint="One per line: a code, then a description, such as “R1 Reference paving mix, lot 2027-A”."
            {...fieldProps(fields.materials)}
          />
          <Field label="Results due" type="date" {...fieldProps(fields.resultsDue)} />
        </PostForm>
      </Card>
    </>
  );
}
