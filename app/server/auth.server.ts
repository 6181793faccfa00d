import { redirect } from "react-router";
import { Authenticator } from "remix-auth";
import { FormStrategy } from "remix-auth-form";
import { signInSchema } from "~/lib/account-forms";
import { recordAudit } from "~/server/audit.server";
import {
  ADDRESS_SIGN_IN_FAILURES,
  clearSignInFailures,
  clientAddress,
  isLimited,
  recordHit,
  recordSignInFailure,
  signInWaitRemaining,
} from "~/server/rate-limit.server";
import { sessionStorage } from "~/server/session.server";
import { HOME_BY_ROLE, loadSessionUser, normaliseEmail, verifyLogin } from "~/models/user.server";

export const SIGN_IN_FAILED = "That e-mail and password do not match an active account.";
export const SIGN_IN_LIMITED = "Too many failed sign-ins from this address. Wait 15 minutes, then try again.";

export function signInWaitMessage(seconds: number) {
  const wait = seconds < 90 ? `${seconds} seconds` : `${Math.ceil(seconds / 60)} minutes`;
  return `Several wrong passwords in a row: wait ${wait} before the next try.`;
}

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
    const address = clientAddress(request);
    // Waits grow per account and address, so a stranger guessing elsewhere never locks the owner out.
    const pairKey = `${email}|${address}`;
    if (await isLimited(ADDRESS_SIGN_IN_FAILURES, address)) throw new SignInError(SIGN_IN_LIMITED, 429);
    const wait = await signInWaitRemaining(pairKey);
    if (wait > 0) throw new SignInError(signInWaitMessage(wait), 429);
    const userId = await verifyLogin(email, parsed.data.password);
    if (userId === null) {
      await recordHit(ADDRESS_SIGN_IN_FAILURES, address);
      await recordSignInFailure(pairKey);
      await recordAudit({ actorUserId: null, action: "sign_in_failed", entityType: "user", after: { email } });
      throw new SignInError(SIGN_IN_FAILED, 401);
    }
    await clearSignInFailures(pairKey);
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

const REDIRECT_BASE = "http://ringbatch.invalid";
const CONTROL_CHARACTERS = /[\u0000-\u001f\u007f-\u009f]/;

/**
 * Only same-site paths; anything else would let a link send people elsewhere
 * after sign-in. The path is checked after the URL parser has normalised it
 * (browsers drop tabs and read backslashes as slashes), refused when it holds
 * control characters (also percent-encoded ones), and returned percent-encoded
 * so it is a valid header.
 */
export function safeRedirect(to: string | null | undefined) {
  if (!to || to.length > 2000 || !to.startsWith("/") || CONTROL_CHARACTERS.test(to)) return null;
  let url: URL;
  try {
    url = new URL(to, REDIRECT_BASE);
  } catch {
    return null;
  }
  if (url.origin !== REDIRECT_BASE) return null;
  // Encoded too: a later decoding step must not turn the path into `//host`.
  let decodedPath: string;
  try {
    decodedPath = decodeURIComponent(url.pathname);
  } catch {
    return null;
  }
  if (CONTROL_CHARACTERS.test(decodedPath) || /^\/[\s/\\]/.test(decodedPath)) return null;
  return url.pathname + url.search + url.hash;
}
