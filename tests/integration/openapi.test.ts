/**
 * The OpenAPI document at /api/v1/openapi.json against the route table and
 * the OpenAPI 3.1 specification (https://spec.openapis.org/oas/v3.1.0): every
 * /api/v1 route and method is described, every path parameter is declared,
 * every $ref resolves, and every schema is JSON Schema that zod's own reader
 * (z.fromJSONSchema) accepts and that validates what the routes validate.
 */
import path from "node:path";
import { beforeAll, describe, expect, it } from "vitest";
import { z } from "zod";
import routeConfig from "~/routes";
import * as openapi from "~/routes/api/v1/openapi";
import * as enrollmentResults from "~/routes/api/v1/enrollment-results";
import * as precision from "~/routes/api/v1/study-precision";
import { demoCookie, demoStudy, useDemoDatabase } from "../support/demo";
import { call, get } from "../support/routes";
import { db } from "~/db/client.server";
import { enrollments, labs } from "~/db/schema";
import { eq } from "drizzle-orm";
import { DEMO_LABS } from "../../seed/demo-data";

type RouteEntry = { path?: string; file: string; children?: RouteEntry[] };
type Json = Record<string, any>;

let document: Json;

beforeAll(async () => {
  await useDemoDatabase();
  const outcome = await call(openapi.loader, get("/api/v1/openapi.json"));
  expect(outcome.status).toBe(200);
  document = outcome.data;
});

/** Every route of app/routes.ts under api/v1 with the methods its module answers (loader: GET, action: POST). */
async function apiRoutes() {
  const found: { path: string; methods: string[] }[] = [];
  const walk = async (entries: RouteEntry[], above: string) => {
    for (const entry of entries) {
      const full = [above, entry.path].filter(Boolean).join("/");
      if (full.startsWith("api/v1")) {
        const module = await import(path.resolve("app", entry.file));
        found.push({ path: full, methods: [...(module.loader ? ["get"] : []), ...(module.action ? ["post"] : [])] });
      }
      if (entry.children) await walk(entry.children, full);
    }
  };
  await walk(routeConfig as RouteEntry[], "");
  return found;
}

/** Every object under `value` that sits where OpenAPI puts a schema. */
function schemasIn(value: unknown, found: Json[] = []): Json[] {
  if (Array.isArray(value)) value.forEach((v) => schemasIn(v, found));
  else if (value && typeof value === "object") {
    for (const [key, inner] of Object.entries(value)) {
      if (key === "schema" && inner && typeof inner === "object") found.push(inner as Json);
      else schemasIn(inner, found);
    }
  }
  return found;
}

function resolve(ref: string): unknown {
  expect(ref.startsWith("#/")).toBe(true);
  return ref
    .slice(2)
    .split("/")
    .reduce<any>((at, key) => at?.[key], document);
}

