/**
 * RODAS4, the L-stable, stiffly accurate Rosenbrock method of order 4(3) of Hairer & Wanner,
 * "Solving Ordinary Differential Equations II", 2nd ed. (1996), §IV.7 (docs/sources.md §15).
 * Used for segments the extrapolation solver cannot finish in a reasonable number of steps:
 * a stiff tank (a large drip, many plants or strong low-oxygen zones in a small volume).
 *
 * Each step solves six linear systems with the one matrix (1/(hγ))·I − J, where J is a
 * finite-difference Jacobian taken once per accepted point. The stiffly accurate pair gives the
 * error estimate as the last stage. Between steps the state is interpolated by the cubic Hermite
 * polynomial through both ends and their derivatives (for samples and threshold crossings).
 *
 * Like every Rosenbrock method it keeps linear invariants (the nitrogen balance) to round-off:
 * each stage is a linear combination of right-hand-side values and J times earlier stages, and
 * an invariant's weights annihilate both.
 */
import { DenseLu } from "./linear-algebra";
import type { SegmentRequest, SegmentResult, SegmentStatus } from "./segment";

const STAGES = 6;
const GAMMA = 0.25;
/** Stage times c_i (fractions of the step). */
const C_TIME = [0, 0.386, 0.21, 0.63, 1, 1];
/** γ_i = Σ_j γ_ij, for the time derivative of a non-autonomous right-hand side. */
const GAMMA_SUM = [0.25, -0.1043, 0.1035, -0.0362, 0, 0];
// Coefficients in the form G·k_i = f(t + c_i h, y + Σ a_ij k_j) + Σ (c_ij / h) k_j + γ_i h f_t,
// G = I/(γh) − J, y1 = y0 + Σ m_j k_j; lower triangles stored row by row (a21, a31, a32, …).
const A = [
  1.544, 0.9466785280815826, 0.2557011698983284, 3.314825187068521, 2.896124015972201, 0.9986419139977817,
  1.221224509226641, 6.019134481288629, 12.53708332932087, -0.687886036105895, 1.221224509226641, 6.019134481288629,
  12.53708332932087, -0.687886036105895, 1,
];
const C = [
  -5.6688, -2.430093356833875, -0.2063599157091915, -0.1073529058151375, -9.594562251023355, -20.47028614809616,
  7.496443313967647, -10.24680431464352, -33.99990352819905, 11.7089089320616, 8.083246795921522, -7.981132988064893,
  -31.52159432874371, 16.31930543123136, -6.058818238834054,
];
const M = [1.221224509226641, 6.019134481288629, 12.53708332932087, -0.687886036105895, 1, 1];
const tri = (i: number, j: number) => (i * (i - 1)) / 2 + j; // 0-based stage i > j

const UROUND = 2.220446049250313e-16;
const SQRT_UROUND = Math.sqrt(UROUND);
const now = (): number => (typeof performance !== "undefined" ? performance.now() : Date.now());

/**
 * Shape-preserving cubic Hermite value at θ = s ∈ [0, 1] of a step of length h (Fritsch &
 * Carlson 1980): an end slope against the secant's direction is set to zero and slopes are
 * capped at three times the secant, so a step across a fast transient (where the end derivatives
 * are huge) never overshoots between its ends — a sample can never show a negative pool the
 * solver did not produce.
 */
function hermite(y0: number, f0: number, y1: number, f1: number, h: number, s: number): number {
  const secant = (y1 - y0) / h;
  const limit = (f: number) => {
    if (secant === 0 || f * secant <= 0) return 0;
    const cap = 3 * secant;
    return Math.abs(f) > Math.abs(cap) ? cap : f;
  };
  f0 = limit(f0);
  f1 = limit(f1);
  const s2 = s * s;
  const s3 = s2 * s;
  return (2 * s3 - 3 * s2 + 1) * y0 + (s3 - 2 * s2 + s) * h * f0 + (-2 * s3 + 3 * s2) * y1 + (s3 - s2) * h * f1;
}

/**
 * Integrate one segment with RODAS4. Same contract as the odex adapter: samples through
 * `onSample`, upward threshold crossings located on the interpolant, and a status instead of an
 * exception for numerical trouble.
 */
