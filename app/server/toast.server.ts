/**
 * A confirmation after a redirect ("Shipment marked shipped") travels as a
 * flash message in a cookie of its own, read once by the root loader.
 */
import { createCookieSessionStorage, redirect } from "react-router";
import { sessionSecrets } from "~/server/session.server";

export type Toast = { message: string; tone: "success" | "info" };

const toastStorage = createCookieSessionStorage<Record<string, never>, { toast: Toast }>({
  cookie: { name: "__ringbatch_toast", httpOnly: true, sameSite: "lax", path: "/", secure: process.env.NODE_ENV === "production", secrets: sessionSecrets },
});

/** The cookie that carries a message the next page load shows once (after a redirect, or a reload the page asks for). */
export async function toastCookie(message: string, tone: Toast["tone"] = "success") {
  const session = await toastStorage.getSession();
  session.flash("toast", { message, tone });
  return toastStorage.commitSession(session);
}

/** Redirects to `to` with a message the next page shows once. */
export async function redirectWithToast(to: string, message: string, tone: Toast["tone"] = "success", init: ResponseInit = {}) {
  const headers = new Headers(init.headers);
  headers.append("Set-Cookie", await toastCookie(message, tone));
  return redirect(to, { ...init, headers });
}

/** The pending message, if any, and the header that clears it. */
export async function takeToast(request: Request) {
  const session = await toastStorage.getSession(request.headers.get("Cookie"));
  const toast = session.get("toast") ?? null;
  return { toast, headers: toast ? { "Set-Cookie": await toastStorage.destroySession(session) } : undefined };
}
