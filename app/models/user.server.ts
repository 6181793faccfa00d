import argon2 from "argon2";
import { and, asc, count, eq, inArray, isNull, or, sql } from "drizzle-orm";
import { db, preparedOnce, type Transaction } from "~/db/client.server";
import { labMembers, type Role, ROLES, userRoles, users } from "~/db/schema";
import { FieldRefusal } from "~/lib/field-refusal";
import { readPage } from "~/lib/paging";

export type SessionUser = {
  id: number;
  email: string;
  name: string;
  /** The role that decides the home page. */
  role: Role;
  /** Every role the person holds, the home page's first. */
  roles: Role[];
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

// The signed-in person is read on every request.
const sessionUserQueries = preparedOnce((database) => {
  const userId = sql.placeholder("userId");
  return {
    user: database.query.users.findFirst({ where: eq(users.id, userId) }).prepare(),
    memberships: database.select().from(labMembers).where(eq(labMembers.userId, userId)).prepare(),
    extraRoles: database.select({ role: userRoles.role }).from(userRoles).where(eq(userRoles.userId, userId)).prepare(),
  };
});

export async function loadSessionUser(userId: number): Promise<SessionUser | null> {
  const { user: userById, memberships: membershipsOf, extraRoles: extraRolesOf } = sessionUserQueries();
  const user = await userById.execute({ userId });
  if (!user || user.disabledAt) return null;
  const [memberships, extraRoles] = await Promise.all([membershipsOf.execute({ userId }), extraRolesOf.execute({ userId })]);
  return {
    id: user.id,
    email: user.email,
    name: user.name,
    role: user.role,
    roles: rolesOf(user.role, extraRoles.map((r) => r.role)),
    labIds: memberships.map((m) => m.labId),
    contactLabIds: memberships.filter((m) => m.isContact).map((m) => m.labId),
  };
}

/** The primary role and the extra ones as one list in the order of ROLES, with no repeats. */
export function rolesOf(primary: Role, extra: readonly Role[]): Role[] {
  return ROLES.filter((r) => r === primary || extra.includes(r));
}

/**
 * Gives the person exactly these roles: the first in the order of ROLES
 * (admin, coordinator, analyst, reviewer) decides the home page and is kept
 * in `users.role`, the others in `user_roles`.
 */
export async function setRoles(tx: Transaction, userId: number, roles: readonly Role[]) {
  const ordered = ROLES.filter((r) => roles.includes(r));
  const [primary, ...extra] = ordered;
  if (!primary) throw new AccountError("roles", "Choose at least one role.");
  await tx.update(users).set({ role: primary }).where(eq(users.id, userId));
  await tx.delete(userRoles).where(eq(userRoles.userId, userId));
  if (extra.length) await tx.insert(userRoles).values(extra.map((role) => ({ userId, role })));
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

export type NewUser = { email: string; name: string; roles: Role[]; password?: string; labId?: number | null; isContact?: boolean };

/** Creates an account (its roles and lab membership) in one transaction. */
export async function createUser(input: NewUser) {
  const email = normaliseEmail(input.email);
  if (await findUserByEmail(email)) throw new AccountError("email", "An account with this e-mail already exists.");
  const passwordHash = input.password ? await hashPassword(input.password) : null;
  return db.transaction(async (tx) => {
    const [created] = await tx.insert(users).values({ email, name: input.name, role: input.roles[0] ?? "analyst", passwordHash }).returning();
    await setRoles(tx, created!.id, input.roles);
    if (input.labId) await tx.insert(labMembers).values({ labId: input.labId, userId: created!.id, isContact: input.isContact ?? false });
    return created!;
  });
}

export type UserFilter = { search: string; role: Role | null; labId: number | null };

/** Accounts matching the administrator's filter (name or e-mail contains the search; holds the role; belongs to the lab), one page at a time. */
export async function findUsers(filter: UserFilter, page: number) {
  const search = filter.search.trim().toLowerCase();
  const conditions = [
    search ? or(contains(users.name, search), contains(users.email, search)) : undefined,
    filter.role ? holdsRole(filter.role) : undefined,
    filter.labId ? inArray(users.id, db.select({ id: labMembers.userId }).from(labMembers).where(eq(labMembers.labId, filter.labId))) : undefined,
  ];
  const where = and(...conditions);
  const found = await readPage(
    page,
    async () => (await db.select({ n: count() }).from(users).where(where))[0]!.n,
    (limit, offset) => db.select().from(users).where(where).orderBy(asc(users.email)).limit(limit).offset(offset),
  );
  const ids = found.rows.map((u) => u.id);
  const [memberships, extraRoles, activeAdmins] = await Promise.all([
    ids.length ? db.select().from(labMembers).where(inArray(labMembers.userId, ids)) : [],
    ids.length ? db.select().from(userRoles).where(inArray(userRoles.userId, ids)) : [],
    activeAdminIds(),
  ]);
  return {
    ...found,
    rows: found.rows.map((u) => ({
      id: u.id,
      email: u.email,
      name: u.name,
      roles: rolesOf(
        u.role,
        extraRoles.filter((r) => r.userId === u.id).map((r) => r.role),
      ),
      disabled: u.disabledAt !== null,
      hasPassword: u.passwordHash !== null,
      labIds: memberships.filter((m) => m.userId === u.id).map((m) => m.labId),
      isContact: memberships.some((m) => m.userId === u.id && m.isContact),
      onlyAdmin: activeAdmins.length === 1 && activeAdmins[0] === u.id,
    })),
  };
}

/** A query condition: the account holds the role, as its home-page role or another one. */
export function holdsRole(role: Role) {
  return or(eq(users.role, role), inArray(users.id, db.select({ id: userRoles.userId }).from(userRoles).where(eq(userRoles.role, role))));
}

/** Case-insensitive "contains", where `%` and `_` typed in a search mean themselves. */
function contains(column: typeof users.name | typeof users.email, text: string) {
  const pattern = `%${text.replace(/[\\%_]/g, (c) => `\\${c}`)}%`;
  return sql`lower(${column}) like ${pattern} escape '\\'`;
}

/** Active accounts holding the administrator role, as their primary role or an extra one. */
async function activeAdminIds() {
  const rows = await db
    .select({ id: users.id })
    .from(users)
    .where(and(isNull(users.disabledAt), holdsRole("admin")));
  return rows.map((r) => r.id);
}

/**
 * Why an administrator's change to an account would be refused, or null.
 * The page uses the same rules to leave out what would be refused.
 */
export function accountChangeRefusal(change: { userId: number; roles?: readonly Role[]; disable?: boolean }, adminId: number, activeAdmins: readonly number[]) {
  const losesAdmin = change.disable || (change.roles && !change.roles.includes("admin"));
  if (change.disable && change.userId === adminId) return "You cannot disable your own account.";
  if (losesAdmin && change.userId === adminId && change.roles) return "You cannot take the administrator role from yourself; ask another administrator.";
  if (losesAdmin && activeAdmins.includes(change.userId) && activeAdmins.length === 1) return "This is the only active administrator: make someone else an administrator first.";
  return null;
}

/** An administrator's change of someone's roles and lab, refused where it would lock administration out. */
export async function updateAccount(change: { userId: number; roles: Role[]; labId: number | null; isContact: boolean }, adminId: number) {
  const refusal = accountChangeRefusal(change, adminId, await activeAdminIds());
  if (refusal) throw new AccountError("roles", refusal);
  if (change.roles.includes("analyst") && !change.labId) throw new AccountError("labId", "An analyst belongs to a lab: choose one.");
  await db.transaction(async (tx) => {
    await setRoles(tx, change.userId, change.roles);
    await tx.delete(labMembers).where(eq(labMembers.userId, change.userId));
    if (change.labId) await tx.insert(labMembers).values({ userId: change.userId, labId: change.labId, isContact: change.isContact });
  });
}

export async function setDisabled(userId: number, disabled: boolean, adminId: number) {
  if (disabled) {
    const refusal = accountChangeRefusal({ userId, disable: true }, adminId, await activeAdminIds());
    if (refusal) throw new AccountError("form", refusal);
  }
  await db.update(users).set({ disabledAt: disabled ? new Date() : null }).where(eq(users.id, userId));
}
