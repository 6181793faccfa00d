/**
 * The database's first use, run by `npm start` after the migrations: into a
 * database with no accounts it writes the demo (when wanted: on by default
 * outside production, DEMO=on in production) or prints a one-time link that
 * creates the first administrator. A database with accounts is left alone.
 */
import { closeDatabase, databaseConfig, db } from "../app/db/client.server";
import { prepareFirstUse, SETUP_LINK_MINUTES } from "../app/models/first-use.server";

const firstUse = await prepareFirstUse(process.env, db);
const where = databaseConfig().url;
if (firstUse.outcome === "has-accounts") {
  console.log(`${where} has accounts: nothing written.`);
} else if (firstUse.outcome === "demo-written") {
  console.log(`${where} had no accounts: demo data written (fictional people and labs; the demo password is in the README).`);
} else {
  const base = process.env.APP_URL || `http://localhost:${process.env.PORT ?? 3000}`;
  console.log(
    [
      `${where} has no accounts. Create the first administrator within ${SETUP_LINK_MINUTES} minutes (the link works once):`,
      `  ${new URL(firstUse.path, base)}`,
      "Start the server again for a new link if this one expires.",
    ].join("\n"),
  );
}
closeDatabase();
