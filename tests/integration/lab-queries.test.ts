import { eq } from "drizzle-orm";
import { beforeAll, describe, expect, it } from "vitest";
import { db } from "~/db/client.server";
import { auditEvents, emailOutbox, queries } from "~/db/schema";
import * as labQueries from "~/routes/lab/queries";
import { seedDemo } from "../../seed/seed";
import { useFreshDatabase } from "../support/database";
import { demoCookie } from "../support/demo";
import { call, get, post } from "../support/routes";
import { errorsOf, toastOf } from "../support/replies";

let queryId: number;

beforeAll(async () => {
  await useFreshDatabase();
  await seedDemo(db);
  queryId = (await db.select().from(queries))[0]!.id;
});

describe("queries from the coordinator to a lab", () => {
  it("shows the seeded open query to its own lab only", async () => {
    const own = await call(labQueries.loader, get("/lab/queries", await demoCookie("analyst1@ringbatch.example")));
    expect(own.data.queries).toHaveLength(1);
    expect(own.data.queries[0]).toMatchObject({ studyCode: "FF-2026-B", materialCode: "F1", state: "open", labCode: "L06" });
    const other = await call(labQueries.loader, get("/lab/queries", await demoCookie("analyst2@ringbatch.example")));
    expect(other.data.queries).toEqual([]);
  });

  it("answers 404 when another lab tries to answer it", async () => {
    const outcome = await call(labQueries.action, post("/lab/queries", { queryId: String(queryId), answer: "Not ours to answer" }, await demoCookie("analyst2@ringbatch.example")));
    expect(outcome.status).toBe(404);
    expect((await db.query.queries.findFirst({ where: eq(queries.id, queryId) }))!.state).toBe("open");
  });

  it("refuses an empty answer beside the field", async () => {
    const outcome = await call(labQueries.action, post("/lab/queries", { queryId: String(queryId), answer: " " }, await demoCookie("analyst1@ringbatch.example")));
    expect(outcome.status).toBe(400);
    expect(errorsOf(outcome).answer).toBe("Write your answer (at least 3 characters).");
  });

  it("records the lab's answer, audits it and e-mails the coordinator", async () => {
    const answer = "All three were finished by the same operator within ten minutes; the counts are as recorded.";
    const outcome = await call(labQueries.action, post("/lab/queries", { queryId: String(queryId), answer }, await demoCookie("analyst1@ringbatch.example")));
    expect(await toastOf(outcome)).toBe("Answer sent to the coordinator.");
    expect(await db.query.queries.findFirst({ where: eq(queries.id, queryId) })).toMatchObject({ state: "answered", answer });
    const mail = await db.select().from(emailOutbox).where(eq(emailOutbox.to, "coordinator@ringbatch.example"));
    expect(mail.at(-1)!.subject).toBe("FF-2026-B: lab L06 answered your query on F1");
    expect(mail.at(-1)!.text).toContain(answer);
    const events = await db.select().from(auditEvents).where(eq(auditEvents.action, "query.answered"));
    expect(events).toHaveLength(1);
  });
});
