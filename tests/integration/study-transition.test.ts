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
    expect((await previewTransition(study, "testing")).allowed).toBe(true);
    const before = await auditCount();
    await expect(
      transitionStudy(study, "testing", coordinator.id, {
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
    const moved = await transitionStudy(study, "testing", coordinator.id, {
      alongside: async (tx) => {
        await tx.update(studies).set({ notes: "reopened for one lab's retest" }).where(eq(studies.id, study.id));
      },
    });
    expect(moved.allowed).toBe(true);
    const after = await checkingStudy();
    expect([after.state, after.notes]).toEqual(["testing", "reopened for one lab's retest"]);
  });
});
