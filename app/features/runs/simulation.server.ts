/**
 * App ↔ engine glue: turns a stored scenario into a run, reusing a stored run when nothing
 * changed (same settings hash, same engine version), and keeps parsed runs in a small cache
 * so opening a results page does not re-read a megabyte of JSON each time.
 */
import { createHash } from "node:crypto";
import { and, desc, eq, inArray, isNotNull, sql } from "drizzle-orm";
import { LRUCache } from "lru-cache";
import {
  ENGINE_VERSION,
  parseScenario,
  type KeyFigures,
  type NitrogenBudget,
  type Scenario,
  type Series,
  type SimulationResult,
  type SimulationStats,
} from "~models";
import type { EventRecord } from "~models";
import { getDb, type Db } from "~/db/client.server";
import { runs } from "~/db/schema";
import { checkRunBytes } from "~/quotas.server";
import { runForRequest, runForStorage, type RunRequest } from "~/features/runs/run-gate.server";
import {
  PACKED_MARKER,
  readStoredSeries,
  storedBytes,
  toStorableSync,
  type StorableRun,
} from "~/features/runs/run-packing.server";

export { REQUEST_RUN_LIMITS, type RunRequest } from "~/features/runs/run-gate.server";
export type { StorableRun } from "~/features/runs/run-packing.server";

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
  /** Warnings, low-oxygen zones and ammonia criteria (runs stored before they were kept are run again). */
  findings: RunFindings;
  createdAt: Date;
};

/** What the engine found beyond the series, kept with the stored run. */
type RunFindings = Pick<SimulationResult, "warnings" | "lowOxygenZones" | "ammoniaCriteria">;

/** A stored run's findings; runs stored before they were kept have none (findRun skips them). */
function readFindings(value: unknown): RunFindings {
  const f = (value ?? {}) as Partial<RunFindings>;
  return {
    warnings: Array.isArray(f.warnings) ? f.warnings : [],
    lowOxygenZones: f.lowOxygenZones ?? null,
    ammoniaCriteria: f.ammoniaCriteria ?? { acuteTanMgNPerL: Number.NaN, chronicTanMgNPerL: Number.NaN },
  };
}

/** JSON with object keys sorted, so equal settings hash equally whatever their key order. */
function canonicalJson(value: unknown): string {
  return JSON.stringify(value, (_key, v) =>
    v && typeof v === "object" && !Array.isArray(v)
      ? Object.fromEntries(Object.entries(v as Record<string, unknown>).sort(([a], [b]) => (a < b ? -1 : 1)))
      : v,
  );
}

/** The key a stored run is found by: its settings' content hash, key order aside. */
export function settingsHash(scenario: Scenario): string {
  // Worked out on every results view: the canonical form (keys sorted at every level) costs
  // about ten times the plain text, so the hash is kept by the plain text.
  const text = JSON.stringify(scenario);
  let hash = hashesByText.get(text);
  if (hash === undefined) hashesByText.set(text, (hash = contentHash(scenario)));
  return hash;
}
const hashesByText = new LRUCache<string, string>({ max: 256 });

/** SHA-256 of any JSON value, key order aside (e.g. what a job ran on, to tell if it changed). */
export function contentHash(value: unknown): string {
  return createHash("sha256").update(canonicalJson(value)).digest("hex");
}

/** The tank's nitrate band wins over the one saved in the scenario (the band is a tank setting). */
export function withTankTargets(
  scenario: Scenario,
  tank: { nitrateTargetLow: number; nitrateTargetHigh: number },
): Scenario {
  return { ...scenario, targets: { nitrateLow: tank.nitrateTargetLow, nitrateHigh: tank.nitrateTargetHigh } };
}

/**
 * Runs the engine for a request, off the request thread unless provably cheap, within the
 * person's limits (app/features/runs/run-gate.server.ts). Throws ModelError, or RunRefused (429).
 */
export function runEngine(scenario: Scenario, request: RunRequest): Promise<SimulationResult> {
  return runForRequest(scenario, request);
}

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
    series: readStoredSeries(row.series, row.seriesPacked),
    stats: row.stats as SimulationStats,
    findings: readFindings(row.findings),
    createdAt: row.createdAt,
  };
}

/** A stored run by id (rows never change once written, so the cache needs no invalidation). */
export function getRun(runId: number): StoredRun | null {
  const hit = cache.get(runId);
  if (hit) return remember(hit);
  const db = getDb();
  let stmt = runsById.get(db);
  if (!stmt) runsById.set(db, (stmt = prepareRunById(db)));
  const row = stmt.get({ runId });
  return row ? remember(fromRow(row)) : null;
}

