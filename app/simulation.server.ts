/**
 * App ↔ engine glue: turns a stored scenario into a run, reusing a stored run when nothing
 * changed (same settings hash, same engine version), and keeps parsed runs in a small cache
 * so opening a results page does not re-read a megabyte of JSON each time.
 */
import { createHash } from "node:crypto";
import { and, desc, eq, inArray, sql } from "drizzle-orm";
import {
  ENGINE_VERSION,
  isModelError,
  ModelError,
  parseScenario,
  type KeyFigures,
  type NitrogenBudget,
  type Scenario,
  type Series,
  type SimulationResult,
  type SimulationStats,
} from "../models";
import type { EventRecord } from "../models";
import { getDb, type Db } from "~/db/client.server";
import { runs } from "~/db/schema";
import { runEngineTask } from "~/engine-tasks.server";
import { getEnginePool } from "~/jobs.server";

/** Bounds for runs started by a request: a bad parameter set fails fast instead of hanging. */
export const REQUEST_RUN_LIMITS = { maxWallMs: 3000, maxSteps: 300_000 };

export type StoredRun = {
  id: number;
  scenarioId: number;
  settingsHash: string;
  engineVersion: string;
  keyFigures: KeyFigures;
  budget: NitrogenBudget;
  events: EventRecord[];
  series: Series;
  stats: SimulationStats;
  createdAt: Date;
};

/** JSON with object keys sorted, so equal settings hash equally whatever their key order. */
export function canonicalJson(value: unknown): string {
  return JSON.stringify(value, (_key, v) =>
    v && typeof v === "object" && !Array.isArray(v)
      ? Object.fromEntries(Object.entries(v as Record<string, unknown>).sort(([a], [b]) => (a < b ? -1 : 1)))
      : v,
  );
}

export function settingsHash(scenario: Scenario): string {
  return createHash("sha256").update(canonicalJson(scenario)).digest("hex");
}

/** The tank's nitrate band wins over the one saved in the scenario (the band is a tank setting). */
export function withTankTargets(scenario: Scenario, tank: { nitrateTargetLow: number; nitrateTargetHigh: number }): Scenario {
  return { ...scenario, targets: { nitrateLow: tank.nitrateTargetLow, nitrateHigh: tank.nitrateTargetHigh } };
}

/**
 * Whether a run is short enough to do on the request thread: up to about a year at daily
 * points without modelled meals takes 5–15 ms, less than handing it to a worker and waiting
 * for the answer when the server is busy (measured with bench/load-mix.ts; see
 * docs/decisions/0006-single-runs.md). Anything longer goes to the worker pool, so a two-year
 * hourly run cannot hold up everyone else.
 */
export function isQuickRun(scenario: Scenario): boolean {
  const samples = scenario.run.lengthDays / scenario.run.outputIntervalDays;
  return scenario.run.lengthDays <= 400 && samples <= 1000 && !scenario.fish.pulsedFeeding;
}

/** Runs the engine (see isQuickRun for where). Throws the engine's ModelError for settings it cannot resolve. */
export async function runEngine(scenario: Scenario): Promise<SimulationResult> {
  const task = { kind: "simulate", scenario, limits: REQUEST_RUN_LIMITS } as const;
  const answer = isQuickRun(scenario) ? runEngineTask(task) : await getEnginePool().run(task);
  if (answer.kind !== "simulate") throw new Error(`The engine pool answered a ${answer.kind} task to a simulate task`);
  if (answer.error) throw new ModelError(answer.error.code, answer.error.message, { day: answer.error.day, detail: answer.error.detail });
  return answer.result!;
}

export { isModelError };

const cache = new Map<number, StoredRun>();
const CACHE_SIZE = 32;

function remember(run: StoredRun): StoredRun {
  cache.delete(run.id);
  cache.set(run.id, run);
  while (cache.size > CACHE_SIZE) cache.delete(cache.keys().next().value!);
  return run;
}

type RunRow = typeof runs.$inferSelect;