export function integrateStiffSegment(req: SegmentRequest): SegmentResult {
  const { problem, t0, t1, sampleTimes, watches } = req;
  const n = problem.dim;
  const f = (t: number, y: ArrayLike<number>): number[] => problem.rhs(t, y as readonly number[]);
  const atol = problem.absoluteTolerance;
  const rtolOf = (i: number) =>
    typeof problem.relativeTolerance === "number" ? problem.relativeTolerance : problem.relativeTolerance[i];

  const jac = new Float64Array(n * n);
  const lu = new DenseLu(n);
  const k: Float64Array[] = Array.from({ length: STAGES }, () => new Float64Array(n));
  const ys = new Float64Array(n);
  const ft = new Float64Array(n);

  let t = t0;
  let y = req.y0.slice();
  let fy = f(t, y);
  let rhsEvals = 1;
  let steps = 0;
  let rejected = 0;
  let h = Math.min(Math.max(req.initialStepSize, 1e-8), t1 - t0);
  let lastStep = h;
  let next = 0;
  let sinceClock = 0;
  const result = (status: SegmentStatus, tr: number, yr: number[], crossed = -1): SegmentResult => ({
    status,
    t: tr,
    y: yr.slice(),
    crossed,
    steps,
    rhsEvals,
    rejected,
    lastStepSize: lastStep,
  });

  while (t1 - t > 1e-12 * Math.max(1, Math.abs(t1))) {
    // Jacobian at the accepted point, by forward differences. The increment scales with the
    // component or its absolute tolerance, so a component far below 1 (a trace species) is not
    // swamped by its own increment.
    for (let j = 0; j < n; j++) {
      const save = y[j];
      const delta = SQRT_UROUND * Math.max(Math.abs(save), atol[j]);
      y[j] = save + delta;
      const fj = f(t, y);
      y[j] = save;
      for (let i = 0; i < n; i++) jac[i * n + j] = (fj[i] - fy[i]) / delta;
    }
    rhsEvals += n;
    // Time derivative (the tank's right-hand side is autonomous between events, but the
    // solver is generic).
    const dt = Math.sqrt(UROUND) * Math.max(1e-5, Math.abs(t));
    const fPlus = f(t + dt, y);
    rhsEvals++;
    for (let i = 0; i < n; i++) ft[i] = (fPlus[i] - fy[i]) / dt;

    let rejectedLast = false;
    for (;;) {
      if (steps >= req.maxSteps) return result("maxSteps", t, y);
      if (++sinceClock >= 8) {
        sinceClock = 0;
        if (now() > req.deadline) return result("wallTime", t, y);
      }
      h = Math.min(h, t1 - t);
      steps++;
      if (!lu.factorShifted(1 / (GAMMA * h), jac)) {
        rejected++;
        h *= 0.5;
        rejectedLast = true;
        if (h < 1e-14 * Math.max(1, Math.abs(t))) return result("nonFinite", t, y);
        continue;
      }
      let finite = true;
      for (let s = 0; s < STAGES && finite; s++) {
        let fs: ArrayLike<number>;
        if (s === 0) fs = fy;
        else {
          for (let i = 0; i < n; i++) {
            let v = y[i];
            for (let j = 0; j < s; j++) v += A[tri(s, j)] * k[j][i];
            ys[i] = v;
          }
          fs = f(t + C_TIME[s] * h, ys);
          rhsEvals++;
        }
        const ks = k[s];
        for (let i = 0; i < n; i++) {
          let v = fs[i] + GAMMA_SUM[s] * h * ft[i];
          for (let j = 0; j < s; j++) v += (C[tri(s, j)] / h) * k[j][i];
          ks[i] = v;
        }
        lu.solve(ks);
        for (let i = 0; i < n; i++) if (!Number.isFinite(ks[i])) finite = false;
      }
      // Error: the last stage (stiffly accurate embedded pair), scaled per component.
      let err = 0;
      const yNew = new Array<number>(n);
      if (finite) {
        for (let i = 0; i < n; i++) {
          let v = y[i];
          for (let j = 0; j < STAGES; j++) v += M[j] * k[j][i];
          yNew[i] = v;
          const sc = atol[i] + rtolOf(i) * Math.max(Math.abs(y[i]), Math.abs(v));
          const e = k[STAGES - 1][i] / sc;
          err += e * e;
        }
        err = Math.sqrt(err / n);
      }
      if (!finite || !Number.isFinite(err)) {
        rejected++;
        h *= 0.25;
        rejectedLast = true;
        if (h < 1e-14 * Math.max(1, Math.abs(t))) return result("nonFinite", t, y);
        continue;
      }
      const fac = Math.min(6, Math.max(0.2, 0.9 * Math.pow(Math.max(err, 1e-10), -0.25)));
      if (err > 1) {
        rejected++;
        h *= rejectedLast ? Math.min(fac, 0.5) : fac;
        rejectedLast = true;
        if (h < 1e-14 * Math.max(1, Math.abs(t))) return result("nonFinite", t, y);
        continue;
      }
      // Accepted.
      const tNew = t + h;
      const fNew = f(tNew, yNew);
      rhsEvals++;
      const dense = (i: number, x: number) => hermite(y[i], fy[i], yNew[i], fNew[i], h, (x - t) / h);
      let tCross = Infinity;
      let crossed = -1;
      if (watches) {
        for (let w = 0; w < watches.length; w++) {
          const { index, threshold } = watches[w];
          if (yNew[index] >= threshold && y[index] < threshold) {
            let lo = t;
            let hi = tNew;
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
      const denseAll = (x: number) => Array.from({ length: n }, (_, i) => dense(i, x));
      while (next < sampleTimes.length && sampleTimes[next] <= Math.min(tNew, tCross)) {
        const ts = sampleTimes[next];
        if (ts >= tCross) break;
        req.onSample(ts, ts === tNew ? yNew.slice() : denseAll(ts));
        next++;
      }
      lastStep = h;
      if (tCross !== Infinity) return result("crossed", tCross, tCross === tNew ? yNew : denseAll(tCross), crossed);
      req.onStep?.(tNew, yNew);
      t = tNew;
      y = yNew;
      fy = fNew;
      h = rejectedLast ? Math.min(h * fac, h) : h * fac;
      break;
    }
  }
  while (next < sampleTimes.length) {
    req.onSample(sampleTimes[next], y.slice());
    next++;
  }
  return result("done", t1, y);
}
