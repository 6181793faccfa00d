import type { Route } from "./+types/new";
import { PostForm, useSchemaForm } from "~/components/forms";
import { StudyFields } from "~/components/study-fields";
import { StudyPlanner } from "~/components/study-planner";
import { Card, PageHeader } from "~/components/ui";
import { newStudySchema } from "~/lib/study-forms";
import { FLOAT_FINISHING_TEMPLATE } from "~/lib/study-templates";
import { createStudy } from "~/models/study-setup.server";
import { plannerView } from "~/models/study-planner.server";
import { submitForm } from "~/server/form-reply.server";
import { requireRole } from "~/server/guards.server";
import { redirectWithToast } from "~/server/toast.server";

export const meta: Route.MetaFunction = () => [{ title: "New study · Ringbatch" }];

export async function loader({ request }: Route.LoaderArgs) {
  const user = await requireRole(request, "coordinator");
  return { planner: await plannerView(user, new URL(request.url).searchParams, null) };
}

export async function action({ request }: Route.ActionArgs) {
  const user = await requireRole(request, "coordinator");
  return submitForm(request, newStudySchema, (value) => createStudy(user.id, value), (created) => redirectWithToast(`/studies/${created.id}/setup`, `Study ${created.code} created.`));
}

/** What each template fills in; a custom method starts blank, with nothing of the float finishing test. */
const TEMPLATE_FIELDS = {
  float_finishing: {
    testMethod: FLOAT_FINISHING_TEMPLATE.testMethod,
    targetSurfaceRating: String(FLOAT_FINISHING_TEMPLATE.targetSurfaceRating),
    specimenVolumeM3: String(FLOAT_FINISHING_TEMPLATE.specimenVolumeM3),
    wastePercent: String(FLOAT_FINISHING_TEMPLATE.wastePercent),
  },
  custom: { testMethod: "", targetSurfaceRating: "", specimenVolumeM3: "", wastePercent: "" },
} as const;

const TEMPLATE_DEFAULTS = {
  template: "float_finishing",
  replicatesPerCell: String(FLOAT_FINISHING_TEMPLATE.replicatesPerCell),
  significanceLevel: "0.005",
  ...TEMPLATE_FIELDS.float_finishing,
};

export default function NewStudy({ loaderData, actionData }: Route.ComponentProps) {
  const [form, fields] = useSchemaForm(newStudySchema, { reply: actionData, id: "new-study", defaultValue: TEMPLATE_DEFAULTS });
  const template = fields.template.initialValue;
  const chooseTemplate = (chosen: keyof typeof TEMPLATE_FIELDS) => {
    for (const [name, value] of Object.entries(TEMPLATE_FIELDS[chosen])) form.update({ name, value });
  };
  return (
    <>
      <PageHeader title="New study" subtitle="Start from the float finishing template or set up any other test method." />
      <Card>
        <PostForm form={form} submitLabel="Create study" className="flex flex-col gap-6">
          <fieldset className="flex flex-col gap-2" aria-describedby={fields.template.errors ? fields.template.errorId : undefined}>
            <legend className="mb-1 font-semibold text-basalt-800">Start from</legend>
            <label className="flex items-start gap-2">
              <input type="radio" name="template" value="float_finishing" defaultChecked={template === "float_finishing"} onChange={() => chooseTemplate("float_finishing")} className="mt-1" />
              <span>
                <span className="font-semibold">Float finishing test of fresh concrete</span>
                <span className="block text-sm text-basalt-700">
                  Two count responses (passes to close the preformed holes, passes to reach the target surface), target surface rating, slump{" "}
                  {FLOAT_FINISHING_TEMPLATE.freshTargets[0].target} ± {FLOAT_FINISHING_TEMPLATE.freshTargets[0].tolerance} mm and air{" "}
                  {FLOAT_FINISHING_TEMPLATE.freshTargets[1].target} ± {FLOAT_FINISHING_TEMPLATE.freshTargets[1].tolerance} % targets.
                </span>
              </span>
            </label>
            <label className="flex items-start gap-2">
              <input type="radio" name="template" value="custom" defaultChecked={template === "custom"} onChange={() => chooseTemplate("custom")} className="mt-1" />
              <span>
                <span className="font-semibold">Custom test method</span>
                <span className="block text-sm text-basalt-700">Starts blank: name the method, then add its responses, specimen volume and targets on the setup page.</span>
              </span>
            </label>
            {fields.template.errors && (
              <p id={fields.template.errorId} className="text-sm font-semibold text-signal-700">
                {fields.template.errors[0]}
              </p>
            )}
          </fieldset>
          <StudyFields fields={fields} />
        </PostForm>
      </Card>
      <Card className="mt-6">
        <StudyPlanner view={loaderData.planner} askMaterials />
      </Card>
    </>
  );
}
