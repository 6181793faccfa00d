/**
 * A study's move and what goes with it (a statement's state) are one
 * transaction: when the second part fails, the study keeps its state and the
 * audit trail records no move.
 */
import { count, eq } from "drizzle-orm";
import { beforeAll, describe, expect, it } from "vitest";
import { db } from "~/db/client.server";
import { auditEvents, studies, users } from "~/db/schema";
import { previewTransition, transitionStudy } from "~/models/study-lifecycle.server";
import { seedDemo } from "../../seed/seed";
import { useFreshDatabase } from "../support/database";

beforeAll(async () => {
  await useFreshDatabase();
  await seedDemo(db);
});

const checkingStudy = async () => (await db.query.studies.findFirst({ where: eq(studies.code, "FF-2026-A") }))!;
const auditCount = async () => (await db.select({ n: count() }).from(auditEvents))[0]!.n;

describe("transitionStudy with writes alongside", () => {
  it("rolls the move back when the writes alongside fail", async () => {
    const study = await checkingStudy();
    const coordinator = (await db.query.users.findFirst({ where: eq(users.email, "coordinator@ringbatch.example") }))!;
    expect((await previewTransition(study, "cancelled")).allowed).toBe(true);
    const before = await auditCount();
    await expect(
      transitionStudy(study, "cancelled", coordinator.id, {
        alongside: async () => {
          throw new Error("the statement could not be updated");
        },
      }),
    ).rejects.toThrow("the statement could not be updated");
    expect((await checkingStudy()).state).toBe("checking");
    expect(await auditCount()).toBe(before);
  });

  it("commits the move and the writes alongside together", async () => {
    const study = await checkingStudy();
    const coordinator = (await db.query.users.findFirst({ where: eq(users.email, "coordinator@ringbatch.example") }))!;
    const moved = await transitionStudy(study, "cancelled", coordinator.id, {
      alongside: async (tx) => {
        await tx.update(studies).set({ notes: "cancelled: the sand lot was contaminated" }).where(eq(studies.id, study.id));
      },
    });
    expect(moved.allowed).toBe(true);
    const after = await checkingStudy();
    expect([after.state, after.notes]).toEqual(["cancelled", "cancelled: the sand lot was contaminated"]);
  });

  it("leaves moves into and out of review to the statement page, and never reopens testing", async () => {
    const study = { ...(await checkingStudy()), state: "checking" as const };
    expect((await previewTransition(study, "in_review")).problems).toContain("This move is made on the statement page, together with the statement and its committee round.");
    expect((await previewTransition(study, "testing")).problems).toContain("A study cannot go from checking to testing.");
    const inReview = { ...study, state: "in_review" as const };
    expect((await previewTransition(inReview, "checking")).allowed).toBe(false);
    expect((await previewTransition(inReview, "checking", [], "statement")).allowed).toBe(true);
  });
});
