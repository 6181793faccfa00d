import { copyFileSync, mkdtempSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { createClient } from "@libsql/client";
import { drizzle } from "drizzle-orm/libsql";
import { beforeAll, describe, expect, it } from "vitest";
import { backupDatabase, databaseFingerprint } from "~/db/backup.server";
import { db } from "~/db/client.server";
import * as schema from "~/db/schema";
import { seedDemo } from "../../seed/seed";
import { useFreshDatabase } from "../support/database";

beforeAll(async () => {
  await useFreshDatabase();
  await seedDemo(db);
});

describe("backup and restore", () => {
  it("backs up, restores into a new file, and every table's rows and the results' checksum match", async () => {
    const dir = mkdtempSync(join(tmpdir(), "ringbatch-backup-"));
    const backup = await backupDatabase(db, dir, new Date("2026-12-01T10:00:00Z"));
    expect(backup).toMatch(/ringbatch-2026-12-01T10-00-00-000Z\.db$/);
    // Restore as the README says: copy the backup to where DATABASE_URL points.
    const restoredPath = join(dir, "restored.db");
    copyFileSync(backup, restoredPath);
    const client = createClient({ url: `file:${restoredPath}` });
    const restored = drizzle(client, { schema });
    const [original, copy] = [await databaseFingerprint(db), await databaseFingerprint(restored)];
    client.close();
    expect(copy).toEqual(original);
    expect(original.counts.results).toBe(636); // the demo: 252 in the checking and testing studies, 144 in the published one, 240 in the rounds
    expect(original.resultsDigest.length).toBeGreaterThan(0);
  });
});
