/**
 * The loader and action behind a page that sets a password from an e-mailed
 * link (`/welcome/:token`, `/reset-password/:token`): the link is looked up
 * under the same guessing limit as invitations, a refusal says why, and the
 * new password signs the person in.
 */
import { parseWithZod } from "@conform-to/zod/v4";
import { data } from "react-router";
import type { PasswordLinkPurpose } from "~/db/values";
import { firstPasswordSchema } from "~/lib/account-forms";
import { lookupPasswordLink, type PasswordLinkLookup, setPasswordFromLink } from "~/models/password-link.server";
import { HOME_BY_ROLE } from "~/models/user.server";
import { redirectSignedIn } from "~/server/auth.server";
import { clientAddress, isLimited, LINK_MISSES, recordHit } from "~/server/rate-limit.server";

type Refusals = Record<Exclude<PasswordLinkLookup["status"], "valid">, { title: string; message: string; status: number }>;

const REFUSALS: Record<PasswordLinkPurpose, Refusals> = {
  welcome: {
    unknown: { title: "This link is not valid", message: "Check that the whole link was copied from the e-mail, or ask whoever added you to send a new one.", status: 404 },
    used: { title: "This link has already been used", message: "Your password is set: sign in with your e-mail address and that password.", status: 410 },
    expired: { title: "This link has expired", message: "Links to set a first password work for 14 days. Use “Forgot your password?” on the sign-in page for a new one.", status: 410 },
  },
  reset: {
    unknown: { title: "This link is not valid", message: "Check that the whole link was copied from the e-mail, or ask for a new one with “Forgot your password?” on the sign-in page.", status: 404 },
    used: { title: "This link has already been used", message: "Each link works once. Sign in with your new password, or ask for another link.", status: 410 },
    expired: { title: "This link has expired", message: "Links to set a new password work for 30 minutes. Ask for another one with “Forgot your password?” on the sign-in page.", status: 410 },
  },
};

async function lookup(request: Request, token: string | undefined, purpose: PasswordLinkPurpose) {
  const key = clientAddress(request);
  if (await isLimited(LINK_MISSES, key)) throw data("Too many attempts: wait 15 minutes, then open the link again.", { status: 429 });
  const found = await lookupPasswordLink(token ?? "", purpose);
  if (found.status === "unknown") await recordHit(LINK_MISSES, key);
  return found;
}

export async function passwordLinkLoader(request: Request, token: string | undefined, purpose: PasswordLinkPurpose) {
  const found = await lookup(request, token, purpose);
  if (found.status !== "valid") {
    const { title, message, status } = REFUSALS[purpose][found.status];
    return data({ refusal: { title, message }, account: null }, { status });
  }
  return data({ refusal: null, account: { name: found.user.name, email: found.user.email } });
}

const PASSWORD_FIELDS = ["password", "confirm"];

export async function passwordLinkAction(request: Request, token: string | undefined, purpose: PasswordLinkPurpose) {
  const found = await lookup(request, token, purpose);
  const submission = parseWithZod(await request.formData(), { schema: firstPasswordSchema });
  // The passwords are never sent back into the page.
  const refusal = (formErrors: string[] | undefined, status: number) => data({ result: submission.reply({ hideFields: PASSWORD_FIELDS, ...(formErrors && { formErrors }) }) }, { status });
  const refusals = REFUSALS[purpose];
  if (found.status !== "valid") return refusal([refusals[found.status].title], refusals[found.status].status);
  if (submission.status !== "success") return refusal(undefined, 400);
  if (!(await setPasswordFromLink(found, purpose, submission.value.password))) return refusal([refusals.used.title], refusals.used.status);
  return redirectSignedIn(found.user.id, HOME_BY_ROLE[found.user.role]);
}