function fromRow(row: RunRow): StoredRun {
  return {
    id: row.id,
    scenarioId: row.scenarioId,
    settingsHash: row.settingsHash,
    engineVersion: row.engineVersion,
    keyFigures: row.keyFigures as KeyFigures,
    budget: row.budget as NitrogenBudget,
    events: row.events as EventRecord[],
    series: row.series as Series,
    stats: row.stats as SimulationStats,
    createdAt: row.createdAt,
  };
}

/** A stored run by id (rows never change once written, so the cache needs no invalidation). */
export function getRun(runId: number): StoredRun | null {
  const hit = cache.get(runId);
  if (hit) return remember(hit);
  const row = getDb().select().from(runs).where(eq(runs.id, runId)).get();
  return row ? remember(fromRow(row)) : null;
}

// Looked up on every results view: prepared once per database.
const runLookups = new WeakMap<Db, ReturnType<typeof prepareRunLookup>>();
function prepareRunLookup(db: Db) {
  return db
    .select({ id: runs.id })
    .from(runs)
    .where(
      and(
        eq(runs.scenarioId, sql.placeholder("scenarioId")),
        eq(runs.settingsHash, sql.placeholder("hash")),
        eq(runs.engineVersion, ENGINE_VERSION),
      ),
    )
    .orderBy(desc(runs.id))
    .prepare();
}

/** The stored run of these exact settings, if any. */
export function findRun(scenarioId: number, hash: string): StoredRun | null {
  const db = getDb();
  let stmt = runLookups.get(db);
  if (!stmt) runLookups.set(db, (stmt = prepareRunLookup(db)));
  const row = stmt.get({ scenarioId, hash });
  return row ? getRun(row.id) : null;
}

/**
 * The newest run's key figures of each of these scenarios, whatever their settings (for lists):
 * one query for the whole list. Runs are kept one per scenario (insertRun), newest id wins.
 */
export function latestKeyFigures(scenarioIds: number[]): Map<number, KeyFigures> {
  const out = new Map<number, KeyFigures>();
  if (scenarioIds.length === 0) return out;
  const rows = getDb()
    .select({ scenarioId: runs.scenarioId, keyFigures: runs.keyFigures })
    .from(runs)
    .where(inArray(runs.scenarioId, scenarioIds))
    .orderBy(desc(runs.id))
    .all();
  for (const r of rows) if (!out.has(r.scenarioId)) out.set(r.scenarioId, r.keyFigures as KeyFigures);
  return out;
}

type Tx = Parameters<Parameters<ReturnType<typeof getDb>["transaction"]>[0]>[0];

/**
 * Writes a finished run inside the caller's transaction; older runs of the scenario are
 * dropped (only the newest is kept). Returns the new run's id.
 */
export function insertRun(tx: Tx, scenarioId: number, hash: string, result: SimulationResult): number {
  tx.delete(runs).where(eq(runs.scenarioId, scenarioId)).run();
  for (const [id, run] of cache) if (run.scenarioId === scenarioId) cache.delete(id);
  return tx
    .insert(runs)
    .values({
      scenarioId,
      settingsHash: hash,
      engineVersion: result.engineVersion,
      keyFigures: result.keyFigures,
      budget: result.budget,
      events: result.events,
      series: result.series,
      stats: result.stats,
    })
    .returning({ id: runs.id })
    .get().id;
}

/** Stores a finished run in its own transaction. */
export function storeRun(scenarioId: number, hash: string, result: SimulationResult): StoredRun {
  const id = getDb().transaction((tx) => insertRun(tx, scenarioId, hash, result));
  return getRun(id)!;
}

/**
 * The run for a scenario's current settings: the stored one if the settings and engine are
 * unchanged, else a fresh run, stored. Throws ModelError when the engine cannot run them.
 */
export async function ensureRun(scenarioId: number, scenario: Scenario): Promise<StoredRun> {
  const hash = settingsHash(scenario);
  const existing = findRun(scenarioId, hash);
  if (existing) return existing;
  const result = await runEngine(scenario);
  return storeRun(scenarioId, hash, result);
}

/** Reads stored settings (migrating old schema versions); null if they no longer validate. */
export function readStoredSettings(settings: unknown): Scenario | null {
  const parsed = parseScenario(settings);
  return parsed.success ? parsed.data : null;
}
