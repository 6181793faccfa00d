/**
 * Calls a route module's loader or action the way the framework does, with a
 * real Request, and turns whatever it returns or throws into { status, data,
 * headers } so tests can assert on it.
 */
import path from "node:path";
import { RouterContextProvider } from "react-router";
import routeConfig from "~/routes";
import { sessionStorage } from "~/server/session.server";

type RouteFunction = (args: never) => unknown;
type Middleware = (args: unknown, next: () => Promise<unknown>) => unknown;

/** `data`: a JSON answer, parsed; `bytes`: any other answer's body (a download). */
export type RouteOutcome = { status: number; data: any; headers: Headers; bytes?: Uint8Array };

type ConfigEntry = { file: string; children?: ConfigEntry[] };
type RouteModule = { loader?: unknown; action?: unknown; middleware?: Middleware[] };
const load = (entry: ConfigEntry): Promise<RouteModule> => import(path.resolve("app", entry.file));

/** The route module that exports `fn` and those above it, outermost first, as the route table nests them. */
async function chainOf(fn: RouteFunction, entries: ConfigEntry[], above: RouteModule[] = []): Promise<RouteModule[] | null> {
  for (const entry of entries) {
    const module = await load(entry);
    if (module.loader === fn || module.action === fn) return [...above, module];
    const found = entry.children && (await chainOf(fn, entry.children, [...above, module]));
    if (found) return found;
  }
  return null;
}

export async function call(fn: RouteFunction, request: Request, params: Record<string, string> = {}): Promise<RouteOutcome> {
  try {
    const context = new RouterContextProvider();
    // Middleware runs first, the parents' before the route's own, as in the framework: it checks access and fills the context.
    for (const module of (await chainOf(fn, routeConfig as ConfigEntry[])) ?? []) {
      for (const run of module.middleware ?? []) await run({ request, params, context }, async () => undefined);
    }
    return toOutcome(await (fn as (args: unknown) => unknown)({ request, params, context }));
  } catch (thrown) {
    return toOutcome(thrown);
  }
}

async function toOutcome(value: unknown): Promise<RouteOutcome> {
  if (value instanceof Response) {
    const json = value.headers.get("Content-Type")?.includes("json");
    return {
      status: value.status,
      data: json ? await value.clone().json() : null,
      headers: value.headers,
      bytes: json || !value.body ? undefined : new Uint8Array(await value.clone().arrayBuffer()),
    };
  }
  if (value && typeof value === "object" && (value as { type?: string }).type === "DataWithResponseInit") {
    const { data, init } = value as { data: unknown; init?: ResponseInit };
    return { status: init?.status ?? 200, data, headers: new Headers(init?.headers) };
  }
  if (value instanceof Error) throw value;
  return { status: 200, data: value, headers: new Headers() };
}

const ORIGIN = "http://ringbatch.test";

export function get(path: string, cookie?: string) {
  return new Request(ORIGIN + path, { headers: cookie ? { Cookie: cookie } : {} });
}

/** A form post; a list value is sent as the same field repeated (ticked boxes). */
export function post(path: string, fields: Record<string, string | string[]>, cookie?: string) {
  return new Request(ORIGIN + path, {
    method: "POST",
    headers: { "Content-Type": "application/x-www-form-urlencoded", Origin: ORIGIN, ...(cookie ? { Cookie: cookie } : {}) },
    body: new URLSearchParams(Object.entries(fields).flatMap(([name, value]) => (Array.isArray(value) ? value : [value]).map((v) => [name, v]))),
  });
}

/** The Cookie header a browser would send back after this Set-Cookie. */
export function cookieFrom(headers: Headers) {
  const setCookie = headers.get("Set-Cookie");
  if (!setCookie) throw new Error("No Set-Cookie header");
  return setCookie.split(";")[0]!;
}

/** A signed-in session for a user, made through the same storage as the sign-in form. */
export async function sessionCookieFor(userId: number) {
  const session = await sessionStorage.getSession();
  session.set("userId", userId);
  return cookieFrom(new Headers({ "Set-Cookie": await sessionStorage.commitSession(session) }));
}
