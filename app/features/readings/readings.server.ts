/**
 * Test-kit readings of a tank: what each measure is, how a typed value in some unit becomes the
 * stored canonical one (mg N/L, dKH, °C) with its range check, listing with sorting and paging,
 * and the readings on a scenario's timeline (its day 0 is the scenario's start date) for the
 * chart and for calibration. The CSV side is app/features/readings/readings-csv.server.ts.
 */
import { and, asc, count, desc, eq, gte, isNotNull, lt, lte, or, sql } from "drizzle-orm";
import {
  fromCanonical,
  toCanonical,
  unitSymbol,
  type AmmoniaUnit,
  type KhUnit,
  type NitrateUnit,
  type NitriteUnit,
  type TemperatureUnit,
} from "~models/units";
import type { ChartReading } from "~/utils/chart-data";
import { getDb, type Db } from "~/db/client.server";
import { readings } from "~/db/schema";
import { speciesFactor, toDisplay } from "~models/units";
import type { CalibrationReading } from "~models/nitrogen/calibrate";
import { DAY_MS, startOfDay } from "~/utils/dates";
import type { DisplayUnits } from "~/utils/display-units";

export type ReadingRow = typeof readings.$inferSelect;

export const MEASURE_KEYS = ["tan", "nitrite", "nitrate", "ph", "kh", "temperatureC"] as const;
export type MeasureKey = (typeof MEASURE_KEYS)[number];

/** Unit ids (models/units.ts) each measure is typed in. */
export type MeasureUnits = {
  tan: AmmoniaUnit;
  nitrite: NitriteUnit;
  nitrate: NitrateUnit;
  kh: KhUnit;
  temperatureC: TemperatureUnit;
};

type Quantity = "ammonia" | "nitrite" | "nitrate" | "kh" | "temperature" | null;

/**
 * The measures, with canonical bounds. The upper bounds are far above anything a tank survives
 * (so a typo like 2000 for 20 is caught) — common practice, no source.
 */
export const MEASURES: Record<MeasureKey, { label: string; quantity: Quantity; min: number; max: number }> = {
  tan: { label: "TAN (total ammonia)", quantity: "ammonia", min: 0, max: 50 },
  nitrite: { label: "Nitrite", quantity: "nitrite", min: 0, max: 50 },
  nitrate: { label: "Nitrate", quantity: "nitrate", min: 0, max: 200 },
  ph: { label: "pH", quantity: null, min: 3, max: 11 },
  kh: { label: "KH", quantity: "kh", min: 0, max: 50 },
  temperatureC: { label: "Temperature", quantity: "temperature", min: 0, max: 45 },
};

/** Earliest reading accepted, and how far ahead of now a reading may be dated (clock differences). */
const EARLIEST_READING_MS = Date.UTC(1990, 0, 1);
const FUTURE_SLACK_MS = DAY_MS;

export function measureUnitsFor(units: DisplayUnits): MeasureUnits {
  return {
    tan: units.ammonia,
    nitrite: units.nitrite,
    nitrate: units.nitrate,
    kh: units.kh,
    temperatureC: units.temperature,
  };
}

/** The unit label a measure is written in ("mg/L NO3", "°F", "" for pH). */
export function measureUnitLabel(key: MeasureKey, units: MeasureUnits): string {
  const q = MEASURES[key].quantity;
  return q ? unitSymbol(q, units[key as Exclude<MeasureKey, "ph">]) : "";
}

/** Accepts "12.5", and "12,5" where a decimal comma is expected; nothing else that is not a plain number. */
function parseDecimal(text: string, decimalComma: boolean): number | null {
  let t = text.trim();
  if (decimalComma) t = t.replace(/^([-+]?\d*),(\d+)$/, "$1.$2");
  if (!/^[-+]?(\d+\.?\d*|\.\d+)([eE][-+]?\d+)?$/.test(t)) return null;
  const n = Number(t);
  return Number.isFinite(n) ? n : null;
}

const round = (x: number) => Number(x.toPrecision(4));

/**
 * A typed value of a measure → canonical, or a message for the person. Empty text is "not
 * measured" (null).
 */
