import { eq } from "drizzle-orm";
import { db } from "~/db/client.server";
import { studies, users } from "~/db/schema";
import { seedDemo } from "../../seed/seed";
import { useFreshDatabase } from "./database";
import { sessionCookieFor } from "./routes";

/** A signed-in cookie for one of the seeded demo accounts. */
export async function demoCookie(email: string) {
  const user = await db.query.users.findFirst({ where: eq(users.email, email) });
  if (!user) throw new Error(`No demo account ${email}`);
  return sessionCookieFor(user.id);
}

/** A new database holding the demo data, as `npm run db:seed` leaves it. */
export async function useDemoDatabase() {
  await useFreshDatabase();
  await seedDemo(db);
}

/** One of the seeded studies, by its code. */
export async function demoStudy(code: string) {
  const study = await db.query.studies.findFirst({ where: eq(studies.code, code) });
  if (!study) throw new Error(`No demo study ${code}`);
  return study;
}
