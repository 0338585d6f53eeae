/**
 * The generic simulate loop: integrate between scheduled events, apply each event as a jump,
 * handle threshold crossings (conditional events), sample on a regular grid plus just before
 * and just after every event, and enforce the step and wall-time bounds. It knows nothing about
 * nitrogen; the tank model supplies the problem, the events and the messages.
 */
import { ModelError } from "./errors";
import type { EventOutcome, EventRecord, ScheduledEvent } from "./events";
import { TIME_EPS, batchEvents } from "./events";
import type { OdeProblem, Watch } from "./problem";
import type { SegmentResult } from "./segment";
import { SolverChoice } from "./solver-choice";

interface LoopLimits {
  /** Total accepted + rejected steps over the run. */
  readonly maxSteps: number;
  /** Steps allowed between two events. */
  readonly maxStepsPerSegment: number;
  /** Wall-clock bound (ms); only ever used to abort. */
  readonly maxWallMs: number;
}

export type FailureCode = "MAX_STEPS" | "WALL_TIME" | "NON_FINITE";

export interface LoopSpec {
  readonly problem: OdeProblem;
  readonly y0: readonly number[];
  /** End time (days). */
  readonly tEnd: number;
  /** Regular sampling interval (days). */
  readonly outputInterval: number;
  readonly schedule: readonly ScheduledEvent[];
  readonly watches: readonly Watch[];
  /** The conditional event for watch `index` at time t. */
  onCrossing(index: number, t: number, y: readonly number[]): EventOutcome;
  /** Record a sample. `y` must not be kept (copy what you need). */
  sample(t: number, y: readonly number[]): void;
  /** Called after every accepted solver step. */
  onStep?(t: number, y: readonly number[]): void;
  readonly limits: LoopLimits;
  /** Keeper's message for a failure at simulated day `day`. */
  describeFailure(code: FailureCode, day: number): string;
}

interface LoopStats {
  /** Solver steps (accepted and rejected). */
  steps: number;
  /** Right-hand-side evaluations. */
  rhsEvals: number;
  /** Rejected steps. */
  rejected: number;
  /** Integration segments (one per gap between events). */
  segments: number;
  /** Segments (or their remainders) integrated by the stiff solver. */
  stiffSegments: number;
}

export interface LoopResult {
  /** State at tEnd. */
  readonly y: readonly number[];
  readonly events: EventRecord[];
  readonly stats: LoopStats;
}

const now = (): number => (typeof performance !== "undefined" ? performance.now() : Date.now());

/** Regular output times strictly inside (0, tEnd); 0 and tEnd are sampled explicitly. */
function outputTimes(outputInterval: number, tEnd: number): number[] {
  const outputs: number[] = [];
  for (let k = 1; ; k++) {
    const to = k * outputInterval;
    if (to >= tEnd - TIME_EPS) break;
    outputs.push(to);
  }
  return outputs;
}

/** Mutable run state shared by the helpers below (one per run, never exported). */
interface Run {
  readonly spec: LoopSpec;
  readonly deadline: number;
  readonly stats: LoopStats;
  readonly events: EventRecord[];
  readonly solver: SolverChoice;
  t: number;
  y: readonly number[];
  h: number;
}

function fail(code: FailureCode, run: Run, day: number): never {
  throw new ModelError(code, run.spec.describeFailure(code, day), { day });
}

/** Adopt an event's outcome: its state becomes the run's, its records are listed. */
function adopt(run: Run, outcome: EventOutcome): void {
  run.y = outcome.y;
  run.events.push(...outcome.records);
}

/** Fire watches already at or above their threshold (after a jump or at the start). */
function fireStandingWatches(run: Run): void {
  const { watches } = run.spec;
  for (let guard = 0; guard < 100; guard++) {
    const w = watches.findIndex((wt) => run.y[wt.index] >= wt.threshold);
    if (w < 0) return;
    adopt(run, run.spec.onCrossing(w, run.t, run.y));
    if (run.y[watches[w].index] >= watches[w].threshold) {
      throw new ModelError("INVALID", "A trimming rule leaves the plants above the level that triggers it.");
    }
  }
}