describe("the OpenAPI document", () => {
  it("is OpenAPI 3.1 with a server, bearer-token security and an info block", () => {
    expect(document.openapi).toMatch(/^3\.1\.\d+$/);
    expect(document.info.title).toBeTruthy();
    expect(document.info.version).toBeTruthy();
    expect(document.servers[0].url).toBe("http://ringbatch.test");
    expect(document.components.securitySchemes.bearerToken).toEqual(expect.objectContaining({ type: "http", scheme: "bearer" }));
    expect(document.security).toContainEqual({ bearerToken: [] });
  });

  it("describes every /api/v1 route of the route table, with each method it answers, and nothing else", async () => {
    const routes = await apiRoutes();
    expect(routes.length).toBeGreaterThan(15);
    const described = Object.entries(document.paths as Json).flatMap(([p, ops]) => Object.keys(ops).map((m) => `${m.toUpperCase()} ${p}`));
    const routed = routes.flatMap((r) => r.methods.map((m) => `${m.toUpperCase()} /${r.path.replace(/:(\w+)/g, "{$1}")}`));
    expect(described.sort()).toEqual(routed.sort());
  });

  it("declares each path parameter, answers each operation with a success and its failures, and every $ref resolves", () => {
    for (const [p, ops] of Object.entries(document.paths as Json)) {
      const names = [...p.matchAll(/\{(\w+)\}/g)].map((m) => m[1]);
      for (const op of Object.values(ops as Json)) {
        const declared = (op.parameters ?? []).filter((q: Json) => q.in === "path");
        expect(declared.map((q: Json) => q.name).sort(), p).toEqual([...names].sort());
        for (const q of declared) expect(q.required).toBe(true);
        expect(op.responses["200"], p).toBeDefined();
        expect(typeof op.summary).toBe("string");
      }
    }
    const refs = JSON.stringify(document).match(/"\$ref":"[^"]+"/g) ?? [];
    expect(refs.length).toBeGreaterThan(0);
    for (const ref of refs) expect(resolve(JSON.parse(`{${ref}}`).$ref), ref).toBeDefined();
  });

  it("holds only schemas that read as JSON Schema 2020-12", () => {
    const schemas = schemasIn(document);
    expect(schemas.length).toBeGreaterThan(30);
    for (const schema of schemas) {
      const target = schema.$ref ? (resolve(schema.$ref) as Json) : schema;
      expect(() => z.fromJSONSchema(target as never), JSON.stringify(schema).slice(0, 120)).not.toThrow();
    }
  });

  it("lets the documented significance levels through the precision route, and the route refuses one the document does not list", async () => {
    const alpha = document.paths["/api/v1/studies/{studyId}/precision"].get.parameters.find((q: Json) => q.name === "alpha");
    expect(alpha.schema.enum).toEqual(["0.005", "0.01", "0.05"]);
    const study = await demoStudy("FF-2026-A");
    const cookie = await demoCookie("coordinator@ringbatch.example");
    for (const level of alpha.schema.enum) {
      const outcome = await call(precision.loader, get(`/api/v1/studies/${study.id}/precision?alpha=${level}`, cookie), { studyId: String(study.id) });
      expect(outcome.status).toBe(200);
      expect(outcome.data.alpha).toBe(Number(level));
    }
    const refused = await call(precision.loader, get(`/api/v1/studies/${study.id}/precision?alpha=0.1`, cookie), { studyId: String(study.id) });
    expect(refused.status).toBe(422);
    expect(refused.data.error.code).toBe("invalid_alpha");
  });

  it("documents the results body so that what it refuses, the route refuses too", async () => {
    const schema = z.fromJSONSchema(document.paths["/api/v1/enrollments/{enrollmentId}/results"].post.requestBody.content["application/json"].schema);
    const good = { results: [{ material: "F1", response: "holes", replicate: 1, value: 10, testedOn: "2026-11-20", operator: "Bo Lindqvar" }] };
    const bad = [
      { results: [] },
      { results: [{ material: "F1", response: "holes", replicate: 1.5, value: 10 }] },
      { results: [{ material: "F1", response: "holes", replicate: 1, value: 10, colour: "blue" }] },
      { results: [{ material: "F1", response: "holes", replicate: 1, value: "10" }] },
    ];
    expect(schema.safeParse(good).success).toBe(true);
    const [enrollment] = await db
      .select({ id: enrollments.id })
      .from(enrollments)
      .innerJoin(labs, eq(labs.id, enrollments.labId))
      .where(eq(labs.name, DEMO_LABS[6].name));
    const cookie = await demoCookie("analyst7@ringbatch.example");
    for (const body of bad) {
      expect(schema.safeParse(body).success, JSON.stringify(body)).toBe(false);
      const request = new Request(`http://ringbatch.test/api/v1/enrollments/${enrollment!.id}/results`, {
        method: "POST",
        headers: { "Content-Type": "application/json", Cookie: cookie },
        body: JSON.stringify(body),
      });
      const outcome = await call(enrollmentResults.action, request, { enrollmentId: String(enrollment!.id) });
      expect(outcome.status, JSON.stringify(body)).toBe(422);
    }
  });
});
