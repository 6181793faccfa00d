import type { Route } from "./+types/reset-password";
import { SetPasswordPage } from "~/components/set-password-page";
import { passwordLinkAction, passwordLinkLoader } from "~/server/password-link-route.server";

export const meta: Route.MetaFunction = () => [{ title: "Set a new password · Ringbatch" }];

export function loader({ request, params }: Route.LoaderArgs) {
  return passwordLinkLoader(request, params.token, "reset");
}

export function action({ request, params }: Route.ActionArgs) {
  return passwordLinkAction(request, params.token, "reset");
}

export default function ResetPassword({ loaderData, actionData }: Route.ComponentProps) {
  return <SetPasswordPage loaderData={loaderData} actionData={actionData} title={() => "Set a new password"} label="New password" />;
}