export function readMeasure(
  key: MeasureKey,
  text: string | undefined,
  units: MeasureUnits,
  decimalComma = false,
): { value: number | null } | { error: string } {
  const m = MEASURES[key];
  if (text === undefined || text.trim() === "") return { value: null };
  const n = parseDecimal(text, decimalComma);
  const unit = measureUnitLabel(key, units);
  if (n === null) {
    const hint = /^\s*[<>]/.test(text)
      ? ` (for “${text.trim()}” write the number, or 0 for “below the kit's lowest step”)`
      : "";
    return { error: `${m.label} must be a number, like 12 or 0.5${hint}.` };
  }
  const canonical = m.quantity ? toCanonical(m.quantity, n, units[key as Exclude<MeasureKey, "ph">]) : n;
  if (canonical < m.min || canonical > m.max) {
    const lo = m.quantity ? round(toUnit(key, m.min, units)) : m.min;
    const hi = m.quantity ? round(toUnit(key, m.max, units)) : m.max;
    return { error: `${m.label} must be between ${lo} and ${hi}${unit ? ` ${unit}` : ""}.` };
  }
  return { value: canonical };
}

function toUnit(key: MeasureKey, canonical: number, units: MeasureUnits): number {
  const q = MEASURES[key].quantity;
  return q ? fromCanonical(q, canonical, units[key as Exclude<MeasureKey, "ph">]) : canonical;
}

/** A canonical value of a measure in a person's display units. */
export function displayMeasure(key: MeasureKey, value: number | null, units: DisplayUnits): number | null {
  if (value === null) return null;
  const q = MEASURES[key].quantity;
  return q ? toDisplay(q, value, units) : value;
}

/** Checks a reading's time; a message or null. */
export function checkTakenAt(ms: number, now = Date.now()): string | null {
  if (ms < EARLIEST_READING_MS) return "The date is before 1990: check the year.";
  if (ms > now + FUTURE_SLACK_MS) return "The date is in the future: check the year and month.";
  return null;
}

export type ReadingInput = Record<MeasureKey, number | null> & { takenAt: number; note: string };

// ---------------------------------------------------------------------------------------------
// Listing

export const SORT_KEYS = ["takenAt", ...MEASURE_KEYS] as const;
export type SortKey = (typeof SORT_KEYS)[number];
const PAGE_SIZE = 25;

export function listReadings(tankId: number, sort: SortKey, dir: "asc" | "desc", page: number) {
  const db = getDb();
  const total = db.select({ n: count() }).from(readings).where(eq(readings.tankId, tankId)).get()?.n ?? 0;
  const pages = Math.max(1, Math.ceil(total / PAGE_SIZE));
  const current = Math.min(Math.max(1, page), pages);
  const column = readings[sort];
  const order = dir === "asc" ? asc : desc;
  const rows = db
    .select()
    .from(readings)
    .where(eq(readings.tankId, tankId))
    // Unmeasured values last whichever way, then newest first.
    .orderBy(sql`${column} is null`, order(column), desc(readings.takenAt))
    .limit(PAGE_SIZE)
    .offset((current - 1) * PAGE_SIZE)
    .all();
  return { rows, total, page: current, pages };
}

export function allReadings(tankId: number): ReadingRow[] {
  return getDb().select().from(readings).where(eq(readings.tankId, tankId)).orderBy(asc(readings.takenAt)).all();
}

export function countReadings(tankId: number): number {
  return getDb().select({ n: count() }).from(readings).where(eq(readings.tankId, tankId)).get()?.n ?? 0;
}

export function findReading(tankId: number, id: number): ReadingRow | null {
  return (
    getDb()
      .select()
      .from(readings)
      .where(and(eq(readings.tankId, tankId), eq(readings.id, id)))
      .get() ?? null
  );
}

/** Times (ms) of the tank's stored readings, for duplicate checks. */
export function storedTimes(tankId: number): Map<number, number> {
  const rows = getDb()
    .select({ id: readings.id, takenAt: readings.takenAt })
    .from(readings)
    .where(eq(readings.tankId, tankId))
    .all();
  return new Map(rows.map((r) => [r.takenAt.getTime(), r.id]));
}

type Tx = Parameters<Parameters<ReturnType<typeof getDb>["transaction"]>[0]>[0];

/** Writes readings inside the caller's transaction (the unique index refuses a second reading at the same time). */
export function insertReadings(tx: Tx, tankId: number, rows: readonly ReadingInput[]): void {
  for (const r of rows) {
    tx.insert(readings)
      .values({
        tankId,
        takenAt: new Date(r.takenAt),
        tan: r.tan,
        nitrite: r.nitrite,
        nitrate: r.nitrate,
        ph: r.ph,
        kh: r.kh,
        temperatureC: r.temperatureC,
        note: r.note,
      })
      .run();
  }
}

