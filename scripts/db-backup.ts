/** `npm run db:backup [-- DIRECTORY]`: a consistent, timestamped copy of the database (default folder: backups/). */
import { closeDatabase, databaseConfig, db } from "../app/db/client.server";
import { backupDatabase } from "../app/db/backup.server";

if (!databaseConfig().isLocalFile) {
  console.error("db:backup copies a local file database; back up a libSQL server with its own tools.");
  process.exit(1);
}
const target = await backupDatabase(db, process.argv[2] ?? "backups");
console.log(`Backup written to ${target}`);
closeDatabase();
