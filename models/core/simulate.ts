/**
 * The generic simulate loop: integrate between scheduled events, apply each event as a jump,
 * handle threshold crossings (conditional events), sample on a regular grid plus just before
 * and just after every event, and enforce the step and wall-time bounds. It knows nothing about
 * nitrogen; the tank model supplies the problem, the events and the messages.
 */
import { ModelError } from "./errors";
import type { EventRecord, ScheduledEvent } from "./events";
import { TIME_EPS, batchEvents } from "./events";
import type { OdeProblem, Watch } from "./problem";
import { integrateSegment } from "./solver";

export interface LoopLimits {
  /** Total accepted + rejected steps over the run. */
  readonly maxSteps: number;
  /** Steps allowed between two events. */
  readonly maxStepsPerSegment: number;
  /** Wall-clock bound (ms); only ever used to abort. */
  readonly maxWallMs: number;
}

export interface LoopSpec {
  readonly problem: OdeProblem;
  readonly y0: readonly number[];
  /** End time (days). */
  readonly tEnd: number;
  /** Regular sampling interval (days). */
  readonly outputInterval: number;
  readonly schedule: readonly ScheduledEvent[];
  readonly watches: readonly Watch[];
  /** Apply the conditional event for watch `index` at time t (y is the loop's copy). */
  onCrossing(index: number, t: number, y: number[]): EventRecord[];
  /** Record a sample. `y` must not be kept (copy what you need). */
  sample(t: number, y: readonly number[]): void;
  /** Called after every accepted solver step. */
  onStep?(t: number, y: readonly number[]): void;
  readonly limits: LoopLimits;
  /** Keeper's message for a failure at simulated day `day`. */
  describeFailure(code: "MAX_STEPS" | "WALL_TIME" | "NON_FINITE", day: number): string;
}

export interface LoopStats {
  /** Solver steps (accepted and rejected). */
  steps: number;
  /** Right-hand-side evaluations. */
  rhsEvals: number;
  /** Rejected steps. */
  rejected: number;
  /** Integration segments (one per gap between events). */
  segments: number;
}

export interface LoopResult {
  /** State at tEnd. */
  readonly y: number[];
  readonly events: EventRecord[];
  readonly stats: LoopStats;
}

const now = (): number => (typeof performance !== "undefined" ? performance.now() : Date.now());

/** Run the loop. Throws ModelError (MAX_STEPS, WALL_TIME, NON_FINITE) instead of returning bad output. */
export function runLoop(spec: LoopSpec): LoopResult {
  const { problem, tEnd, outputInterval, limits } = spec;
  const deadline = now() + limits.maxWallMs;
  const stats: LoopStats = { steps: 0, rhsEvals: 0, rejected: 0, segments: 0 };
  const events: EventRecord[] = [];
  let y = spec.y0.slice();
  let t = 0;
  let h = Math.min(0.01, tEnd / 10);

  // Regular output times after 0; 0 and tEnd are sampled explicitly.
  const outputs: number[] = [];
  for (let k = 1; ; k++) {
    const to = k * outputInterval;
    if (to >= tEnd - TIME_EPS) break;
    outputs.push(to);
  }
  let out = 0;

  const fail = (code: "MAX_STEPS" | "WALL_TIME" | "NON_FINITE", day: number): never => {
    throw new ModelError(code, spec.describeFailure(code, day), { day });
  };

  /** Fire watches already at or above their threshold (after a jump or at the start). */
  const fireStandingWatches = (): void => {
    for (let guard = 0; guard < 100; guard++) {
      const w = spec.watches.findIndex((wt) => y[wt.index] >= wt.threshold);
      if (w < 0) return;
      const recs = spec.onCrossing(w, t, y);
      events.push(...recs);
      if (y[spec.watches[w].index] >= spec.watches[w].threshold) {
        throw new ModelError("INVALID", "A trimming rule leaves the plants above the level that triggers it.");
      }
    }
  };

  spec.sample(0, y);
  const batches = batchEvents(spec.schedule).filter((b) => b.t < tEnd - TIME_EPS);
  let bi = 0;
  // Events at the very start: the initial sample serves as "before".
  if (bi < batches.length && batches[bi].t <= TIME_EPS) {
    for (const e of batches[bi].events) events.push(...e.apply(y, 0));
    bi++;
  }
  fireStandingWatches();
  if (events.length > 0) spec.sample(0, y);

  while (t < tEnd) {
    const tb = bi < batches.length ? batches[bi].t : tEnd;
    let crossings = 0;
    while (tb - t > TIME_EPS) {
      while (out < outputs.length && outputs[out] <= t + TIME_EPS) out++;
      const sampleTimes: number[] = [];
      for (let k = out; k < outputs.length && outputs[k] < tb - TIME_EPS; k++) sampleTimes.push(outputs[k]);
      const budget = Math.min(limits.maxStepsPerSegment, limits.maxSteps - stats.steps);
      if (budget <= 0) fail("MAX_STEPS", t);
      if (now() > deadline) fail("WALL_TIME", t);
      const seg = integrateSegment({
        problem,
        t0: t,
        y0: y,
        t1: tb,
        sampleTimes,
        onSample: (ts, ys) => spec.sample(ts, ys),
        onStep: spec.onStep,
        watches: spec.watches,
        maxSteps: budget,
        deadline,
        initialStepSize: h,
      });
      stats.steps += seg.steps;
      stats.rhsEvals += seg.rhsEvals;
      stats.rejected += seg.rejected;
      stats.segments++;
      if (seg.lastStepSize > 0) h = seg.lastStepSize;
      if (seg.status === "maxSteps") fail("MAX_STEPS", seg.t);
      if (seg.status === "wallTime") fail("WALL_TIME", seg.t);
      if (seg.status === "nonFinite") fail("NON_FINITE", seg.t);
      t = seg.t;
      y = seg.y;
      if (seg.status === "crossed") {
        if (++crossings > 10000) fail("MAX_STEPS", t);
        spec.sample(t, y);
        events.push(...spec.onCrossing(seg.crossed, t, y));
        fireStandingWatches();
        spec.sample(t, y);
      } else {
        t = tb;
      }
    }
    if (bi < batches.length) {
      spec.sample(t, y);
      for (const e of batches[bi].events) events.push(...e.apply(y, t));
      fireStandingWatches();
      spec.sample(t, y);
      bi++;
    } else {
      break;
    }
  }
  spec.sample(tEnd, y);
  return { y, events, stats };
}
