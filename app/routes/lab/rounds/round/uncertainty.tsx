import { Link } from "react-router";
import type { Route } from "./+types/uncertainty";
import { fieldProps, PostForm, useSchemaForm } from "~/components/forms";
import { groupFields, replyFor } from "~/components/round-parts";
import type { StudyPageHandle } from "~/components/study-frame";
import { Card, Field } from "~/components/ui";
import { uncertaintySchema } from "~/lib/round-forms";
import { labUncertainties, roundDesign, saveLabUncertainty } from "~/models/round.server";
import { submitForm } from "~/server/form-reply.server";
import { requireRound } from "~/server/round-context.server";
import { writeRefusal } from "~/lib/write-rules";
import { redirectWithToast } from "~/server/toast.server";
import { studyPageMeta } from "~/lib/study-page-meta";

export const handle = { pageTitle: "Round" } satisfies StudyPageHandle;
export const meta: Route.MetaFunction = ({ matches }) => studyPageMeta(handle.pageTitle, matches);

export async function loader({ context }: Route.LoaderArgs) {
  const { study, enrollment } = requireRound(context, ["analyst"]);
  const [{ groups }, entered] = await Promise.all([roundDesign(study.id), labUncertainties(enrollment!.id)]);
  return {
    roundId: study.id,
    uncertaintyRefusal: writeRefusal("labUncertainty", study.state),
    published: study.state === "published",
    groups: groups.map((g) => ({ material: g.material, response: g.response, uncertainty: entered[`${g.material.id}:${g.response.id}`] ?? null })),
  };
}

export async function action({ request, context }: Route.ActionArgs) {
  const { study, enrollment, user } = requireRound(context, ["analyst"]);
  return submitForm(request, uncertaintySchema, (value) => saveLabUncertainty(enrollment!.id, study, user.id, value), () => redirectWithToast(`/lab/rounds/${study.id}`, "Uncertainty saved."));
}

type Group = Route.ComponentProps["loaderData"]["groups"][number];

function UncertaintyForm({ group, reply }: { group: Group; reply: unknown }) {
  const [form, fields] = useSchemaForm(uncertaintySchema, {
    reply: replyFor(reply, group.material.id, group.response.id),
    id: `uncertainty-${group.material.id}-${group.response.id}`,
    defaultValue: { standardUncertainty: group.uncertainty?.toString() ?? "" },
  });
  return (
    <PostForm form={form} submitLabel="Save" submitVariant="secondary" hidden={groupFields("uncertainty", group)} className="flex flex-wrap items-end gap-3">
      <Field
        label={`${group.material.code} · ${group.response.name}: standard uncertainty${group.response.unit ? ` (${group.response.unit})` : ""}`}
        inputMode="decimal"
        {...fieldProps(fields.standardUncertainty)}
      />
    </PostForm>
  );
}

export default function LabRound({ loaderData, actionData }: Route.ComponentProps) {
  const { roundId, uncertaintyRefusal, published, groups } = loaderData;
  return (
    <div className="flex flex-col gap-6">
      <Card title="What to do">
        <p>
          Enter and submit your results on the round's{" "}
          <Link className="font-semibold text-basalt-700 underline" to={`/lab/studies/${roundId}`}>
            task pages
          </Link>
          , as for a study. Your lab is scored against the round's assigned value; other labs stay codes.
        </p>
        {published && (
          <p className="mt-2">
            The round is published:{" "}
            <Link className="font-semibold text-basalt-700 underline" to={`/lab/rounds/${roundId}/letter`}>
              read your letter
            </Link>
            .
          </p>
        )}
      </Card>
      {uncertaintyRefusal === null && (
        <Card title="Your measurement uncertainty (optional)">
          <p className="mb-3 text-basalt-700">If your lab states a standard uncertainty for its result, enter it: your letter then also gives a ζ score.</p>
          <div className="flex flex-col gap-4">
            {groups.map((group) => (
              <UncertaintyForm key={`${group.material.id}-${group.response.id}`} group={group} reply={actionData} />
            ))}
          </div>
        </Card>
      )}
    </div>
  );
}
