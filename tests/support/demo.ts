import { eq } from "drizzle-orm";
import { db } from "~/db/client.server";
import { users } from "~/db/schema";
import { sessionCookieFor } from "./routes";

/** A signed-in cookie for one of the seeded demo accounts. */
export async function demoCookie(email: string) {
  const user = await db.query.users.findFirst({ where: eq(users.email, email) });
  if (!user) throw new Error(`No demo account ${email}`);
  return sessionCookieFor(user.id);
}
