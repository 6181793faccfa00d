import type { Route } from "./+types/welcome";
import { SetPasswordPage } from "~/components/set-password-page";
import { passwordLinkAction, passwordLinkLoader } from "~/server/password-link-route.server";

export const meta: Route.MetaFunction = () => [{ title: "Set your password · Ringbatch" }];

export function loader({ request, params }: Route.LoaderArgs) {
  return passwordLinkLoader(request, params.token, "welcome");
}

export function action({ request, params }: Route.ActionArgs) {
  return passwordLinkAction(request, params.token, "welcome");
}

export default function Welcome({ loaderData, actionData }: Route.ComponentProps) {
  return <SetPasswordPage loaderData={loaderData} actionData={actionData} title={(name) => `Welcome, ${name}`} label="New password" />;
}
