/**
 * `npm run seed:large`: adds the generated 40-lab × 12-material study
 * (seed/large-study.ts) to the database at DATABASE_URL, after the
 * migrations and the demo. Running it twice changes nothing.
 */
import { closeDatabase, databaseConfig, db, migrateDatabase } from "../app/db/client.server";
import { LARGE_STUDY, seedLargeStudy } from "../seed/large-study";
import { seedDemo } from "../seed/seed";

await migrateDatabase();
await seedDemo(db);
const study = await seedLargeStudy(db);
console.log(`Study ${LARGE_STUDY.code} (id ${study.id}, ${LARGE_STUDY.labs} labs × ${LARGE_STUDY.materials} materials) is in ${databaseConfig().url}.`);
closeDatabase();
