/**
 * Migration 0007_tidy_default_targets (issue 12, item 4's residue): tanks made before the exact
 * defaults hold the schema's 1.13 and 4.52 mg N/L, which read back as 5.002 and 20.01 mg/L NO3.
 * A database made with the migrations before it and those old values is migrated, and the
 * defaults then read back as exactly 5 and 20; targets a person typed are left alone.
 */
import fs from "node:fs";
import os from "node:os";
import path from "node:path";
import Database from "better-sqlite3";
import { drizzle } from "drizzle-orm/better-sqlite3";
import { migrate } from "drizzle-orm/better-sqlite3/migrator";
import { afterAll, describe, expect, it } from "vitest";
import { fromCanonical } from "~models/units";
import { DEFAULT_NITRATE_TARGETS, typedTarget } from "~/features/tanks/nitrate-targets";

const MIGRATION = "0007_tidy_default_targets";
const dir = fs.mkdtempSync(path.join(os.tmpdir(), "fernwater-tidy-"));
afterAll(() => fs.rmSync(dir, { recursive: true, force: true }));

/** The committed migrations up to (not including) `tag`, in a folder of their own. */
function migrationsBefore(tag: string): string {
  const folder = path.join(dir, "before");
  fs.mkdirSync(path.join(folder, "meta"), { recursive: true });
  const journal = JSON.parse(fs.readFileSync(path.resolve("drizzle/meta/_journal.json"), "utf8")) as {
    entries: { idx: number; tag: string }[];
  };
  const stop = journal.entries.findIndex((e) => e.tag === tag);
  expect(stop).toBeGreaterThan(0);
  const entries = journal.entries.slice(0, stop);
  for (const e of entries) fs.copyFileSync(path.resolve(`drizzle/${e.tag}.sql`), path.join(folder, `${e.tag}.sql`));
  fs.writeFileSync(path.join(folder, "meta/_journal.json"), JSON.stringify({ ...journal, entries }));
  return folder;
}

const asNo3 = (mgN: number) => typedTarget(mgN, fromCanonical("nitrate", 1, "asNO3"));

describe("migration tidy_default_targets", () => {
  it("turns the old converted defaults into the exact ones and leaves typed targets as they were", () => {
    const file = path.join(dir, "old.sqlite");
    const sqlite = new Database(file);
    sqlite.pragma("foreign_keys = ON");
    migrate(drizzle(sqlite), { migrationsFolder: migrationsBefore(MIGRATION) });
    sqlite.prepare("insert into users (email, name, password_hash) values ('old@example.org', 'Old', 'x')").run();
    const owner = (sqlite.prepare("select id from users").get() as { id: number }).id;
    // As tanks were made before the fix: the schema's defaults.
    sqlite.prepare("insert into tanks (owner_id, name) values (?, 'made before')").run(owner);
    // A band a person typed (10–40 mg/L NO3, stored as mg N/L) must not move.
    const typedLow = 10 / fromCanonical("nitrate", 1, "asNO3");
    const typedHigh = 40 / fromCanonical("nitrate", 1, "asNO3");
    sqlite
      .prepare("insert into tanks (owner_id, name, nitrate_target_low, nitrate_target_high) values (?, 'typed', ?, ?)")
      .run(owner, typedLow, typedHigh);
    const before = sqlite
      .prepare("select nitrate_target_low as low, nitrate_target_high as high from tanks where name = 'made before'")
      .get() as {
      low: number;
      high: number;
    };
    // The symptom of the issue: 5.002 and 20.01 mg/L NO3 on screen.
    expect(asNo3(before.low)).not.toBe(5);
    expect(asNo3(before.high)).not.toBe(20);

    migrate(drizzle(sqlite), { migrationsFolder: path.resolve("drizzle") });
    const rows = sqlite
      .prepare("select name, nitrate_target_low as low, nitrate_target_high as high from tanks order by id")
      .all() as {
      name: string;
      low: number;
      high: number;
    }[];
    sqlite.close();
    const old = rows.find((r) => r.name === "made before")!;
    // 5–20 mg/L NO3, the default band (common practice, no source), read back exactly.
    expect(asNo3(old.low)).toBe(5);
    expect(asNo3(old.high)).toBe(20);
    expect(old.low).toBeCloseTo(DEFAULT_NITRATE_TARGETS.nitrateTargetLow, 12);
    expect(old.high).toBeCloseTo(DEFAULT_NITRATE_TARGETS.nitrateTargetHigh, 12);
    const typed = rows.find((r) => r.name === "typed")!;
    expect(typed.low).toBe(typedLow);
    expect(typed.high).toBe(typedHigh);
    expect(asNo3(typed.high)).toBe(40);
  });
});
