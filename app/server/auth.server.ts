import { redirect } from "react-router";
import { Authenticator } from "remix-auth";
import { FormStrategy } from "remix-auth-form";
import { signInSchema } from "~/lib/account-forms";
import { recordAudit } from "~/server/audit.server";
import { ACCOUNT_SIGN_IN_FAILURES, clearHits, clientAddress, isLimited, recordHit, SIGN_IN_FAILURES } from "~/server/rate-limit.server";
import { sessionStorage } from "~/server/session.server";
import { HOME_BY_ROLE, loadSessionUser, normaliseEmail, verifyLogin } from "~/models/user.server";

export const SIGN_IN_FAILED = "That e-mail and password do not match an active account.";
export const SIGN_IN_LIMITED = "Too many failed sign-ins. Wait 15 minutes, then try again.";

export class SignInError extends Error {
  constructor(
    message: string,
    readonly status: number,
  ) {
    super(message);
  }
}

const authenticator = new Authenticator<number>();

authenticator.use(
  new FormStrategy(async ({ form, request }) => {
    const parsed = signInSchema.safeParse(Object.fromEntries(form));
    if (!parsed.success) throw new SignInError(SIGN_IN_FAILED, 400);
    const email = normaliseEmail(parsed.data.email);
    // Failures count per account and address, so one attacker cannot lock a colleague out from elsewhere.
    const key = `${email}|${clientAddress(request)}`;
    // The address comes from a header a client can set; the account-wide cap holds whatever it says.
    if ((await isLimited(SIGN_IN_FAILURES, key)) || (await isLimited(ACCOUNT_SIGN_IN_FAILURES, email))) {
      throw new SignInError(SIGN_IN_LIMITED, 429);
    }
    const userId = await verifyLogin(email, parsed.data.password);
    if (userId === null) {
      await recordHit(SIGN_IN_FAILURES, key);
      await recordHit(ACCOUNT_SIGN_IN_FAILURES, email);
      await recordAudit({ actorUserId: null, action: "sign_in_failed", entityType: "user", after: { email } });
      throw new SignInError(SIGN_IN_FAILED, 401);
    }
    await clearHits(SIGN_IN_FAILURES, key);
    return userId;
  }),
  "password",
);

/** Signs in from the login form; returns the redirect that sets a brand-new session cookie. */
export async function signIn(request: Request, redirectTo: string | null) {
  const userId = await authenticator.authenticate("password", request);
  const user = await loadSessionUser(userId);
  if (!user) throw new SignInError(SIGN_IN_FAILED, 401);
  return redirectSignedIn(userId, safeRedirect(redirectTo) ?? HOME_BY_ROLE[user.role]);
}

/**
 * Starts a brand-new session for the user and redirects: a fresh session id
 * at every sign-in (no fixation), never the cookie that came in.
 */
export async function redirectSignedIn(userId: number, to: string) {
  const session = await sessionStorage.getSession();
  session.set("userId", userId);
  await recordAudit({ actorUserId: userId, action: "sign_in", entityType: "user", entityId: userId });
  return redirect(to, { headers: { "Set-Cookie": await sessionStorage.commitSession(session) } });
}

export async function signOut(request: Request) {
  const session = await sessionStorage.getSession(request.headers.get("Cookie"));
  const userId = session.get("userId");
  if (userId) await recordAudit({ actorUserId: userId, action: "sign_out", entityType: "user", entityId: userId });
  return redirect("/login", { headers: { "Set-Cookie": await sessionStorage.destroySession(session) } });
}

/** Only same-site paths; anything else would let a link send people elsewhere after sign-in. */
export function safeRedirect(to: string | null | undefined) {
  if (!to || !to.startsWith("/") || to.startsWith("//") || to.startsWith("/\\")) return null;
  return to;
}
