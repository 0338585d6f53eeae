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

/**
 * Applies the committed migrations in drizzle/ (relative to the working directory, or `folder`).
 * Foreign keys are off while they run, as SQLite's procedure for changing a table asks: to change
 * a column, drizzle-kit rebuilds the table (copy, drop, rename), and with foreign keys on, the
 * drop would delete every row that references it through ON DELETE CASCADE. The PRAGMA in the
 * migration files cannot do this, because SQLite ignores it inside the migrator's transaction.
 * After a migration ran, every reference is checked; a dangling one stops the start.
 */
export function migrateDb(db: Db, folder = path.resolve("drizzle")): void {
  const sqlite = db.$client;
  const applied = () => appliedMigrations(sqlite);
  const before = applied();
  sqlite.pragma("foreign_keys = OFF");
  try {
    migrate(db, { migrationsFolder: folder });
  } finally {
    sqlite.pragma("foreign_keys = ON");
  }
  if (applied() === before) return;
  const dangling = sqlite.pragma("foreign_key_check") as { table: string; rowid: number; parent: string }[];
  if (dangling.length) {
    const first = dangling[0];
    throw new Error(
      `After migrating, ${dangling.length} rows refer to rows that do not exist (first: ${first.table} row ${first.rowid} -> ${first.parent}). Restore the backup taken before (npm run db:restore).`,
    );
  }
}

function appliedMigrations(sqlite: Database.Database): number {
  const table = sqlite
    .prepare("select 1 from sqlite_master where type = 'table' and name = '__drizzle_migrations'")
    .get();
  return table ? (sqlite.prepare("select count(*) as n from __drizzle_migrations").get() as { n: number }).n : 0;
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
