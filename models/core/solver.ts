/**
 * The solver adapter: the only file that imports odex (2.0.4, Hairer & Wanner's ODEX,
 * a non-stiff extrapolation method). It integrates one segment between scheduled events,
 * samples the dense output at requested times, detects upward threshold crossings and
 * enforces step and wall-time bounds. It never throws for numerical trouble: it returns a
 * status the simulate loop turns into a ModelError with a keeper's message.
 *
 * Why extrapolation is a good fit: every stage is a linear combination of right-hand-side
 * values, so any linear invariant of the system (here: total nitrogen including the
 * cumulative budget states) is kept to round-off, whatever the tolerance.
 */
import { Outcome, Solver } from "odex";
import type { SegmentRequest, SegmentResult, SegmentStatus } from "./segment";

export type { SegmentRequest, SegmentResult } from "./segment";

const now = (): number => (typeof performance !== "undefined" ? performance.now() : Date.now());

/** Integrate one segment. Pure apart from the callbacks and the wall-clock guard. */
export function integrateSegment(req: SegmentRequest): SegmentResult {
  const { problem, t0, t1, sampleTimes, watches } = req;
  const n = problem.dim;
  const solver = new Solver(n);
  solver.absoluteTolerance = problem.absoluteTolerance.slice();
  solver.relativeTolerance =
    typeof problem.relativeTolerance === "number" ? problem.relativeTolerance : problem.relativeTolerance.slice();
  solver.denseOutput = true;
  solver.maxSteps = Math.max(1, Math.floor(req.maxSteps));
  solver.initialStepSize = Math.min(Math.max(req.initialStepSize, 1e-6), t1 - t0);

  let status: SegmentStatus = "done";
  let crossed = -1;
  let tStop = t1;
  let yStop: number[] | null = null;
  let lastT = t0;
  let lastY: number[] = req.y0.slice();
  let lastStep = req.initialStepSize;
  let next = 0;
  let sinceClock = 0;

  const denseAll = (dense: (c: number, x: number) => number, x: number): number[] => {
    const out = new Array<number>(n);
    for (let i = 0; i < n; i++) out[i] = dense(i, x);
    return out;
  };

  const solOut = (nr: number, xOld: number, x: number, y: number[], dense?: (c: number, x: number) => number) => {
    if (nr === 1 || !dense) return true; // the initial call, before any step
    for (let i = 0; i < n; i++) {
      if (!Number.isFinite(y[i])) {
        status = "nonFinite";
        tStop = xOld;
        yStop = lastY;
        return false;
      }
    }
    // Upward threshold crossings: locate the earliest by bisection on the dense output.
    let tCross = Infinity;
    if (watches) {
      for (let w = 0; w < watches.length; w++) {
        const { index, threshold } = watches[w];
        if (y[index] >= threshold && lastY[index] < threshold) {
          let lo = xOld;
          let hi = x;
          for (let it = 0; it < 60 && hi - lo > 1e-12 * Math.max(1, Math.abs(hi)); it++) {
            const mid = 0.5 * (lo + hi);
            if (dense(index, mid) >= threshold) hi = mid;
            else lo = mid;
          }
          if (hi < tCross) {
            tCross = hi;
            crossed = w;
          }
        }
      }
    }
    const tEndSamples = Math.min(x, tCross);
    while (next < sampleTimes.length && sampleTimes[next] <= tEndSamples) {
      const ts = sampleTimes[next];
      if (ts >= tCross) break;
      req.onSample(ts, ts === x ? y.slice() : denseAll(dense, ts));
      next++;
    }
    if (tCross !== Infinity) {
      status = "crossed";
      tStop = tCross;
      yStop = tCross === x ? y.slice() : denseAll(dense, tCross);
      lastStep = x - xOld;
      return false;
    }
    req.onStep?.(x, y);
    lastT = x;
    lastY = y;
    lastStep = x - xOld;
    if (++sinceClock >= 8) {
      sinceClock = 0;
      if (now() > req.deadline) {
        status = "wallTime";
        tStop = x;
        yStop = y.slice();
        return false;
      }
    }
    return true;
  };

  const res = solver.solve((t, y) => problem.rhs(t, y), t0, req.y0.slice(), t1, solOut);
  const common = { steps: res.nStep, rhsEvals: res.nEval, rejected: res.nReject, lastStepSize: lastStep };
  if (res.outcome === Outcome.MaxStepsExceeded) {
    return { status: "maxSteps", t: lastT, y: lastY.slice(), crossed: -1, ...common };
  }
  if (res.outcome === Outcome.EarlyReturn) {
    return { status, t: tStop, y: (yStop ?? lastY).slice(), crossed, ...common };
  }
  // Converged: flush samples that sit exactly at the end (should not happen: they are < t1).
  while (next < sampleTimes.length) {
    req.onSample(sampleTimes[next], res.y.slice());
    next++;
  }
  for (let i = 0; i < n; i++) {
    if (!Number.isFinite(res.y[i])) return { status: "nonFinite", t: lastT, y: lastY.slice(), crossed: -1, ...common };
  }
  return { status: "done", t: t1, y: res.y.slice(), crossed: -1, ...common };
}
