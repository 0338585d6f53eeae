import { spawn } from "node:child_process";
import fs from "node:fs";
import os from "node:os";
import path from "node:path";
import Database from "better-sqlite3";
import { describe, expect, it } from "vitest";
import { backupDatabase, integrityCheck, restoreDatabase, tableCounts } from "~/db/backup.server";
import { databasePath, getDb } from "~/db/client.server";
import { getEnv } from "~/env.server";
import { createTank } from "../support/tanks";
import { createUser } from "../support/users";

/** Another process writing tanks as fast as it can, as the server would under load. */
function startWriter(file: string, ownerId: number, ms: number) {
  const script = `
    const Database = require("better-sqlite3");
    const db = new Database(${JSON.stringify(file)});
    db.pragma("journal_mode = WAL"); db.pragma("busy_timeout = 5000"); db.pragma("foreign_keys = ON");
    const insert = db.prepare("insert into tanks (owner_id, name) values (?, ?)");
    const end = Date.now() + ${ms}; let n = 0;
    while (Date.now() < end) { insert.run(${ownerId}, "written " + n); n++; }
    process.stdout.write(String(n));`;
  const child = spawn(process.execPath, ["-e", script], { cwd: process.cwd(), stdio: ["ignore", "pipe", "inherit"] });
  let out = "";
  child.stdout.on("data", (d) => (out += d));
  return new Promise<number>((resolve, reject) => {
    child.on("exit", (code) => (code === 0 ? resolve(Number(out)) : reject(new Error(`writer exited ${code}`))));
  });
}

describe("backup and restore", () => {
  it("backs up a consistent copy while another process writes, and restores it to identical row counts", async () => {
    const owner = await createUser();
    createTank(owner.id, "before the backup");
    const source = databasePath(getEnv().DATABASE_URL);
    const dir = fs.mkdtempSync(path.join(os.tmpdir(), "fernwater-backup-"));
    const backupFile = path.join(dir, "backup.sqlite");

    const writing = startWriter(source, owner.id, 1500);
    await new Promise((r) => setTimeout(r, 300));
    const counts = await backupDatabase(source, backupFile);
    const written = await writing;
    expect(written).toBeGreaterThan(0);

    // SQLite backup API: the copy is a consistent snapshot, whole and readable.
    const copy = new Database(backupFile, { readonly: true });
    expect(integrityCheck(copy)).toBe("ok");
    expect(tableCounts(copy)).toEqual(counts);
    copy.close();
    expect(counts.tanks).toBeGreaterThanOrEqual(1);
    const live = tableCounts(getDb().$client);
    expect(live.tanks).toBeGreaterThanOrEqual(counts.tanks);
    expect(live.tanks).toBe(1 + written);

    const target = path.join(dir, "restored.sqlite");
    const restored = await restoreDatabase(backupFile, target);
    expect(restored).toEqual(counts);
  });

  it("refuses to overwrite an existing file and to restore a damaged backup", async () => {
    const source = databasePath(getEnv().DATABASE_URL);
    const dir = fs.mkdtempSync(path.join(os.tmpdir(), "fernwater-backup-"));
    const existing = path.join(dir, "taken.sqlite");
    fs.writeFileSync(existing, "x");
    await expect(backupDatabase(source, existing)).rejects.toThrow(/exists already/);
    const damaged = path.join(dir, "damaged.sqlite");
    fs.writeFileSync(damaged, "this is not a database");
    await expect(restoreDatabase(damaged, path.join(dir, "target.sqlite"))).rejects.toThrow();
  });

  it("keeps the replaced database beside the restored one", async () => {
    const owner = await createUser();
    createTank(owner.id, "kept");
    const source = databasePath(getEnv().DATABASE_URL);
    const dir = fs.mkdtempSync(path.join(os.tmpdir(), "fernwater-backup-"));
    const backupFile = path.join(dir, "b.sqlite");
    const counts = await backupDatabase(source, backupFile);
    const target = path.join(dir, "live.sqlite");
    await backupDatabase(source, target); // an existing database to be replaced
    const restored = await restoreDatabase(backupFile, target, new Date("2026-01-02T03:04:05Z"));
    expect(restored).toEqual(counts);
    expect(fs.existsSync(`${target}.before-restore-2026-01-02T03-04-05-000Z`)).toBe(true);
  });
});
