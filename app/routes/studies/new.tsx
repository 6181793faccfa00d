import { Form, redirect, useNavigation } from "react-router";
import type { Route } from "./+types/new";
import { StudyFields } from "~/components/study-fields";
import { Button, Card, PageHeader } from "~/components/ui";
import { type ActionResult, formState, handleForm } from "~/lib/form-results";
import { requireRole } from "~/server/guards.server";
import { newStudySchema } from "~/lib/study-forms";
import { useSchemaCheck } from "~/lib/use-schema-check";
import { FLOAT_FINISHING_TEMPLATE } from "~/lib/study-templates";
import { createStudy } from "~/models/study-setup.server";

export const meta: Route.MetaFunction = () => [{ title: "New study · Ringbatch" }];

export async function loader({ request }: Route.LoaderArgs) {
  await requireRole(request, "coordinator");
  return null;
}

export async function action({ request }: Route.ActionArgs) {
  const user = await requireRole(request, "coordinator");
  return handleForm("create", newStudySchema, await request.formData(), async (input) => {
    const study = await createStudy(user.id, input);
    return redirect(`/studies/${study.id}/setup`);
  });
}

const TEMPLATE_DEFAULTS = {
  template: "float_finishing",
  testMethod: FLOAT_FINISHING_TEMPLATE.testMethod,
  replicatesPerCell: String(FLOAT_FINISHING_TEMPLATE.replicatesPerCell),
  significanceLevel: "0.005",
  targetSurfaceRating: String(FLOAT_FINISHING_TEMPLATE.targetSurfaceRating),
};

export default function NewStudy({ actionData }: Route.ComponentProps) {
  const { errors: serverErrors, values: typed } = formState(actionData as ActionResult | undefined, "create");
  const { errors, onSubmit } = useSchemaCheck(newStudySchema, serverErrors);
  const values = { ...TEMPLATE_DEFAULTS, ...typed };
  const busy = useNavigation().state === "submitting";
  return (
    <>
      <PageHeader title="New study" subtitle="Start from the float finishing template or set up any other test method." />
      <Card>
        <Form method="post" className="flex flex-col gap-6" onSubmit={onSubmit} noValidate>
          <fieldset className="flex flex-col gap-2">
            <legend className="mb-1 font-semibold text-basalt-800">Start from</legend>
            <label className="flex items-start gap-2">
              <input type="radio" name="template" value="float_finishing" defaultChecked={values.template === "float_finishing"} className="mt-1" />
              <span>
                <span className="font-semibold">Float finishing test of fresh concrete</span>
                <span className="block text-sm text-basalt-700">
                  Two count responses (passes to close the preformed holes, passes to reach the target surface), target surface rating,
                  slump {FLOAT_FINISHING_TEMPLATE.freshTargets[0].target} ± {FLOAT_FINISHING_TEMPLATE.freshTargets[0].tolerance} mm and air{" "}
                  {FLOAT_FINISHING_TEMPLATE.freshTargets[1].target} ± {FLOAT_FINISHING_TEMPLATE.freshTargets[1].tolerance} % targets.
                </span>
              </span>
            </label>
            <label className="flex items-start gap-2">
              <input type="radio" name="template" value="custom" defaultChecked={values.template === "custom"} className="mt-1" />
              <span>
                <span className="font-semibold">Custom test method</span>
                <span className="block text-sm text-basalt-700">No responses yet: add them on the setup page.</span>
              </span>
            </label>
            {errors.template && <p className="text-sm font-semibold text-signal-700">{errors.template}</p>}
          </fieldset>
          <StudyFields values={values} errors={errors} />
          <div>
            <Button type="submit" disabled={busy}>
              Create study
            </Button>
          </div>
        </Form>
      </Card>
    </>
  );
}
