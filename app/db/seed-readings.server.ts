/**
 * Demo readings: a month of test results for Jonah's "Living-room 120", and the start date of
 * his scenarios moved so the readings fall on their charts: day 0 is 35 days before the seed.
 *
 * The nitrogen readings are honest by construction: they are sampled from a known run of the
 * engine — his baseline with the food bringing in 15 % more nitrogen than the model assumes
 * (he feeds "a little extra", as his journal says) — plus a photometer's scatter drawn from a
 * fixed seed, rounded as the kits read. A calibration on them should find that 15 % again.
 */
import { eq } from "drizzle-orm";
import { ScenarioSchema, simulate } from "~models";
import { toCanonical } from "~models/units";
import { insertReadings, type ReadingInput } from "~/features/readings/readings.server";
import { REQUEST_RUN_LIMITS } from "~/features/runs/simulation.server";
import { livingRoom } from "~/db/seed-scenarios.server";
import { valueAt } from "~/utils/series-lookup";
import { DAY_MS, startOfDay } from "~/utils/dates";
import type { Db } from "~/db/client.server";
import { scenarios } from "~/db/schema";

type Tx = Parameters<Parameters<Db["transaction"]>[0]>[0];

/** The truth behind the demo readings: the food's nitrogen × this, against the baseline's 1. */
export const DEMO_TRUE_FEED_LOAD = 1.15;
/** A nitrate photometer's scatter, mg/L NO3 (one standard deviation). Invented, typical of a kit. */
const NITRATE_SD = 1.0;
const NITRATE_STEP = 0.5;
/** Colour-card steps of the ammonia (mg/L NH3) and nitrite (mg/L NO2) drop tests. */
const DROP_STEPS = [0, 0.25, 0.5, 1, 2, 4];
const NOISE_SEED = 20260411;

/** Model day, whether ammonia and nitrite were tested, pH, KH dKH, °C, note (null: not tested). */
const MONTH: [number, boolean, number | null, number | null, number | null, string][] = [
  [1.35, true, 7.2, 5, 25, "after the water change"],
  [4.4, false, null, null, 25, ""],
  [6.9, true, 7.1, 4.5, 25.5, "before the water change"],
  [9.3, false, null, null, null, ""],
  [12.4, true, 7.1, 4.5, 25, ""],
  [13.9, false, null, null, null, "before the water change"],
  [16.35, true, 7.2, 5, 25, ""],
  [19.4, false, null, null, 24.5, "fed a little extra"],
  [20.9, true, 7.1, 4.5, null, "before the water change"],
  [23.3, true, null, null, 25, ""],
  [26.4, false, null, null, null, "stems look pale"],
  [27.9, true, 7, 4, 25, "before the water change"],
  [30.35, false, null, null, 25, ""],
  [32.4, true, 7.1, 4.5, 25, ""],
];

/** A small seeded generator (mulberry32), so the demo's scatter is the same on every seed. */
function seededUniform(seed: number): () => number {
  let a = seed >>> 0;
  return () => {
    a = (a + 0x6d2b79f5) >>> 0;
    let t = a;
    t = Math.imul(t ^ (t >>> 15), t | 1);
    t ^= t + Math.imul(t ^ (t >>> 7), t | 61);
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
  };
}

function seededNormal(seed: number): () => number {
  const u = seededUniform(seed);
  return () => Math.sqrt(-2 * Math.log(1 - u())) * Math.cos(2 * Math.PI * u());
}

const nearestStep = (v: number) => DROP_STEPS.reduce((b, s) => (Math.abs(s - v) < Math.abs(b - v) ? s : b));

/** The demo month's readings in the keeper's units (mg/L NO3, NH3, NO2), from the known run. */
export function demoReadingValues(): { day: number; no3: number; nh3: number | null; no2: number | null }[] {
  const truth = ScenarioSchema.parse({ ...livingRoom, multipliers: { feedLoad: DEMO_TRUE_FEED_LOAD } });
  const { series } = simulate(truth, REQUEST_RUN_LIMITS);
  const noise = seededNormal(NOISE_SEED);
  const asNo3 = (n: number) => n / toCanonical("nitrate", 1, "asNO3");
  return MONTH.map(([day, drops]) => {
    const no3 = asNo3(valueAt(series.t, series.no3, day, "before")) + NITRATE_SD * noise();
    const nh3 = valueAt(series.t, series.tan, day, "before") / toCanonical("ammonia", 1, "asNH3");
    const no2 = valueAt(series.t, series.no2, day, "before") / toCanonical("nitrite", 1, "asNO2");
    return {
      day,
      no3: Math.max(0, Math.round(no3 / NITRATE_STEP) * NITRATE_STEP),
      nh3: drops ? nearestStep(nh3) : null,
      no2: drops ? nearestStep(no2) : null,
    };
  });
}

export function seedDemoReadings(tx: Tx, tankId: number, now = Date.now()): void {
  const start = startOfDay(now) - 35 * DAY_MS;
  tx.update(scenarios)
    .set({ startDate: new Date(start) })
    .where(eq(scenarios.tankId, tankId))
    .run();
  const values = demoReadingValues();
  const rows: ReadingInput[] = MONTH.map(([day, , ph, kh, temperatureC, note], k) => ({
    takenAt: start + Math.round(day * 24 * 60) * 60_000,
    nitrate: toCanonical("nitrate", values[k].no3, "asNO3"),
    tan: values[k].nh3 === null ? null : toCanonical("ammonia", values[k].nh3, "asNH3"),
    nitrite: values[k].no2 === null ? null : toCanonical("nitrite", values[k].no2, "asNO2"),
    ph,
    kh,
    temperatureC,
    note,
  }));
  insertReadings(tx, tankId, rows);
}
