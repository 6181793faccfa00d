import { AsyncLocalStorage } from "node:async_hooks";
import { mkdirSync } from "node:fs";
import { dirname, resolve } from "node:path";
import { createClient, type Client, type InStatement } from "@libsql/client";
import { drizzle, type LibSQLDatabase } from "drizzle-orm/libsql";
import { migrate } from "drizzle-orm/libsql/migrator";
import * as schema from "./schema";

export type Database = LibSQLDatabase<typeof schema>;
/** The handle a `db.transaction` callback gets. */
export type Transaction = Parameters<Parameters<Database["transaction"]>[0]>[0];

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
  // `timeout` is SQLite's busy timeout for local files, so writers of other processes wait instead of failing.
  const client = createClient({ url, authToken, timeout: 5000 });
  return isLocalFile ? queueLocalWrites(client) : client;
}

/*
 * One writer at a time in this process. The local driver runs each statement
 * synchronously, so a statement waiting for SQLite's write lock blocks the
 * event loop: the transaction holding the lock can never finish, and the
 * waiter fails with SQLITE_BUSY when the busy timeout runs out. Writes and
 * transactions therefore queue here; reads pass (WAL readers never wait).
 */
let writeQueue: Promise<unknown> = Promise.resolve();
const inTransaction = new AsyncLocalStorage<true>();

function queued<T>(run: () => Promise<T>): Promise<T> {
  // Statements of a transaction this async context holds run at once: queuing them would wait for itself.
  if (inTransaction.getStore()) return run();
  const result = writeQueue.then(run);
  writeQueue = result.catch(() => undefined);
  return result;
}

const isRead = (statement: InStatement) => /^\s*select\b/i.test(typeof statement === "string" ? statement : statement.sql);

/**
 * How hard a commit waits for the disk. With WAL, SQLite's NORMAL syncs at
 * checkpoints instead of on every commit: a commit costs about 0.06 ms instead
 * of 6 ms on this project's machine, and the database stays consistent after
 * any crash; a power cut (not a process crash) can undo the last commits
 * before a checkpoint. `DATABASE_SYNCHRONOUS=FULL` keeps every commit on disk.
 */
export function synchronousLevel(env: NodeJS.ProcessEnv = process.env) {
  return env.DATABASE_SYNCHRONOUS?.toUpperCase() === "FULL" ? "FULL" : "NORMAL";
}

function queueLocalWrites(client: Client): Client {
  // The level is a setting of each connection of the driver's pool, and cannot change inside a
  // transaction: it is set just before each write, on the idle connection the write then borrows
  // (a no-op where it is already set, a few microseconds).
  const pragma = `PRAGMA synchronous = ${synchronousLevel()}`;
  return new Proxy(client, {
    get(target, property) {
      const value = Reflect.get(target, property);
      if (typeof value !== "function") return value;
      const write = (args: unknown[]) => queued(() => target.execute(pragma).then(() => value.apply(target, args)));
      if (property === "execute") return (...args: [InStatement, ...unknown[]]) => (isRead(args[0]) ? value.apply(target, args) : write(args));
      if (property === "batch" || property === "migrate" || property === "executeMultiple") return (...args: unknown[]) => write(args);
      if (property === "transaction") return (...args: unknown[]) => target.execute(pragma).then(() => value.apply(target, args));
      return value.bind(target);
    },
  });
}

/** drizzle's transaction, queued behind other writers, with its statements marked as the queue holder's. */
function queuedTransaction(real: Database): Database["transaction"] {
  return (run, config) => queued(() => inTransaction.run(true, () => real.transaction(run, config)));
}

// One client per process, kept on globalThis so the dev server's module reloads reuse it.
type Connection = { client: Client; db: Database; config: ReturnType<typeof databaseConfig> };
const globalStore = globalThis as typeof globalThis & { __ringbatchDb?: Connection };

function connection() {
  globalStore.__ringbatchDb ??= (() => {
    const client = openClient();
    return { client, db: drizzle(client, { schema }), config: databaseConfig() };
  })();
  return globalStore.__ringbatchDb;
}

/**
 * A query built once per connection and run with new values each time (drizzle's `prepare`, with
 * `sql.placeholder` for the values). Assembling a query costs more than running a small indexed
 * read (0.12 against 0.04 ms for a `db.query` lookup of one row here); the reads every request
 * makes (the session, the signed-in person, the demo notice) skip the assembly.
 */
export function preparedOnce<T>(build: (database: Database) => T): () => T {
  const byConnection = new WeakMap<Connection, T>();
  return () => {
    const current = connection();
    let query = byConnection.get(current);
    if (query === undefined) byConnection.set(current, (query = build(current.db)));
    return query;
  };
}

/** The drizzle handle. Opened on first use so tests can choose the database first. */
export const db: Database = new Proxy({} as Database, {
  get(_target, property) {
    const real = connection().db;
    if (property === "transaction") return queuedTransaction(real);
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
