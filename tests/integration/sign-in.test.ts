import { eq } from "drizzle-orm";
import { beforeAll, describe, expect, it } from "vitest";
import { db } from "~/db/client.server";
import { sessions, users } from "~/db/schema";
import { SIGN_IN_FAILED, signInWaitMessage } from "~/server/auth.server";
import { getUser } from "~/server/guards.server";
import * as login from "~/routes/auth/login";
import * as logout from "~/routes/auth/logout";
import { seedDemo } from "../../seed/seed";
import { DEMO_PASSWORD } from "../../seed/demo-data";
import { useFreshDatabase } from "../support/database";
import { call, cookieFrom, get, post } from "../support/routes";

beforeAll(async () => {
  await useFreshDatabase();
  await seedDemo(db);
});

const signIn = (email: string, password: string, headers: Record<string, string> = {}) => {
  const request = post("/login", { email, password });
  for (const [k, v] of Object.entries(headers)) request.headers.set(k, v);
  return call(login.action, request);
};

/** The form-wide message of a refused sign-in (Conform's reply). */
const formError = (outcome: { data: any }) => outcome.data?.result?.error?.[""]?.[0];

describe("sign-in", () => {
  it("sends each role to its own home with a new server-side session", async () => {
    const homes = {
      "admin@ringbatch.example": "/admin/users",
      "coordinator@ringbatch.example": "/studies",
      "analyst1@ringbatch.example": "/lab",
      "reviewer1@ringbatch.example": "/review",
    };
    for (const [email, home] of Object.entries(homes)) {
      const outcome = await signIn(email, DEMO_PASSWORD);
      expect(outcome.status).toBe(302);
      expect(outcome.headers.get("Location")).toBe(home);
      const setCookie = outcome.headers.get("Set-Cookie")!;
      expect(setCookie).toMatch(/HttpOnly/i);
      expect(setCookie).toMatch(/SameSite=Lax/i);
      const user = await getUser(get(home, cookieFrom(outcome.headers)));
      expect(user?.email).toBe(email);
    }
  });

  it("issues a different session id at every sign-in, even when a cookie came in", async () => {
    const first = await signIn("coordinator@ringbatch.example", DEMO_PASSWORD);
    const second = await signIn("coordinator@ringbatch.example", DEMO_PASSWORD, { Cookie: cookieFrom(first.headers) });
    expect(cookieFrom(second.headers)).not.toBe(cookieFrom(first.headers));
  });

  it("answers a wrong password and an unknown account with the same generic message", async () => {
    const wrong = await signIn("reviewer2@ringbatch.example", "not-the-password");
    const unknown = await signIn("nobody@ringbatch.example", "whatever-it-is");
    expect(wrong.status).toBe(401);
    expect(formError(wrong)).toBe(SIGN_IN_FAILED);
    expect(formError(unknown)).toBe(SIGN_IN_FAILED);
    expect(wrong.headers.get("Set-Cookie")).toBeNull();
  });

  it("refuses a disabled account with the same message", async () => {
    await db.update(users).set({ disabledAt: new Date() }).where(eq(users.email, "analyst8@ringbatch.example"));
    const outcome = await signIn("analyst8@ringbatch.example", DEMO_PASSWORD);
    expect(outcome.status).toBe(401);
    expect(formError(outcome)).toBe(SIGN_IN_FAILED);
  });

  it("makes one account and address wait longer after each wrong password beyond the third", async () => {
    const from = { "X-Forwarded-For": "203.0.113.9" };
    for (let i = 0; i < 3; i++) expect((await signIn("analyst3@ringbatch.example", "guess-" + i, from)).status).toBe(401);
    // The third failure starts a 2-second wait: even the right password waits.
    const waiting = await signIn("analyst3@ringbatch.example", DEMO_PASSWORD, from);
    expect(waiting.status).toBe(429);
    expect(formError(waiting)).toBe(signInWaitMessage(2));
    // Another address is not held up by this one.
    expect((await signIn("analyst3@ringbatch.example", DEMO_PASSWORD, { "X-Forwarded-For": "198.51.100.4" })).status).toBe(302);
    await new Promise((resolve) => setTimeout(resolve, 2100));
    expect((await signIn("analyst3@ringbatch.example", DEMO_PASSWORD, from)).status).toBe(302);
  });

  it("ends the session on the server at sign-out, so the old cookie stops working", async () => {
    const outcome = await signIn("analyst2@ringbatch.example", DEMO_PASSWORD);
    const cookie = cookieFrom(outcome.headers);
    const before = await db.select().from(sessions);
    const out = await call(logout.action, post("/logout", {}, cookie));
    expect(out.status).toBe(302);
    expect(await db.select().from(sessions)).toHaveLength(before.length - 1);
    expect(await getUser(get("/lab", cookie))).toBeNull();
  });

  it("only follows same-site redirects after sign-in", async () => {
    const request = post("/login?redirectTo=//evil.example/x", { email: "coordinator@ringbatch.example", password: DEMO_PASSWORD });
    const outcome = await call(login.action, request);
    expect(outcome.headers.get("Location")).toBe("/studies");
  });
});
