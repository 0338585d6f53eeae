/**
 * What one integration segment (the stretch between two scheduled events) asks of a solver and
 * what it gets back. Both solvers — odex for the usual non-stiff tank (core/solver.ts) and the
 * Rosenbrock method for stiff ones (core/rosenbrock.ts) — answer the same request.
 */
import type { OdeProblem, Watch } from "./problem";

export type SegmentStatus = "done" | "crossed" | "maxSteps" | "wallTime" | "nonFinite";

export interface SegmentRequest {
  readonly problem: OdeProblem;
  /** Start time (days). */
  readonly t0: number;
  readonly y0: readonly number[];
  /** End time (days), > t0. */
  readonly t1: number;
  /** Sorted times strictly inside (t0, t1) at which to report the state. */
  readonly sampleTimes: readonly number[];
  onSample(t: number, y: number[]): void;
  /** Called after every accepted step with the step's end state (for peak tracking). */
  onStep?(t: number, y: number[]): void;
  readonly watches?: readonly Watch[];
  /** Step budget for this segment (≥ 1). */
  readonly maxSteps: number;
  /** Clock reading (ms, the loop's own clock) after which the segment gives up; Infinity for none. */
  readonly deadline: number;
  /** First trial step (days); the previous segment's last step is a good guess. */
  readonly initialStepSize: number;
}

export interface SegmentResult {
  readonly status: SegmentStatus;
  /** Time reached: t1 when done, the crossing time when crossed, the last good time otherwise. */
  readonly t: number;
  /** State at `t` (a fresh array). */
  readonly y: number[];
  /** Index into `watches` of the crossing, or -1. */
  readonly crossed: number;
  readonly steps: number;
  readonly rhsEvals: number;
  readonly rejected: number;
  /** Size of the last accepted step (days), for the next segment's first guess. */
  readonly lastStepSize: number;
}
