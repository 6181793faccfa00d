import { mkdirSync } from "node:fs";
import { resolve } from "node:path";
import { sql } from "drizzle-orm";
import type { Database } from "./client.server";

/**
 * A consistent copy of the live database in one file (SQLite's VACUUM INTO),
 * taken while the app keeps running: readers and writers are not stopped.
 */
export async function backupDatabase(db: Database, directory = "backups", now = new Date()) {
  mkdirSync(directory, { recursive: true });
  const stamp = now.toISOString().replace(/[:.]/g, "-");
  const target = resolve(directory, `ringbatch-${stamp}.db`);
  await db.run(sql`VACUUM INTO ${target}`);
  return target;
}

/** Row count of every table, and a checksum over all results, to compare two databases. */
export async function databaseFingerprint(db: Database) {
  const tables = await db.all<{ name: string }>(
    sql`SELECT name FROM sqlite_master WHERE type = 'table' AND name NOT LIKE 'sqlite_%' ORDER BY name`,
  );
  const counts: Record<string, number> = {};
  for (const { name } of tables) {
    const [row] = await db.all<{ n: number }>(sql.raw(`SELECT count(*) AS n FROM "${name.replace(/"/g, '""')}"`));
    counts[name] = row!.n;
  }
  const [checksum] = await db.all<{ digest: string | null }>(
    sql`SELECT group_concat(id || ':' || cell_id || ':' || replicate || ':' || value, ',') AS digest FROM (SELECT * FROM results ORDER BY id)`,
  );
  return { counts, resultsDigest: checksum!.digest ?? "" };
}
