/**
 * Which solver integrates a segment. The usual tank is not stiff, and odex (explicit
 * extrapolation) is the fastest there. When odex's step count shows stiffness — many steps in
 * one segment, or many steps per simulated day over the run — the rest of the segment and every
 * later one go to RODAS4 (core/rosenbrock.ts), which takes long steps through fast equilibria.
 *
 * Thresholds (model choice, no source): a non-stiff tank needs a few odex steps per segment and
 * about 1 to 60 per simulated day (meals as pulses); a stiff one needs thousands.
 */
import type { SegmentRequest, SegmentResult } from "./segment";
import { integrateSegment } from "./solver";
import { integrateStiffSegment } from "./rosenbrock";

/** odex steps in one segment after which the segment is handed to the stiff solver. */
const STIFF_PROBE_STEPS = 1000;
/** Over the run, after this many odex steps … */
const RATE_MIN_STEPS = 2000;
/** … more than this many steps per simulated day switch the rest of the run. */
const RATE_STEPS_PER_DAY = 150;

interface Counters {
  steps: number;
  rhsEvals: number;
  rejected: number;
  stiffSegments: number;
}

export class SolverChoice {
  private stiff = false;
  private odexSteps = 0;
  private odexDays = 0;

  /** Whether the run has switched to the stiff solver. */
  get isStiff(): boolean {
    return this.stiff;
  }

  /**
   * Integrate one segment. Work done by an abandoned odex attempt is added to `counters`
   * directly; the returned result carries only the final solver's work.
   */
  integrate(req: SegmentRequest, counters: Counters): SegmentResult {
    if (this.stiff) {
      counters.stiffSegments++;
      return integrateStiffSegment(req);
    }
    const probe = Math.min(req.maxSteps, STIFF_PROBE_STEPS);
    const first = integrateSegment({ ...req, maxSteps: probe });
    this.odexSteps += first.steps;
    this.odexDays += first.t - req.t0;
    const tooSlow =
      this.odexSteps >= RATE_MIN_STEPS && this.odexSteps > RATE_STEPS_PER_DAY * Math.max(this.odexDays, 1e-9);
    if (tooSlow) this.stiff = true;
    if (first.status !== "maxSteps" || probe >= req.maxSteps) return first;
    // odex ran out of its probe budget with steps to spare: the segment is stiff.
    this.stiff = true;
    counters.steps += first.steps;
    counters.rhsEvals += first.rhsEvals;
    counters.rejected += first.rejected;
    counters.stiffSegments++;
    if (first.t >= req.t1) return { ...first, status: "done" };
    const rest = integrateStiffSegment({
      ...req,
      t0: first.t,
      y0: first.y,
      sampleTimes: req.sampleTimes.filter((ts) => ts > first.t),
      maxSteps: req.maxSteps - first.steps,
      initialStepSize: Math.max(first.lastStepSize, 1e-8),
    });
    return rest;
  }
}
