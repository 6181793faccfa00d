/** Applies the migrations (idempotent). Writes no accounts: `npm run db:seed` does the first use. */
import { closeDatabase, databaseConfig, migrateDatabase } from "../app/db/client.server";

await migrateDatabase();
console.log(`Database ready at ${databaseConfig().url} (migrations applied).`);
closeDatabase();
