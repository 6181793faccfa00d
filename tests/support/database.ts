import { mkdtempSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { closeDatabase, migrateDatabase } from "~/db/client.server";

/** A new, empty SQLite file with every migration applied; the app's db handle points at it. */
export async function useFreshDatabase() {
  closeDatabase();
  const dir = mkdtempSync(join(tmpdir(), "ringbatch-test-"));
  process.env.DATABASE_URL = `file:${join(dir, "test.db")}`;
  await migrateDatabase();
  return process.env.DATABASE_URL;
}
