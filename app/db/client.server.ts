import fs from "node:fs";
import path from "node:path";
import Database from "better-sqlite3";
import { drizzle, type BetterSQLite3Database } from "drizzle-orm/better-sqlite3";
import { migrate } from "drizzle-orm/better-sqlite3/migrator";
import { getEnv } from "~/env.server";
import * as schema from "~/db/schema";

export type Db = BetterSQLite3Database<typeof schema> & { $client: Database.Database };

let instance: Db | undefined;

/** Resolves DATABASE_URL ("file:x.sqlite", "x.sqlite" or ":memory:") to what better-sqlite3 opens. */
export function databasePath(url: string): string {
  const bare = url.startsWith("file:") ? url.slice("file:".length) : url;
  return bare === ":memory:" ? bare : path.resolve(bare);
}

/** Opens a SQLite file with the pragmas Fernwater relies on. */
export function openSqlite(file: string): Database.Database {
  if (file !== ":memory:") fs.mkdirSync(path.dirname(file), { recursive: true });
  const sqlite = new Database(file);
  sqlite.pragma("journal_mode = WAL");
  sqlite.pragma("foreign_keys = ON");
  sqlite.pragma("busy_timeout = 5000");
  // WAL + NORMAL is durable across application crashes; only an OS crash can lose the last commit.
  sqlite.pragma("synchronous = NORMAL");
  return sqlite;
}

/** Applies the committed migrations in drizzle/ (relative to the working directory). */
function migrateDb(db: Db): void {
  migrate(db, { migrationsFolder: path.resolve("drizzle") });
}

/**
 * Transactions take the write lock when they begin ("immediate"), not at their first write.
 * With several app processes on one file (server/start.mjs), a transaction that reads and then
 * writes would otherwise fail at once with SQLITE_BUSY when another process wrote in between
 * (WAL cannot upgrade a stale snapshot); taking the lock first lets busy_timeout wait instead.
 */
function immediateByDefault(db: Db): void {
  const transaction = db.transaction.bind(db);
  db.transaction = ((fn, config) => transaction(fn, { behavior: "immediate", ...config })) as Db["transaction"];
}

/** The one Drizzle client of the process, migrated on first use. */
export function getDb(): Db {
  if (!instance) {
    const sqlite = openSqlite(databasePath(getEnv().DATABASE_URL));
    instance = drizzle(sqlite, { schema }) as Db;
    immediateByDefault(instance);
    migrateDb(instance);
  }
  return instance;
}

/** Closes the database (tests and graceful shutdown). */
export function closeDb(): void {
  instance?.$client.close();
  instance = undefined;
}
