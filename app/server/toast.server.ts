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

/** Redirects to `to` with a message the next page shows once. */
export async function redirectWithToast(to: string, message: string, tone: Toast["tone"] = "success", init: ResponseInit = {}) {
  const session = await toastStorage.getSession();
  session.flash("toast", { message, tone });
  const headers = new Headers(init.headers);
  headers.append("Set-Cookie", await toastStorage.commitSession(session));
  return redirect(to, { ...init, headers });
}

/** The pending message, if any, and the header that clears it. */
export async function takeToast(request: Request) {
  const session = await toastStorage.getSession(request.headers.get("Cookie"));
  const toast = session.get("toast") ?? null;
  return { toast, headers: toast ? { "Set-Cookie": await toastStorage.destroySession(session) } : undefined };
}
