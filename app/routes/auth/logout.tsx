import { redirect } from "react-router";
import type { Route } from "./+types/logout";
import { signOut } from "~/server/auth.server";

export async function action({ request }: Route.ActionArgs) {
  return signOut(request);
}

export async function loader() {
  throw redirect("/");
}
