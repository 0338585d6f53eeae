/**
 * simulate(): run a scenario through the tank model and return series, events, the nitrogen
 * budget, key figures, warnings and solver statistics. Pure and deterministic (apart from
 * `stats.wallMs`, which is reported but never changes any other value; the clock is otherwise
 * read only to abort).
 */
import { ModelError } from "../core/errors";
import type { OdeProblem } from "../core/problem";
import { runLoop } from "../core/simulate";
import { buildBudget } from "./budget";
import { ammoniaCriteria } from "./criteria";
import { describeFailure } from "./failure-message";
import { initialState } from "./initial-state";
import { keyFiguresFrom } from "./key-figures";
import { zoneCapacity } from "./low-oxygen-zones";
import type { RawSeries } from "./recorder";
import { createRecorder } from "./recorder";
import type { SimulateOptions, SimulationResult } from "./result";
import { ENGINE_VERSION, roundDay } from "./result";
import { absoluteTolerances, makeRhs } from "./rhs";
import type { Scenario } from "./scenario";
import { ScenarioSchema, describeScenarioIssues } from "./scenario";
import { buildSchedule } from "./schedule";
import { IX, PLANT0, STATE_NAMES } from "./state";
import { stocks } from "./stocks";
import { deriveConstants } from "./tank-constants";
import type { TankEvent } from "./tank-events";
import { TankEventsSchema } from "./tank-events";
import { findWarnings } from "./warnings";

/** The options' explicit event list, validated (the engine's boundary), or undefined. */
function explicitSchedule(options: SimulateOptions): TankEvent[] | undefined {
  if (options.events === undefined) return undefined;
  const parsed = TankEventsSchema.safeParse(options.events);
  if (!parsed.success) {
    const lines = parsed.error.issues.map((i) => `${i.path.join(".")}: ${i.message}`);
    throw new ModelError("INVALID", `The event list has entries the model cannot use: ${lines.join("; ")}`, {
      detail: lines,
    });
  }
  return parsed.data;
}

const now = (): number => (typeof performance !== "undefined" ? performance.now() : Date.now());

function validated(scenario: Scenario, options: SimulateOptions): Scenario {
  const parsed = ScenarioSchema.safeParse(scenario);
  if (!parsed.success) {
    const lines = describeScenarioIssues(parsed.error);
    throw new ModelError("INVALID", `The scenario has settings the model cannot use: ${lines.join("; ")}`, {
      detail: lines,
    });
  }
  const outputInterval = options.outputIntervalDays ?? parsed.data.run.outputIntervalDays;
  if (!(outputInterval >= 1 / 24 - 1e-12 && outputInterval <= 7)) {
    throw new ModelError("INVALID", "The chart spacing must be between one hour (1/24 day) and 7 days.");
  }
  return parsed.data;
}

/**
 * Run the nitrogen model.
 *
 * @param scenario A validated scenario (canonical units; see ScenarioSchema). It is checked
 *   again here and never modified.
 * @returns series (mg N/L, mg O2/L, dKH, g, mg N over days), events, the nitrogen budget (mg N),
 *   key figures, warnings and solver statistics; with `rawSeries: true` also the unrounded,
 *   unclamped samples.
 * @throws ModelError INVALID for a scenario that fails the schema; MAX_STEPS, WALL_TIME or
 *   NON_FINITE when the numbers cannot be resolved, with a message a keeper can act on.
 */
export function simulate(
  scenario: Scenario,
  options: SimulateOptions & { rawSeries: true },
): SimulationResult & { rawSeries: RawSeries };
export function simulate(scenario: Scenario, options?: SimulateOptions): SimulationResult;
export function simulate(scenario: Scenario, options: SimulateOptions = {}): SimulationResult {
  const started = now();
  const s = validated(scenario, options);
  const c = deriveConstants(s);
  const tEnd = s.run.lengthDays;
  const y0 = initialState(s, c);
  const events = explicitSchedule(options);
  const schedule = buildSchedule(s, c, tEnd, events, options.pinnedTrimDays);
  const problem: OdeProblem = {
    dim: PLANT0 + c.plantCount,
    names: [...STATE_NAMES, ...s.plants.map((g) => `plants "${g.name}" (g)`)],
    rhs: makeRhs(schedule.rates),
    absoluteTolerance: absoluteTolerances(c),
    relativeTolerance: 1e-6,
  };
  const recorder = createRecorder(s, c, options.rawSeries === true);
  const maxWallMs = options.maxWallMs ?? 2000;
  const loop = runLoop({
    problem,
    y0,
    tEnd,
    outputInterval: options.outputIntervalDays ?? s.run.outputIntervalDays,
    schedule: schedule.events,
    watches: schedule.watches,
    onCrossing: schedule.onCrossing,
    sample: recorder.sample,
    onStep: recorder.track,
    limits: {
      maxSteps: options.maxSteps ?? 200_000,
      maxStepsPerSegment: options.maxStepsPerSegment ?? 50_000,
      maxWallMs,
    },
    describeFailure: (code, day) => describeFailure(s, c, code, day, maxWallMs),
  });
  const yEnd = loop.y;
  const { ledger } = schedule;
  const budget = buildBudget(
    c,
    tEnd,
    yEnd,
    stocks(c, y0),
    stocks(c, yEnd),
    ledger.flows,
    ledger.feedContinuousMgN ?? undefined,
  );
  if (!Number.isFinite(budget.imbalance)) {
    throw new ModelError("NON_FINITE", describeFailure(s, c, "NON_FINITE", tEnd, 0), { day: tEnd });
  }
  const { series, extremes } = recorder;
  const result: SimulationResult = {
    engineVersion: ENGINE_VERSION,
    series,
    events: loop.events.map((e) => ({ ...e, day: roundDay(e.day) })),
    budget,
    keyFigures: keyFiguresFrom(series, s, extremes, ledger.nitrateBeforeLastChange, yEnd[IX.no3], ledger.trimmedG),
    warnings: findWarnings(s, c, recorder.trace, extremes, events),
    lowOxygenZones: zoneCapacity(s),
    ammoniaCriteria: ammoniaCriteria(s.water.pH, s.water.temperatureC),
    stats: { ...loop.stats, wallMs: Math.round((now() - started) * 100) / 100 },
  };
  return recorder.raw ? Object.assign(result, { rawSeries: recorder.raw }) : result;
}

export { ENGINE_VERSION } from "./result";
export type { KeyFigures, Series, SimulateOptions, SimulationResult, SimulationStats } from "./result";
