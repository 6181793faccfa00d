import { db } from "~/db/client.server";
import { auditEvents } from "~/db/schema";

type Executor = Pick<typeof db, "insert">;

export type AuditEntry = {
  actorUserId: number | null;
  action: string;
  entityType: string;
  entityId?: string | number | null;
  studyId?: number | null;
  before?: unknown;
  after?: unknown;
  reason?: string | null;
};

/** Appends one event to the audit trail; pass the transaction so the event commits with the change. */
export async function recordAudit(entry: AuditEntry, executor: Executor = db) {
  await executor.insert(auditEvents).values({
    ...entry,
    entityId: entry.entityId == null ? null : String(entry.entityId),
    before: entry.before ?? null,
    after: entry.after ?? null,
  });
}
