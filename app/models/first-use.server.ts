/**
 * A database's first use: the demo scenario where it is wanted, or else a
 * one-time link that creates the first administrator. Nothing here ever
 * writes into a database that already has accounts.
 */
import { randomBytes } from "node:crypto";
import { and, count, eq, gt, isNull } from "drizzle-orm";
import { db, type Database, preparedOnce } from "~/db/client.server";
import { setupLinks, users } from "~/db/schema";
import { FieldRefusal } from "~/lib/field-refusal";
import { DEMO_ADMIN_EMAIL } from "~/lib/demo";
import { SETUP_LINK_MINUTES } from "~/lib/first-admin-form";
import { hashPassword, normaliseEmail } from "~/models/user.server";
import { isProduction } from "~/server/deployment.server";
import { hashToken } from "~/server/token-hash.server";

/** The demo is on by default outside production and off in production unless DEMO=on; DEMO=off turns it off anywhere. */
export function demoWanted(env: NodeJS.ProcessEnv = process.env) {
  if (env.DEMO === "on") return true;
  if (env.DEMO === "off") return false;
  return !isProduction(env);
}

export async function accountCount(database: Database = db) {
  const [row] = await database.select({ n: count() }).from(users);
  return row?.n ?? 0;
}

// Asked on every page (the root's demo notice).
const demoAdmin = preparedOnce((database) => database.query.users.findFirst({ columns: { id: true }, where: eq(users.email, DEMO_ADMIN_EMAIL) }).prepare());

/** Whether the demo's accounts (and so its published password) are in the database. */
export async function demoDataPresent() {
  return Boolean(await demoAdmin().execute());
}


export type FirstUse = { outcome: "has-accounts" } | { outcome: "demo-written" } | { outcome: "setup-link"; path: string; expiresAt: Date };

/**
 * What a start does to the database: nothing when it has accounts; the demo
 * (written by `writeDemo`, the seed's) when it has none and the demo is
 * wanted; otherwise a new setup link (earlier unused links stop working).
 */
export async function prepareFirstUse(writeDemo: (database: Database) => Promise<unknown>, env: NodeJS.ProcessEnv = process.env, database: Database = db): Promise<FirstUse> {
  if ((await accountCount(database)) > 0) return { outcome: "has-accounts" };
  if (demoWanted(env)) {
    await writeDemo(database);
    return { outcome: "demo-written" };
  }
  const token = randomBytes(32).toString("base64url");
  const expiresAt = new Date(Date.now() + SETUP_LINK_MINUTES * 60 * 1000);
  await database.transaction(async (tx) => {
    await tx.update(setupLinks).set({ usedAt: new Date() }).where(isNull(setupLinks.usedAt));
    await tx.insert(setupLinks).values({ tokenHash: hashToken(token), expiresAt });
  });
  return { outcome: "setup-link", path: `/setup/${token}`, expiresAt };
}

/** Whether the setup link works now: unused, not expired, and the database still has no accounts. */
export async function setupLinkValid(token: string) {
  const link = await db.query.setupLinks.findFirst({
    where: and(eq(setupLinks.tokenHash, hashToken(token)), isNull(setupLinks.usedAt), gt(setupLinks.expiresAt, new Date())),
  });
  return Boolean(link) && (await accountCount()) === 0;
}

/** Creates the first administrator and spends the link, in one transaction; the link works once. */
export async function createFirstAdmin(token: string, input: { name: string; email: string; password: string }) {
  const passwordHash = await hashPassword(input.password);
  return db.transaction(async (tx) => {
    const [spent] = await tx
      .update(setupLinks)
      .set({ usedAt: new Date() })
      .where(and(eq(setupLinks.tokenHash, hashToken(token)), isNull(setupLinks.usedAt), gt(setupLinks.expiresAt, new Date())))
      .returning();
    const [existing] = await tx.select({ n: count() }).from(users);
    if (!spent || (existing?.n ?? 0) > 0) throw new FieldRefusal("email", "This setup link no longer works: it was used or has expired.");
    const [admin] = await tx.insert(users).values({ email: normaliseEmail(input.email), name: input.name, role: "admin", passwordHash }).returning();
    return admin!;
  });
}
