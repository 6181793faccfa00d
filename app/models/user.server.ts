import argon2 from "argon2";
import { eq } from "drizzle-orm";
import { db } from "~/db/client.server";
import { labMembers, type Role, users } from "~/db/schema";
import { FieldRefusal } from "~/lib/field-refusal";

export type SessionUser = {
  id: number;
  email: string;
  name: string;
  role: Role;
  labIds: number[];
  /** Labs whose contact this user is (may add and remove colleagues). */
  contactLabIds: number[];
};

export function hashPassword(password: string) {
  return argon2.hash(password, { type: argon2.argon2id });
}

export function normaliseEmail(email: string) {
  return email.trim().toLowerCase();
}

/** Checks a password; a disabled or unknown account fails like a wrong password. */
export async function verifyLogin(email: string, password: string) {
  const user = await db.query.users.findFirst({ where: eq(users.email, normaliseEmail(email)) });
  if (!user?.passwordHash || user.disabledAt) {
    // Hash anyway so the reply takes as long as for a real account.
    await argon2.hash(password, { type: argon2.argon2id });
    return null;
  }
  return (await argon2.verify(user.passwordHash, password)) ? user.id : null;
}

export async function loadSessionUser(userId: number): Promise<SessionUser | null> {
  const user = await db.query.users.findFirst({ where: eq(users.id, userId) });
  if (!user || user.disabledAt) return null;
  const memberships = await db.select().from(labMembers).where(eq(labMembers.userId, userId));
  return {
    id: user.id,
    email: user.email,
    name: user.name,
    role: user.role,
    labIds: memberships.map((m) => m.labId),
    contactLabIds: memberships.filter((m) => m.isContact).map((m) => m.labId),
  };
}

export const HOME_BY_ROLE: Record<Role, string> = {
  admin: "/admin/users",
  coordinator: "/studies",
  analyst: "/lab",
  reviewer: "/review",
};

/** A refusal of an account or lab change, shown beside the field it names ("" for the form as a whole). */
export class AccountError extends FieldRefusal {}

export async function updateName(userId: number, name: string) {
  await db.update(users).set({ name }).where(eq(users.id, userId));
}

/** Changes the password after checking the current one; every other session ends. */
export async function changePassword(userId: number, current: string, next: string) {
  const user = await db.query.users.findFirst({ where: eq(users.id, userId) });
  if (!user?.passwordHash || !(await argon2.verify(user.passwordHash, current))) {
    throw new AccountError("currentPassword", "The current password is not correct.");
  }
  await db.update(users).set({ passwordHash: await hashPassword(next) }).where(eq(users.id, userId));
}

export async function findUserByEmail(email: string) {
  return db.query.users.findFirst({ where: eq(users.email, normaliseEmail(email)) });
}

export type NewUser = { email: string; name: string; role: Role; password?: string; labId?: number | null; isContact?: boolean };

/** Creates an account (and its lab membership) in one transaction. */
export async function createUser(input: NewUser) {
  const email = normaliseEmail(input.email);
  if (await findUserByEmail(email)) throw new AccountError("email", "An account with this e-mail already exists.");
  const passwordHash = input.password ? await hashPassword(input.password) : null;
  return db.transaction(async (tx) => {
    const [created] = await tx.insert(users).values({ email, name: input.name, role: input.role, passwordHash }).returning();
    if (input.labId) await tx.insert(labMembers).values({ labId: input.labId, userId: created!.id, isContact: input.isContact ?? false });
    return created!;
  });
}

export async function listUsersWithLabs() {
  const [allUsers, memberships] = await Promise.all([
    db.select().from(users).orderBy(users.email),
    db.select().from(labMembers),
  ]);
  return allUsers.map((u) => ({
    id: u.id,
    email: u.email,
    name: u.name,
    role: u.role,
    disabled: u.disabledAt !== null,
    labIds: memberships.filter((m) => m.userId === u.id).map((m) => m.labId),
    isContact: memberships.some((m) => m.userId === u.id && m.isContact),
  }));
}

export async function setRole(userId: number, role: Role) {
  await db.update(users).set({ role }).where(eq(users.id, userId));
}

/** Puts the user in exactly one lab (or none), as an analyst or the lab's contact. */
export async function setLabMembership(userId: number, labId: number | null, isContact = false) {
  await db.transaction(async (tx) => {
    await tx.delete(labMembers).where(eq(labMembers.userId, userId));
    if (labId) await tx.insert(labMembers).values({ userId, labId, isContact });
  });
}

export async function setDisabled(userId: number, disabled: boolean) {
  await db.update(users).set({ disabledAt: disabled ? new Date() : null }).where(eq(users.id, userId));
}
