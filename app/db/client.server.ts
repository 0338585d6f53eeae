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

/** The one Drizzle client of the process, migrated on first use. */
export function getDb(): Db {
  if (!instance) {
    const sqlite = openSqlite(databasePath(getEnv().DATABASE_URL));
    instance = drizzle(sqlite, { schema }) as Db;
    migrateDb(instance);
  }
  return instance;
}

/** Closes the database (tests and graceful shutdown). */
export function closeDb(): void {
  instance?.$client.close();
  instance = undefined;
}
