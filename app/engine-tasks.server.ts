/**
 * One engine run as a message: what the worker pool (app/jobs.server.ts) hands to a worker
 * thread (server/engine-worker.ts), or runs in-process when there is no built worker (tests,
 * `npm run dev`). Pure: the engine and a chart lookup helper only — no database, no HTTP —
 * so a worker does not open the database or pull in the web app.
 */
import { simulate, sweep, setScenarioValue, type Scenario, type SimulateOptions, type SweepPoint } from "../models";
import { valueAt } from "~/components/charts/lookup";

export type SettingPath = readonly (string | number)[];

/** One setting set to one canonical value. */
export type SettingChange = { path: SettingPath; value: number };

export type EngineTask =
  | {
      /** Run the scenario with `changes` applied (at least one) and read the named outcomes (models/nitrogen/sweep.ts OUTCOMES). */
      kind: "outcomes";
      scenario: Scenario;
      changes: readonly SettingChange[];
      outcomes: readonly string[];
      limits: SimulateOptions;
    }
  | {
      /** Run the scenario and read TAN, nitrite-N and nitrate-N (mg N/L) at the given days. */
      kind: "sample";
      scenario: Scenario;
      days: readonly number[];
      limits: SimulateOptions;
    };

export type Samples = { tan: number[]; no2: number[]; no3: number[] };

export type EngineTaskResult =
  | { kind: "outcomes"; point: SweepPoint }
  | { kind: "sample"; samples: Samples | null; error: string | null };

/**
 * Runs one task. Settings the engine refuses or cannot solve come back as an `error` message
 * for the keeper, not as a throw; a throw here is a bug.
 */
export function runEngineTask(task: EngineTask): EngineTaskResult {
  if (task.kind === "outcomes") {
    const [first, ...rest] = task.changes;
    if (!first) throw new RangeError("An outcomes task needs at least one setting change.");
    let base = task.scenario;
    for (const c of rest) base = setScenarioValue(base, c.path, c.value);
    // The engine's own sweep validates the changed settings and turns a ModelError into a message.
    const [point] = sweep(base, first.path, [first.value], { ...task.limits, outcomes: task.outcomes });
    return { kind: "outcomes", point };
  }
  try {
    const r = simulate(task.scenario, task.limits);
    // On a water-change day the value before the change: a keeper tests before changing water
    // (the same rule the chart's readout uses for residuals).
    const at = (y: number[]) => task.days.map((d) => valueAt(r.series.t, y, d, "before"));
    return { kind: "sample", samples: { tan: at(r.series.tan), no2: at(r.series.no2), no3: at(r.series.no3) }, error: null };
  } catch (error) {
    return { kind: "sample", samples: null, error: error instanceof Error ? error.message : String(error) };
  }
}