/** Apply one batch of simultaneous events, with a sample just before and just after. */
function applyBatch(run: Run, events: readonly ScheduledEvent[], sampleBefore: boolean): void {
  if (sampleBefore) run.spec.sample(run.t, run.y);
  for (const e of events) adopt(run, e.apply(run.y, run.t));
  fireStandingWatches(run);
  run.spec.sample(run.t, run.y);
}

/** Book one solver answer into the stats and turn numerical trouble into the typed error. */
function book(run: Run, seg: SegmentResult): void {
  run.stats.steps += seg.steps;
  run.stats.rhsEvals += seg.rhsEvals;
  run.stats.rejected += seg.rejected;
  if (seg.lastStepSize > 0) run.h = seg.lastStepSize;
  if (seg.status === "maxSteps") fail("MAX_STEPS", run, seg.t);
  if (seg.status === "wallTime") fail("WALL_TIME", run, seg.t);
  if (seg.status === "nonFinite") fail("NON_FINITE", run, seg.t);
}

/** Integrate from run.t up to `tb` (the next batch of events), handling crossings on the way. */
function integrateTo(run: Run, tb: number, outputs: readonly number[], cursor: { out: number }): void {
  const { spec, stats } = run;
  const { limits } = spec;
  let crossings = 0;
  while (tb - run.t > TIME_EPS) {
    while (cursor.out < outputs.length && outputs[cursor.out] <= run.t + TIME_EPS) cursor.out++;
    const sampleTimes: number[] = [];
    for (let k = cursor.out; k < outputs.length && outputs[k] < tb - TIME_EPS; k++) sampleTimes.push(outputs[k]);
    const budget = Math.min(limits.maxStepsPerSegment, limits.maxSteps - stats.steps);
    if (budget <= 0) fail("MAX_STEPS", run, run.t);
    if (now() > run.deadline) fail("WALL_TIME", run, run.t);
    const seg = run.solver.integrate(
      {
        problem: spec.problem,
        t0: run.t,
        y0: run.y,
        t1: tb,
        sampleTimes,
        onSample: (ts, ys) => spec.sample(ts, ys),
        onStep: spec.onStep,
        watches: spec.watches,
        maxSteps: budget,
        deadline: run.deadline,
        initialStepSize: run.h,
      },
      stats,
    );
    book(run, seg);
    stats.segments++;
    run.t = seg.t;
    run.y = seg.y;
    if (seg.status === "crossed") {
      if (++crossings > 10000) fail("MAX_STEPS", run, run.t);
      spec.sample(run.t, run.y);
      adopt(run, spec.onCrossing(seg.crossed, run.t, run.y));
      fireStandingWatches(run);
      spec.sample(run.t, run.y);
    } else {
      run.t = tb;
    }
  }
}

/** Run the loop. Throws ModelError (MAX_STEPS, WALL_TIME, NON_FINITE) instead of returning bad output. */
export function runLoop(spec: LoopSpec): LoopResult {
  const { tEnd } = spec;
  const run: Run = {
    spec,
    deadline: now() + spec.limits.maxWallMs,
    stats: { steps: 0, rhsEvals: 0, rejected: 0, segments: 0, stiffSegments: 0 },
    events: [],
    solver: new SolverChoice(),
    t: 0,
    y: spec.y0.slice(),
    h: Math.min(0.01, tEnd / 10),
  };
  const outputs = outputTimes(spec.outputInterval, tEnd);
  const cursor = { out: 0 };

  spec.sample(0, run.y);
  const batches = batchEvents(spec.schedule).filter((b) => b.t < tEnd - TIME_EPS);
  let bi = 0;
  // Events at the very start: the initial sample serves as "before".
  if (bi < batches.length && batches[bi].t <= TIME_EPS) {
    for (const e of batches[bi].events) adopt(run, e.apply(run.y, 0));
    bi++;
  }
  fireStandingWatches(run);
  if (run.events.length > 0) spec.sample(0, run.y);

  for (; bi < batches.length; bi++) {
    integrateTo(run, batches[bi].t, outputs, cursor);
    applyBatch(run, batches[bi].events, true);
  }
  integrateTo(run, tEnd, outputs, cursor);
  spec.sample(tEnd, run.y);
  return { y: run.y, events: run.events, stats: run.stats };
}
