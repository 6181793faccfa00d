/**
 * `npm run seed:archive`: adds ten years of invented studies (seed/archive.ts)
 * to the database at DATABASE_URL, after the migrations and the demo, and
 * prints what it holds and the database's size on disk.
 */
import { statSync } from "node:fs";
import { sql } from "drizzle-orm";
import { closeDatabase, databaseConfig, db, migrateDatabase } from "../app/db/client.server";
import { archiveCounts, seedArchive } from "../seed/archive";
import { seedDemo } from "../seed/seed";

const started = performance.now();
await migrateDatabase();
await seedDemo(db);
const { created } = await seedArchive(db);
const counts = await archiveCounts(db);
const seconds = ((performance.now() - started) / 1000).toFixed(1);
console.log(`${created ? `Archive written in ${seconds} s` : "Archive already present"}: ${counts.studies} studies, ${counts.enrollments} enrollments, ${counts.results} results.`);
const { url, isLocalFile } = databaseConfig();
if (isLocalFile) {
  // Fold the write-ahead log into the file so its size is the database's.
  await db.run(sql`pragma wal_checkpoint(truncate)`);
  const file = url.replace(/^file:/, "");
  console.log(`Database ${file}: ${(statSync(file).size / 1024 / 1024).toFixed(1)} MB.`);
}
closeDatabase();
