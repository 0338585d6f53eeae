/**
 * Tanks made before the exact defaults kept the 5–20 mg/L NO3 band as 1.13 and 4.52 mg N/L and
 * showed it as 5.002 and 20.01 (issue 12, item 4). Migration 0007 turns those into the exact
 * conversions for owners who work in NO3, and leaves everyone else's values as they were.
 */
import fs from "node:fs";
import os from "node:os";
import path from "node:path";
import Database from "better-sqlite3";
import { drizzle } from "drizzle-orm/better-sqlite3";
import { migrate } from "drizzle-orm/better-sqlite3/migrator";
import { describe, expect, it } from "vitest";
import { typedTarget } from "~/features/tanks/nitrate-targets";
import { UNITS } from "~models/units";
import { migrationsBefore } from "../support/migrations";

const NO3 = 1 / UNITS.nitrate.asNO3.factor; // mg/L NO3 per mg N/L

describe("migration 0007: default nitrate targets read back as 5 and 20", () => {
  it("tidies the old defaults of NO3 owners and nobody else's values", () => {
    const file = path.join(fs.mkdtempSync(path.join(os.tmpdir(), "fernwater-old-")), "old.sqlite");
    const sqlite = new Database(file);
    const db = drizzle(sqlite);
    migrate(db, { migrationsFolder: migrationsBefore("0007_tidy_default_targets") });

    const user = sqlite.prepare(
      "insert into users (email, name, password_hash, nitrate_unit) values (?, ?, 'x', ?) returning id",
    );
    const asNO3 = (user.get("no3@example.org", "Works in NO3", "NO3") as { id: number }).id;
    const asN = (user.get("n@example.org", "Works in NO3-N", "N") as { id: number }).id;
    const tank = sqlite.prepare(
      "insert into tanks (owner_id, name, nitrate_target_low, nitrate_target_high) values (?, ?, ?, ?) returning id",
    );
    const oldDefault = (tank.get(asNO3, "made before the fix", 1.13, 4.52) as { id: number }).id;
    const columnDefault = (
      sqlite.prepare("insert into tanks (owner_id, name) values (?, 'column default') returning id").get(asNO3) as {
        id: number;
      }
    ).id;
    const ownBand = (tank.get(asNO3, "own band", 10 / NO3, 4.52) as { id: number }).id; // typed 10 and kept the old high
    const nitrogenOwner = (tank.get(asN, "typed in NO3-N", 1.13, 4.52) as { id: number }).id;

    // Before: what the pages showed.
    const shown = (id: number) => {
      const row = sqlite
        .prepare("select nitrate_target_low as low, nitrate_target_high as high from tanks where id = ?")
        .get(id) as { low: number; high: number };
      return row;
    };
    expect(typedTarget(shown(oldDefault).low, NO3)).toBeCloseTo(5.002, 3); // the defect, as reported
    expect(typedTarget(shown(oldDefault).high, NO3)).toBeCloseTo(20.01, 2);

    migrate(db, { migrationsFolder: "drizzle" });

    // 5 and 20 mg/L NO3 exactly, the band a new tank gets (common practice, no source).
    for (const id of [oldDefault, columnDefault]) {
      expect(typedTarget(shown(id).low, NO3)).toBe(5);
      expect(typedTarget(shown(id).high, NO3)).toBe(20);
    }
    expect(typedTarget(shown(ownBand).low, NO3)).toBe(10); // what the person typed stays
    expect(typedTarget(shown(ownBand).high, NO3)).toBe(20);
    // Someone who works in NO3-N saw and may have typed 1.13 and 4.52: untouched.
    expect(shown(nitrogenOwner)).toEqual({ low: 1.13, high: 4.52 });
    sqlite.close();
  });
});
