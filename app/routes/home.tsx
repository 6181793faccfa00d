import { redirect } from "react-router";
import type { Route } from "./+types/home";
import { getUser } from "~/server/guards.server";
import { HOME_BY_ROLE } from "~/models/user.server";

export async function loader({ request }: Route.LoaderArgs) {
  const user = await getUser(request);
  throw redirect(user ? HOME_BY_ROLE[user.role] : "/login");
}
