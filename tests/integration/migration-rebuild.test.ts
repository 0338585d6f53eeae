/**
 * Changing a column in SQLite means rebuilding its table (copy, drop, rename: SQLite's own
 * procedure, https://www.sqlite.org/lang_altertable.html section 7), and with foreign keys on,
 * the drop deletes every row that references the table through ON DELETE CASCADE. Migration
 * 0013 rebuilds `tanks` (its band's default becomes the exact 5–20 mg/L NO3); the app's migrator
 * (migrateDb) must run it without losing a scenario, run, reading or journal entry, keep the id
 * sequence, and leave no dangling reference.
 */
import fs from "node:fs";
import os from "node:os";
import path from "node:path";
import { drizzle } from "drizzle-orm/better-sqlite3";
import { describe, expect, it } from "vitest";
import { migrateDb, openSqlite, type Db } from "~/db/client.server";
import * as schema from "~/db/schema";
import { DEFAULT_NITRATE_TARGETS, typedTarget } from "~/features/tanks/nitrate-targets";
import { UNITS } from "~models/units";
import { migrationsBefore } from "../support/migrations";

const NO3 = 1 / UNITS.nitrate.asNO3.factor; // mg/L NO3 per mg N/L

function databaseBefore(tag: string) {
  const file = path.join(fs.mkdtempSync(path.join(os.tmpdir(), "fernwater-rebuild-")), "old.sqlite");
  const sqlite = openSqlite(file); // foreign keys on, as the app opens it
  const db = drizzle(sqlite, { schema }) as Db;
  migrateDb(db, migrationsBefore(tag));
  return { sqlite, db };
}

/** Row counts of every table (the migrator's own bookkeeping aside). */
function rowCounts(sqlite: ReturnType<typeof openSqlite>): Record<string, number> {
  const tables = sqlite
    .prepare(
      "select name from sqlite_master where type = 'table' and name not like 'sqlite_%' and name <> '__drizzle_migrations' order by name",
    )
    .pluck()
    .all() as string[];
  return Object.fromEntries(
    tables.map((t) => [t, sqlite.prepare(`select count(*) from "${t}"`).pluck().get() as number]),
  );
}

describe("migration 0013: the tanks table is rebuilt without losing what hangs off it", () => {
  it("keeps every scenario, run, reading and journal entry, the id sequence and the references", () => {
    const { sqlite, db } = databaseBefore("0013_exact_default_targets");
    const one = <T>(sql: string, ...args: unknown[]) => sqlite.prepare(sql).get(...args) as T;
    const owner = one<{ id: number }>(
      "insert into users (email, name, password_hash) values ('keeper@example.org', 'Keeper', 'x') returning id",
    ).id;
    const tankIds = [1, 2, 3].map(
      (i) =>
        one<{ id: number }>("insert into tanks (owner_id, name) values (?, ?) returning id", owner, `tank ${i}`).id,
    );
    for (const tankId of tankIds.slice(0, 2)) {
      const scenario = one<{ id: number }>(
        "insert into scenarios (tank_id, name, settings, schema_version) values (?, 'baseline', '{}', 1) returning id",
        tankId,
      ).id;
      sqlite
        .prepare(
          "insert into runs (scenario_id, settings_hash, engine_version, key_figures, budget, events, series, stats) values (?, 'h', 'v', '{}', '{}', '[]', '{}', '{}')",
        )
        .run(scenario);
      sqlite.prepare("insert into readings (tank_id, taken_at, nitrate) values (?, 0, 2)").run(tankId);
      sqlite
        .prepare("insert into journal_entries (tank_id, done_at, kind, details) values (?, 0, 'waterChange', '{}')")
        .run(tankId);
      sqlite
        .prepare("insert into share_links (scenario_id, token_hash) values (?, ?)")
        .run(scenario, `hash-${scenario}`);
    }
    sqlite.prepare("delete from tanks where id = ?").run(tankIds[2]); // the newest tank is gone; its id must not come back
    const before = rowCounts(sqlite);
    expect(before.scenarios).toBe(2);

    migrateDb(db); // every migration in drizzle/, as a start of the app does

    // Every table that was there keeps its rows (later migrations may add tables of their own).
    expect(rowCounts(sqlite)).toMatchObject(before);
    expect(sqlite.pragma("foreign_key_check")).toEqual([]);
    expect(sqlite.pragma("foreign_keys", { simple: true })).toBe(1); // on again after migrating
    // A new tank gets a new id, not the deleted tank's.
    const next = one<{ id: number }>("insert into tanks (owner_id, name) values (?, 'after') returning id", owner).id;
    expect(next).toBeGreaterThan(tankIds[2]);
    // The column default is now the band a new tank gets: 5 and 20 mg/L NO3 exactly (common practice, no source).
    const band = one<{ low: number; high: number }>(
      "select nitrate_target_low as low, nitrate_target_high as high from tanks where id = ?",
      next,
    );
    expect(band).toEqual({
      low: DEFAULT_NITRATE_TARGETS.nitrateTargetLow,
      high: DEFAULT_NITRATE_TARGETS.nitrateTargetHigh,
    });
    expect([typedTarget(band.low, NO3), typedTarget(band.high, NO3)]).toEqual([5, 20]);
    // Deleting a tank still cascades after the rebuild (the references were kept, not dropped).
    sqlite.prepare("delete from tanks where id = ?").run(tankIds[0]);
    expect(sqlite.prepare("select count(*) from scenarios").pluck().get()).toBe(1);
    sqlite.close();
  });

  it("stops with the dangling rows named when a migration leaves a reference to nothing", () => {
    const { sqlite, db } = databaseBefore("0013_exact_default_targets");
    // A database already broken this way (a scenario whose tank is gone, written with keys off).
    sqlite.pragma("foreign_keys = OFF");
    sqlite
      .prepare("insert into scenarios (tank_id, name, settings, schema_version) values (999, 'orphan', '{}', 1)")
      .run();
    sqlite.pragma("foreign_keys = ON");
    expect(() => migrateDb(db)).toThrow(/1 rows refer to rows that do not exist \(first: scenarios row \d+ -> tanks\)/);
    sqlite.close();
  });
});
