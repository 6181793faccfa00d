/**
 * The account's API page: its examples use the app's address and the
 * signed-in person's own studies, offer only the calls their role may make,
 * and each one, run against the routes, succeeds.
 */
import path from "node:path";
import { eq } from "drizzle-orm";
import { beforeAll, describe, expect, it } from "vitest";
import { db } from "~/db/client.server";
import { users } from "~/db/schema";
import { createApiToken } from "~/models/api-token.server";
import { loadSessionUser } from "~/models/user.server";
import routeConfig from "~/routes";
import * as accountApi from "~/routes/account-api";
import { demoCookie, demoStudy, useDemoDatabase } from "../support/demo";
import { call, get } from "../support/routes";

type RouteEntry = { path?: string; file: string; children?: RouteEntry[] };
type Example = { title: string; command: string };

const ORIGIN = "http://ringbatch.test";

beforeAll(useDemoDatabase);

async function pageFor(email: string) {
  const outcome = await call(accountApi.loader, get("/account/api", await demoCookie(email)));
  expect(outcome.status).toBe(200);
  return outcome.data as { setup: string; examples: Example[] };
}

/** The API route that answers a path, and its parameters, from app/routes.ts. */
function routeFor(urlPath: string) {
  const flat: { pattern: string; file: string }[] = [];
  const walk = (entries: RouteEntry[], above: string) => {
    for (const entry of entries) {
      const full = [above, entry.path].filter(Boolean).join("/");
      if (full.startsWith("api/v1")) flat.push({ pattern: full, file: entry.file });
      if (entry.children) walk(entry.children, full);
    }
  };
  walk(routeConfig as RouteEntry[], "");
  for (const { pattern, file } of flat) {
    const names: string[] = [];
    const regex = new RegExp(`^/${pattern.replace(/\./g, "\\.").replace(/:(\w+)/g, (_, name: string) => (names.push(name), "([^/]+)"))}$`);
    const match = regex.exec(urlPath);
    if (match) return { file, params: Object.fromEntries(names.map((n, i) => [n, match[i + 1]!])) };
  }
  throw new Error(`No API route answers ${urlPath}`);
}

/** Runs one example's curl line as the framework would: its method, URL, body and credentials. */
async function run(example: Example, credentials: { Cookie: string } | { Authorization: string }) {
  const command = example.command.replace(/\\\n\s*/g, " ");
  const url = new URL(/\$B(\S+?)"?(\s|$)/.exec(command)![1]!, ORIGIN);
  const body = /-d '([^']+)'/.exec(command)?.[1];
  const { file, params } = routeFor(url.pathname);
  const module = await import(path.resolve("app", file));
  const request = new Request(url, {
    method: body ? "POST" : "GET",
    headers: { ...credentials, ...(body ? { "Content-Type": "application/json" } : {}) },
    body,
  });
  return call(body ? module.action : module.loader, request, params);
}

describe("the account's API page", () => {
  it("fills the coordinator's examples with the app's address and their own studies, and each runs", async () => {
    const { setup, examples } = await pageFor("coordinator@ringbatch.example");
    expect(setup).toContain(`B=${ORIGIN}`);
    expect(setup).toContain("email=coordinator@ringbatch.example");
    const checking = await demoStudy("FF-2026-A");
    const published = await demoStudy("FF-2025-D");
    const commands = examples.map((e) => e.command).join("\n");
    // The study with results to check comes first; the published one gives the bundle.
    expect(commands).toContain(`$B/api/v1/studies/${checking.id}/results.xlsx`);
    // The what-if example leaves out a real submitted cell of that study, so it runs as written.
    expect(commands).toMatch(new RegExp(`\\$B/api/v1/studies/${checking.id}/what-if\\?exclude=L\\d+:[A-Z]\\d+:\\w+"`));
    expect(commands).toContain(`$B/api/v1/studies/${published.id}/bundle.zip`);
    expect(commands).toMatch(/\$B\/api\/v1\/rounds\/\d+\/scores/);
    const cookie = await demoCookie("coordinator@ringbatch.example");
    for (const example of examples) {
      expect((await run(example, { Cookie: cookie })).status, example.command).toBe(200);
    }
    const whatIf = examples.find((e) => e.command.includes("what-if"))!;
    const excluded = /exclude=(L\d+):(\w+):(\w+)/.exec(whatIf.command)!;
    const preview = (await run(whatIf, { Cookie: cookie })).data as { excluded: { lab: string; material: string; response: string }[] };
    expect(preview.excluded).toContainEqual(expect.objectContaining({ lab: excluded[1], material: excluded[2], response: excluded[3] }));
  });

  it("gives a reviewer the blinded reads only, and they run with a study:read token", async () => {
    const { examples } = await pageFor("reviewer1@ringbatch.example");
    const commands = examples.map((e) => e.command).join("\n");
    expect(commands).not.toContain("what-if");
    expect(commands).not.toContain("/progress");
    expect(commands).not.toContain("/enrollments/");
    const reviewer = (await loadSessionUser((await db.query.users.findFirst({ where: eq(users.email, "reviewer1@ringbatch.example") }))!.id))!;
    const studyId = Number(/studies\/(\d+)\/results/.exec(commands)![1]);
    const { token } = await createApiToken(reviewer, { name: "committee notebook", scope: "study:read", studyId });
    for (const example of examples.filter((e) => e.command.includes(`/studies/${studyId}`))) {
      expect((await run(example, { Authorization: `Bearer ${token}` })).status, example.command).toBe(200);
    }
  });

  it("gives an analyst their own lab's enrollment with the study's material and response, and the draft results go in", async () => {
    const { examples } = await pageFor("analyst7@ringbatch.example");
    const send = examples.find((e) => e.command.includes("/enrollments/"));
    expect(send?.command).toContain('"material":"F1","response":"holes"');
    expect(examples.map((e) => e.command).join("\n")).not.toContain("/results.xlsx");
    const outcome = await run(send!, { Cookie: await demoCookie("analyst7@ringbatch.example") });
    expect(outcome.status).toBe(200);
    expect(outcome.data).toEqual({ received: 2, changed: 2 });
  });

  it("is for signed-in people only", async () => {
    expect((await call(accountApi.loader, get("/account/api"))).status).toBe(302);
  });
});
