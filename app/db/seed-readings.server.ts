/**
 * Demo readings: a month of invented test results for Jonah's "Living-room 120" — our own
 * numbers, shaped like a keeper's nitrate photometer and drop tests — and the start date of his
 * scenarios moved so the readings fall on their charts: day 0 is 35 days before the seed.
 */
import { eq } from "drizzle-orm";
import { toCanonical } from "~models/units";
import { insertReadings, type ReadingInput } from "~/features/readings/readings.server";
import { DAY_MS, startOfDay } from "~/utils/dates";
import type { Db } from "~/db/client.server";
import { scenarios } from "~/db/schema";

type Tx = Parameters<Parameters<Db["transaction"]>[0]>[0];

/** Model day, nitrate mg/L NO3, ammonia mg/L NH3, nitrite mg/L NO2, pH, KH dKH, °C, note (null: not tested). */
const MONTH: [number, number, number | null, number | null, number | null, number | null, number | null, string][] = [
  [1.35, 17.5, 0, 0.1, 7.2, 5, 25, "after the water change"],
  [4.4, 23, null, null, null, null, 25, ""],
  [6.9, 29.5, 0.25, 0.25, 7.1, 4.5, 25.5, "before the water change"],
  [9.3, 28, null, null, null, null, null, ""],
  [12.4, 34, 0, 0.1, 7.1, 4.5, 25, ""],
  [13.9, 38.5, null, null, null, null, null, "before the water change"],
  [16.35, 36.5, 0.25, 0.25, 7.2, 5, 25, ""],
  [19.4, 42.5, null, null, null, null, 24.5, "fed a little extra"],
  [20.9, 42, null, 0.25, 7.1, 4.5, null, "before the water change"],
  [23.3, 41, 0, null, null, null, 25, ""],
  [26.4, 48.5, null, null, null, null, null, "stems look pale"],
  [27.9, 48.5, 0.25, 0.25, 7, 4, 25, "before the water change"],
  [30.35, 46, null, null, null, null, 25, ""],
  [32.4, 45.5, 0, 0.25, 7.1, 4.5, 25, ""],
];

export function seedDemoReadings(tx: Tx, tankId: number, now = Date.now()): void {
  const start = startOfDay(now) - 35 * DAY_MS;
  tx.update(scenarios)
    .set({ startDate: new Date(start) })
    .where(eq(scenarios.tankId, tankId))
    .run();
  const rows: ReadingInput[] = MONTH.map(([day, no3, nh3, no2, ph, kh, temperatureC, note]) => ({
    takenAt: start + Math.round(day * 24 * 60) * 60_000,
    nitrate: toCanonical("nitrate", no3, "asNO3"),
    tan: nh3 === null ? null : toCanonical("ammonia", nh3, "asNH3"),
    nitrite: no2 === null ? null : toCanonical("nitrite", no2, "asNO2"),
    ph,
    kh,
    temperatureC,
    note,
  }));
  insertReadings(tx, tankId, rows);
}
