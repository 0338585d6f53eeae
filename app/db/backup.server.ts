/**
 * Online backup and restore of the SQLite file, through SQLite's backup API (better-sqlite3's
 * `backup`): the copy is a consistent snapshot even while the server keeps writing.
 */
import fs from "node:fs";
import path from "node:path";
import Database from "better-sqlite3";
import { openSqlite } from "~/db/client.server";

export type TableCounts = Record<string, number>;

/** Row counts of every table (migrations bookkeeping included), for checking a copy. */
export function tableCounts(db: Database.Database): TableCounts {
  const names = db
    .prepare("select name from sqlite_master where type = 'table' and name not like 'sqlite_%' order by name")
    .pluck()
    .all() as string[];
  return Object.fromEntries(
    names.map((n) => [
      n,
      db
        .prepare(`select count(*) from "${n.replace(/"/g, '""')}"`)
        .pluck()
        .get() as number,
    ]),
  );
}

export function integrityCheck(db: Database.Database): string {
  return db.pragma("integrity_check", { simple: true }) as string;
}

/**
 * Copies the live database at `sourceFile` to `destination` (a new file). Returns the copy's
 * row counts; throws if the copy fails its integrity check.
 */
export async function backupDatabase(sourceFile: string, destination: string): Promise<TableCounts> {
  if (fs.existsSync(destination)) throw new Error(`${destination} exists already; choose a new file name.`);
  fs.mkdirSync(path.dirname(path.resolve(destination)), { recursive: true });
  const source = openSqlite(sourceFile);
  try {
    await source.backup(destination);
  } finally {
    source.close();
  }
  const copy = new Database(destination, { readonly: true });
  try {
    const check = integrityCheck(copy);
    if (check !== "ok") throw new Error(`The backup failed its integrity check: ${check}`);
    return tableCounts(copy);
  } finally {
    copy.close();
  }
}

/**
 * Replaces the database at `targetFile` with the backup at `backupFile`. The server must be
 * stopped first. The old file is kept beside it as `<target>.before-restore-<time>`.
 */
export async function restoreDatabase(backupFile: string, targetFile: string, now = new Date()): Promise<TableCounts> {
  const backup = new Database(backupFile, { readonly: true, fileMustExist: true });
  try {
    const check = integrityCheck(backup);
    if (check !== "ok") throw new Error(`The backup file is damaged: ${check}`);
  } finally {
    backup.close();
  }
  if (fs.existsSync(targetFile)) {
    const keep = `${targetFile}.before-restore-${now.toISOString().replace(/[:.]/g, "-")}`;
    const old = openSqlite(targetFile);
    old.pragma("wal_checkpoint(TRUNCATE)");
    old.close();
    fs.renameSync(targetFile, keep);
    for (const suffix of ["-wal", "-shm"]) fs.rmSync(`${targetFile}${suffix}`, { force: true });
  }
  const source = new Database(backupFile, { readonly: true });
  try {
    await source.backup(targetFile);
  } finally {
    source.close();
  }
  const restored = openSqlite(targetFile);
  try {
    return tableCounts(restored);
  } finally {
    restored.close();
  }
}
