/** Applies the migrations and seeds the demo scenario (idempotent). Run by `npm start`. */
import { closeDatabase, databaseConfig, db, migrateDatabase } from "../app/db/client.server";
import { seedDemo } from "../seed/seed";

await migrateDatabase();
await seedDemo(db);
console.log(`Database ready at ${databaseConfig().url} (migrations applied, demo data present).`);
closeDatabase();
