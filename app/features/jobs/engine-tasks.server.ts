/**
 * One engine run as a message: what the worker pool (app/features/jobs/jobs.server.ts) hands to a worker
 * thread (server/engine-worker.ts), or runs in-process when there is no built worker (tests,
 * `npm run dev`). Pure: the engine, a chart lookup helper and zlib (to pack long runs) only — no
 * database, no HTTP — so a worker does not open the database or pull in the web app.
 */
import {
  isModelError,
  ScenarioSchema,
  simulate,
  type ModelErrorCode,
  type SimulationResult,
  sweep,
  applyChanges,
  type SettingChange,
  type Scenario,
  type SimulateOptions,
  type SweepPoint,
  type TankEventInput,
} from "~models";
import { observe, type Observed } from "~models/nitrogen/calibrate";
import { valueAt } from "~/utils/series-lookup";
import { toStorableSync, type StorableRun } from "~/features/runs/run-packing.server";

export type EngineTask =
  | {
      /** One whole run (a preview, a view): the result, or the engine's typed error. */
      kind: "simulate";
      scenario: Scenario;
      limits: SimulateOptions;
    }
  | {
      /** One whole run to be stored (saving a scenario): long series come back packed. */
      kind: "store";
      scenario: Scenario;
      limits: SimulateOptions;
    }
  | {
      /** Run the scenario with `changes` applied (at least one) and read the named outcomes (models/nitrogen/sweep.ts OUTCOMES). */
      kind: "outcomes";
      scenario: Scenario;
      changes: readonly SettingChange[];
      outcomes: readonly string[];
      limits: SimulateOptions;
    }
  | {
      /** Run the scenario and read what a target is judged on (GoalFigures). */
      kind: "goal";
      scenario: Scenario;
      changes: readonly SettingChange[];
      limits: SimulateOptions;
    }
  | {
      /** Run the scenario and read TAN, nitrite-N and nitrate-N (mg N/L) at the given days. */
      kind: "sample";
      scenario: Scenario;
      days: readonly number[];
      limits: SimulateOptions;
    }
  | {
      /** Calibration: run the scenario (its "when full" trims pinned when given) and read it at the readings' days. */
      kind: "observe";
      scenario: Scenario;
      days: readonly number[];
      pinnedTrimDays: number[][] | null;
      limits: SimulateOptions;
      /** The journal's events in place of the periodic schedule ("as it happened"); none = the scenario's timetable. */
      events?: TankEventInput[];
    };

type Samples = { tan: number[]; no2: number[]; no3: number[] };

/**
 * What the target finder judges, mg N/L. "Inorganic N" is TAN + nitrite-N + nitrate-N: the
 * nitrogen that is or will become nitrate. Judging a nitrate goal on it keeps the search
 * monotone when a setting starves the filter (KH used up, ammonia piling up instead of
 * nitrate), which nitrate alone would read as success.
 */
export type GoalFigures = {
  /** Just before the last water change; at the end of the run when there is none. */
  nitrateBeforeChange: number;
  inorganicNBeforeChange: number;
  peakFreeNh3: number;
  /** Whether a water change happened (else the figures are the run's end). */
  hadWaterChange: boolean;
};

/** A ModelError as plain data, so it crosses the thread boundary and can be thrown again. */
type ModelErrorData = { code: ModelErrorCode; message: string; day: number | null; detail: readonly string[] };

export type EngineTaskResult =
  | { kind: "simulate"; result: SimulationResult | null; error: ModelErrorData | null }
  | { kind: "store"; run: StorableRun | null; error: ModelErrorData | null }
  | { kind: "outcomes"; point: SweepPoint }
  | { kind: "goal"; figures: GoalFigures | null; error: string | null }
  | { kind: "sample"; samples: Samples | null; error: string | null }
  | { kind: "observe"; observed: Observed | null; error: string | null };

/**
 * Runs one task. Settings the engine refuses or cannot solve come back as an `error` message
 * for the keeper, not as a throw; a throw here is a bug.
 */
export function runEngineTask(task: EngineTask): EngineTaskResult {
  if (task.kind === "store") {
    try {
      return { kind: "store", run: toStorableSync(simulate(task.scenario, task.limits)), error: null };
    } catch (error) {
      if (!isModelError(error)) throw error;
      return {
        kind: "store",
        run: null,
        error: { code: error.code, message: error.message, day: error.day, detail: error.detail },
      };
    }
  }
  if (task.kind === "simulate") {
    try {
      return { kind: "simulate", result: simulate(task.scenario, task.limits), error: null };
    } catch (error) {
      if (!isModelError(error)) throw error;
      return {
        kind: "simulate",
        result: null,
        error: { code: error.code, message: error.message, day: error.day, detail: error.detail },
      };
    }
  }
  if (task.kind === "outcomes") {
    const [first, ...rest] = task.changes;
    if (!first) throw new RangeError("An outcomes task needs at least one setting change.");
    const base = applyChanges(task.scenario, rest);
    // The engine's own sweep validates the changed settings and turns a ModelError into a message.
    const [point] = sweep(base, first.path, [first.value], { ...task.limits, outcomes: task.outcomes });
    return { kind: "outcomes", point };
  }
  if (task.kind === "observe") {
    try {
      const limits = { ...task.limits, pinnedTrimDays: task.pinnedTrimDays ?? undefined, events: task.events };
      return { kind: "observe", observed: observe(task.scenario, task.days, limits), error: null };
    } catch (error) {
      return { kind: "observe", observed: null, error: error instanceof Error ? error.message : String(error) };
    }
  }
  if (task.kind === "goal") {
    const parsed = ScenarioSchema.safeParse(applyChanges(task.scenario, task.changes));
    if (!parsed.success)
      return { kind: "goal", figures: null, error: parsed.error.issues.map((i) => i.message).join("; ") };
    try {
      const r = simulate(parsed.data, task.limits);
      const changes = r.events.filter((e) => e.kind === "waterChange");
      const last = changes[changes.length - 1];
      const day = last ? last.day : r.series.t[r.series.t.length - 1];
      const before = (y: number[]) => valueAt(r.series.t, y, day, "before");
      return {
        kind: "goal",
        figures: {
          nitrateBeforeChange: before(r.series.no3),
          inorganicNBeforeChange: before(r.series.tan) + before(r.series.no2) + before(r.series.no3),
          peakFreeNh3: r.keyFigures.peakFreeNh3.value,
          hadWaterChange: Boolean(last),
        },
        error: null,
      };
    } catch (error) {
      return { kind: "goal", figures: null, error: error instanceof Error ? error.message : String(error) };
    }
  }
  try {
    const r = simulate(task.scenario, task.limits);
    // On a water-change day the value before the change: a keeper tests before changing water
    // (the same rule the chart's readout uses for residuals).
    const at = (y: number[]) => task.days.map((d) => valueAt(r.series.t, y, d, "before"));
    return {
      kind: "sample",
      samples: { tan: at(r.series.tan), no2: at(r.series.no2), no3: at(r.series.no3) },
      error: null,
    };
  } catch (error) {
    return { kind: "sample", samples: null, error: error instanceof Error ? error.message : String(error) };
  }
}