// A run's first view reads it by id: prepared once per database, like the lookup below.
const runsById = new WeakMap<Db, ReturnType<typeof prepareRunById>>();
function prepareRunById(db: Db) {
  return db
    .select()
    .from(runs)
    .where(eq(runs.id, sql.placeholder("runId")))
    .prepare();
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
        // Runs stored before the findings were kept are run again.
        isNotNull(runs.findings),
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
 * dropped (only the newest is kept). Long series are stored packed. Throws QuotaExceeded (the
 * transaction then writes nothing) when the owner's stored runs would pass their quota.
 * Returns the new run's id.
 */
export function insertRun(tx: Tx, scenarioId: number, hash: string, run: StorableRun | SimulationResult): number {
  const storable: StorableRun = "seriesPacked" in run ? run : toStorableSync(run);
  checkRunBytes(tx, scenarioId, storedBytes(storable));
  tx.delete(runs).where(eq(runs.scenarioId, scenarioId)).run();
  for (const [id, cached] of cache) if (cached.scenarioId === scenarioId) cache.delete(id);
  return tx
    .insert(runs)
    .values({
      scenarioId,
      settingsHash: hash,
      engineVersion: storable.engineVersion,
      keyFigures: storable.keyFigures,
      budget: storable.budget,
      events: storable.events,
      series: storable.seriesPacked ? PACKED_MARKER : storable.series,
      seriesPacked: storable.seriesPacked ? Buffer.from(storable.seriesPacked) : null,
      stats: storable.stats,
      findings: {
        warnings: storable.warnings,
        lowOxygenZones: storable.lowOxygenZones,
        ammoniaCriteria: storable.ammoniaCriteria,
      },
    })
    .returning({ id: runs.id })
    .get().id;
}

/** Stores a finished run in its own transaction. */
function storeRun(scenarioId: number, hash: string, run: StorableRun): StoredRun {
  const id = getDb().transaction((tx) => insertRun(tx, scenarioId, hash, run));
  return getRun(id)!;
}

/** Runs the engine for a run about to be stored (long series come back packed); see runEngine. */
export function runEngineForStorage(scenario: Scenario, request: RunRequest): Promise<StorableRun> {
  return runForStorage(scenario, request);
}

/**
 * The run for a scenario's current settings: the stored one if the settings and engine are
 * unchanged, else a fresh run (counted against `ownerId`, the scenario's owner, as a save), stored.
 * Throws ModelError when the engine cannot run them, RunRefused or QuotaExceeded.
 */
export async function ensureRun(scenarioId: number, scenario: Scenario, ownerId: number): Promise<StoredRun> {
  const hash = settingsHash(scenario);
  const existing = findRun(scenarioId, hash);
  if (existing) return existing;
  // Visitors who come at once (a shared link after an engine update) wait for one run between
  // them instead of each starting one on the owner's runs in flight (and being refused).
  const key = `${scenarioId}:${hash}`;
  const pending = runsUnderWay.get(key);
  if (pending) return pending;
  // A re-run stores a run like a save does, so it counts as one: a new nitrate band (free to
  // change) makes every run of the tank stale, and views alone would otherwise store runs at will.
  const made = runEngineForStorage(scenario, { userId: ownerId, purpose: "save" })
    .then((run) => storeRun(scenarioId, hash, run))
    .finally(() => runsUnderWay.delete(key));
  runsUnderWay.set(key, made);
  return made;
}
/** Runs for a scenario's current settings being made now, by scenario and settings hash. */
const runsUnderWay = new Map<string, Promise<StoredRun>>();

/**
 * Reads stored settings (migrating old schema versions); null if they no longer validate.
 * Every view of a results, compare or edit page reads them, and the schema's parse costs
 * about 0.2 ms (issue 15, item 5), so a parse is kept by the settings' text. Each caller gets
 * its own copy: nothing a caller changes reaches the kept one.
 */
export function readStoredSettings(settings: unknown): Scenario | null {
  const text = JSON.stringify(settings) as string | undefined;
  let kept = text === undefined ? undefined : parsedSettings.get(text);
  if (!kept) {
    const parsed = parseScenario(settings);
    kept = { scenario: parsed.success ? parsed.data : null };
    if (text !== undefined) parsedSettings.set(text, kept);
  }
  return kept.scenario && structuredClone(kept.scenario);
}
const parsedSettings = new LRUCache<string, { scenario: Scenario | null }>({ max: 256 });
