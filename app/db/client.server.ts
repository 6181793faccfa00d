import { mkdirSync } from "node:fs";
import { dirname, resolve } from "node:path";
import { createClient, type Client } from "@libsql/client";
import { drizzle, type LibSQLDatabase } from "drizzle-orm/libsql";
import { migrate } from "drizzle-orm/libsql/migrator";
import * as schema from "./schema";

export type Database = LibSQLDatabase<typeof schema>;

const DEFAULT_URL = "file:data/ringbatch.db";

/**
 * Where the database lives: `DATABASE_URL` (a `file:` path for the embedded
 * default, or `libsql://…` / `http://…` with `DATABASE_AUTH_TOKEN` for a shared
 * libSQL server that several app instances use at once).
 */
export function databaseConfig(env: NodeJS.ProcessEnv = process.env) {
  const url = env.DATABASE_URL || DEFAULT_URL;
  const authToken = env.DATABASE_AUTH_TOKEN || undefined;
  if (!/^(file|libsql|https?|wss?):/.test(url)) {
    throw new Error(`DATABASE_URL must start with file:, libsql:, http(s): or ws(s): (got "${url}")`);
  }
  return { url, authToken, isLocalFile: url.startsWith("file:") };
}

function openClient(): Client {
  const { url, authToken, isLocalFile } = databaseConfig();
  if (isLocalFile) mkdirSync(dirname(resolve(url.slice("file:".length))), { recursive: true });
  // `timeout` is SQLite's busy timeout for local files, so concurrent writers wait instead of failing.
  return createClient({ url, authToken, timeout: 5000 });
}

// One client per process, kept on globalThis so the dev server's module reloads reuse it.
const globalStore = globalThis as typeof globalThis & { __ringbatchDb?: { client: Client; db: Database } };

function connection() {
  globalStore.__ringbatchDb ??= (() => {
    const client = openClient();
    return { client, db: drizzle(client, { schema }) };
  })();
  return globalStore.__ringbatchDb;
}

/** The drizzle handle. Opened on first use so tests can choose the database first. */
export const db: Database = new Proxy({} as Database, {
  get(_target, property) {
    const real = connection().db;
    const value = Reflect.get(real, property);
    return typeof value === "function" ? value.bind(real) : value;
  },
});

const MIGRATIONS_FOLDER = resolve(process.env.MIGRATIONS_FOLDER ?? "drizzle");

let migrated: Promise<void> | undefined;

/** Applies pending migrations from drizzle/ once per process; WAL for local files. */
export function migrateDatabase() {
  migrated ??= (async () => {
    const { client, db } = connection();
    if (databaseConfig().isLocalFile) await client.execute("PRAGMA journal_mode = WAL");
    await migrate(db, { migrationsFolder: MIGRATIONS_FOLDER });
  })();
  return migrated;
}

export function closeDatabase() {
  globalStore.__ringbatchDb?.client.close();
  globalStore.__ringbatchDb = undefined;
  migrated = undefined;
}