// ---------------------------------------------------------------------------------------------
// Readings on a scenario's timeline

/** Day 0 of a scenario: its start date, or 00:00 of the day it was created. */
export function modelStartMs(scenario: { startDate: Date | null; createdAt: Date }): number {
  return scenario.startDate ? scenario.startDate.getTime() : startOfDay(scenario.createdAt.getTime());
}

// Every results view reads these: prepared once per database, not rebuilt per request.
const inRunStatements = new WeakMap<Db, ReturnType<typeof prepareInRun>>();
function prepareInRun(db: Db) {
  return db
    .select()
    .from(readings)
    .where(
      and(
        eq(readings.tankId, sql.placeholder("tankId")),
        gte(readings.takenAt, sql.placeholder("from")),
        lte(readings.takenAt, sql.placeholder("to")),
      ),
    )
    .orderBy(asc(readings.takenAt))
    .prepare();
}

function readingsInRun(tankId: number, startMs: number, lengthDays: number): ReadingRow[] {
  const db = getDb();
  let stmt = inRunStatements.get(db);
  if (!stmt) inRunStatements.set(db, (stmt = prepareInRun(db)));
  // Placeholders bypass the column's mapping to milliseconds, so pass the numbers it stores.
  return stmt.all({ tankId, from: startMs, to: startMs + lengthDays * DAY_MS });
}

const dayOf = (row: ReadingRow, startMs: number) => (row.takenAt.getTime() - startMs) / DAY_MS;

/**
 * Readings a results chart draws at most: a chart 720 points wide shows no more, and a tank may
 * hold 20,000 readings in one run, which sent 1.3 MB of page data and drew 60,000 SVG points on
 * the request thread at every view (issue 10).
 */
const MAX_CHART_READINGS = 1000;

/**
 * Readings within the run as chart points, display units: all of them up to MAX_CHART_READINGS,
 * else an even sample in time order (the first and the last kept), with how many there are.
 */
export function readingsForChart(
  tankId: number,
  startMs: number,
  lengthDays: number,
  units: DisplayUnits,
): { points: ChartReading[]; total: number } {
  const nh3 = speciesFactor("ammonia", units);
  const no2 = speciesFactor("nitrite", units);
  const no3 = speciesFactor("nitrate", units);
  const scale = (v: number | null, f: number) => (v === null ? null : Number((v * f).toPrecision(6)));
  const all = readingsInRun(tankId, startMs, lengthDays).filter(
    (r) => r.tan !== null || r.nitrite !== null || r.nitrate !== null,
  );
  const step = all.length / MAX_CHART_READINGS;
  const shown =
    all.length <= MAX_CHART_READINGS
      ? all
      : Array.from(
          { length: MAX_CHART_READINGS },
          (_, i) => all[i === MAX_CHART_READINGS - 1 ? all.length - 1 : Math.floor(i * step)],
        );
  return {
    total: all.length,
    points: shown.map((r) => ({
      day: dayOf(r, startMs),
      tan: scale(r.tan, nh3),
      no2: scale(r.nitrite, no2),
      no3: scale(r.nitrate, no3),
    })),
  };
}

/**
 * How many of the tank's readings of TAN, nitrite or nitrate were taken before `ms`: a fit on the
 * journal starts at its first entry, and the page says how many readings that leaves out.
 */
export function countCalibrationReadingsBefore(tankId: number, ms: number): number {
  return (
    getDb()
      .select({ n: count() })
      .from(readings)
      .where(
        and(
          eq(readings.tankId, tankId),
          lt(readings.takenAt, new Date(ms)),
          or(isNotNull(readings.tan), isNotNull(readings.nitrite), isNotNull(readings.nitrate)),
        ),
      )
      .get()?.n ?? 0
  );
}

/** Readings within the run with at least one nitrogen species, canonical, for calibration. */
export function readingsForCalibration(
  tankId: number,
  startMs: number,
  lengthDays: number,
): (CalibrationReading & { takenAt: number })[] {
  return readingsInRun(tankId, startMs, lengthDays)
    .filter((r) => r.tan !== null || r.nitrite !== null || r.nitrate !== null)
    .map((r) => ({ day: dayOf(r, startMs), takenAt: r.takenAt.getTime(), tan: r.tan, no2: r.nitrite, no3: r.nitrate }));
}
