/**
 * How sure the fit is: a 95 % range for each multiplier from the likelihood itself, not from
 * its quadratic approximation alone.
 *
 * The range of multiplier j is the profile-likelihood interval: every value of j at which some
 * choice of the other multipliers and of the noise level τ keeps the likelihood-ratio statistic
 * 2(ln L̂ − ln L) within the threshold (threshold.ts: 3.84, χ² with one degree of freedom, made
 * a little larger for the τ estimated from the same readings). Venzon & Moolgavkar 1988;
 * Raue et al. 2009 for model calibration; docs/sources.md §17. Equivalently it is the extent,
 * along j, of the set of points inside the threshold, so every point met that lies inside
 * (another valley of the likelihood too) belongs to it.
 *
 * The profile is followed outwards from the fit along the line on which the quadratic
 * approximation says the others trade off with j (the column j of (JᵀJ)⁻¹), with two
 * Gauss–Newton corrections of the others at every probe. With kit readings the likelihood is
 * flat inside the readings' intervals and rippled where a model value crosses an interval's
 * edge, which no quadratic approximation captures: a probe still outside is searched along
 * every other multiplier (coarse, then fine) before it counts as outside, and the next probe
 * starts where the valley was found. A point clearly better than the fit is reported back, so
 * the fit can move there (the search had stopped in a lesser valley).
 */
import { inv, lusolve } from "mathjs";
import type { Observation } from "./likelihood";
import { negLogLikelihood, noiseLevel } from "./likelihood";
import type { Observed } from "./observe";
import { clamp } from "./least-squares";

export type Range = {
  /** In log-multiplier units. */
  low: number;
  high: number;
  /** Whether the range reached the box (0.1 or 10) on that side. */
  lowOpen: boolean;
  highOpen: boolean;
};

/** Covariance of the log-multipliers, (JᵀJ)⁻¹, from the residual Jacobian; null if singular. */
export function covarianceOf(jacobian: readonly number[][], p: number): number[][] | null {
  const A = Array.from({ length: p }, (_a, a) =>
    Array.from({ length: p }, (_b, b) => jacobian.reduce((s, row) => s + row[a] * row[b], 0)),
  );
  try {
    const C = inv(A) as number[][];
    if (C.some((row, j) => !Number.isFinite(row[j]) || row[j] <= 0 || row.some((v) => !Number.isFinite(v))))
      return null;
    return C;
  } catch {
    return null;
  }
}

/** Correlation matrix of a covariance. */
export function correlationOf(C: readonly number[][]): number[][] {
  return C.map((row, a) => row.map((v, b) => v / Math.sqrt(C[a][a] * C[b][b])));
}

/** −ln L of a run with τ at its own best (τ profiled out, as the ranges need). */
export function profiledNll(obs: readonly Observation[], mu: readonly number[]): number {
  return negLogLikelihood(obs, mu, noiseLevel(obs, mu, 0));
}

/**
 * A point clearly better than the fit: −ln L lower by more than this (a likelihood ratio of e²).
 * Smaller gains are within the search's own resolution. Model choice, no source.
 */
export const BETTER_BY = 2;

/** χ² with one degree of freedom, 95 % point (Abramowitz & Stegun Table 26.8): where the quadratic approximation's t = 1.96 lands. */
const CHI2_95_1DF = 3.841;

/** Offsets (ln units) at which a probe still outside looks along each other multiplier: coarse, then fine. */
const COARSE = [-1, -0.5, -0.25, -0.1, 0.1, 0.25, 0.5, 1];
/** While bisecting, the valley floor is known from the probes around: a narrower look. */
const NEAR = [-0.25, -0.1, 0.1, 0.25];
const FINE = [-0.05, -0.02, 0.02, 0.05];
/**
 * With kit readings, how far above the threshold the valley floor may rise (as a multiple of
 * it) before a probe stops moving outwards: ripples of the likelihood lower than that may hide
 * another valley beyond. Model choice, no source.
 */
const LOOK_PAST = 4;

type Probe = {
  j: number;
  side: 1 | -1;
  tIn: number;
  tOut: number | null;
  lrIn: number;
  lrOut: number;
  open: boolean;
  rounds: number;
  /** The others' offset from the line where the valley floor was last found. */
  shift: number[];
  /** Still moving outwards; the farthest t tried so far and its LR. */
  bracketing: boolean;
  tFar: number;
  lrFar: number;
};

export type RangesResult = {
  /** Empty when `better` is set. */
  ranges: Range[];
  /** A point (log units) clearly better than the fit, if one was met; the fit should move there. */
  better: number[] | null;
};

/**
 * 95 % ranges for every fitted multiplier. `nllAt` is the profiled −ln L at θ̂ (profiledNll);
 * runs are free runs through `evaluate`.
 */
export async function likelihoodRanges(opts: {
  theta: readonly number[];
  nllAt: number;
  /** The likelihood-ratio threshold (rangeThreshold). */
  threshold: number;
  covariance: number[][] | null;
  lower: readonly number[];
  upper: readonly number[];
  observations: readonly Observation[];
  valuesOf: (o: Observed) => number[];
  evaluate: (points: number[][]) => Promise<(Observed | null)[]>;
  /** Residuals of a run (½Σr² = −ln L + const) and their Jacobian at θ̂, for the Gauss–Newton corrections. */
  residualsOf: (o: Observed) => number[];
  jacobian: readonly number[][];
  /** Search along the other multipliers where a probe is outside (kit readings; costs runs). */
  scanOthers?: boolean;
  /** Other points already known to lie within the range (other local optima), in log units. */
  alsoInside?: readonly number[][];
  /** Stop and report a clearly better point as soon as one is met (else it only widens the ranges). */
  stopAtBetter?: boolean;
}): Promise<RangesResult> {
  const { theta, covariance: C, lower, upper, jacobian: J, threshold } = opts;
  const p = theta.length;
  // Direction per multiplier, scaled so the quadratic approximation puts the threshold near t = 1.96.
  const dirs = theta.map((_v, j) => {
    if (C) return C.map((row) => row[j] / Math.sqrt(C[j][j]));
    return theta.map((_w, k) => (k === j ? 0.25 : 0)); // no curvature to go on: start at ±28 %
  });
  const box = (point: number[]) => point.map((v, k) => clamp(v, lower[k], upper[k]));
  const pointAt = (j: number, t: number) => box(theta.map((v, k) => v + t * dirs[j][k]));
  let better: { point: number[]; lr: number } | null = null;
  /** Every point found inside, for the ends of the ranges. */
  const inside: number[][] = [...(opts.alsoInside ?? [])];
  const lrOf = (o: Observed | null, point: number[]) => {
    if (!o) return Infinity;
    const value = 2 * (profiledNll(opts.observations, opts.valuesOf(o)) - opts.nllAt);
    if (value <= threshold) inside.push(point);
    if (value < -2 * BETTER_BY && (!better || value < better.lr)) better = { point, lr: value };
    return value;
  };
  // Along the line, the end of the box for coordinate j.
  const tLimit = (j: number, side: 1 | -1) => {
    const d = dirs[j][j] * side;
    if (Math.abs(d) < 1e-12) return Infinity;
    return ((d > 0 ? upper[j] : lower[j]) - theta[j]) / d;
  };
  const correct = (point: number[], o: Observed, j: number): number[] | null => {
    const others = point.map((_v, k) => k).filter((k) => k !== j);
    const r = opts.residualsOf(o);
    const A = others.map((a) => others.map((b) => J.reduce((s, row) => s + row[a] * row[b], 0)));
    const g = others.map((a) => J.reduce((s, row, i) => s + row[a] * r[i], 0));
    try {
      const d = (
        lusolve(
          A,
          g.map((v) => -v),
        ) as number[][]
      ).map((x) => x[0]);
      const out = [...point];
      others.forEach((k, m) => (out[k] = clamp(point[k] + d[m], lower[k], upper[k])));
      return out;
    } catch {
      return null;
    }
  };
  const probes: Probe[] = [];
  for (let j = 0; j < p; j++)
    for (const side of [1, -1] as const)
      probes.push({
        j,
        side,
        tIn: 0,
        tOut: null,
        lrIn: 0,
        lrOut: Infinity,
        open: false,
        rounds: 0,
        shift: theta.map(() => 0),
        bracketing: true,
        tFar: 0,
        lrFar: 0,
      });
  // Bracketing: outwards by ×2.5 until a probe is outside — or, with kit readings (a rippled
  // likelihood), on past it while the valley floor stays below LOOK_PAST × the threshold, since
  // the profile may dip inside again further out (another valley). Then bisection between the
  // farthest point inside and the nearest outside beyond it.
  const lookPast = opts.scanOthers ? LOOK_PAST * threshold : threshold;
  // A smooth likelihood (exact readings) is close to quadratic about the fit, so √LR is close to
  // linear along a probe's line: its steps and ends follow that, and stop once both sides are near.
  const smooth = !opts.scanOthers;
  /** Where √LR, linear in t between the farthest point inside and the nearest outside, reaches the threshold. */
  const crossing = (q: Probe) => {
    if (!Number.isFinite(q.lrOut)) return (q.tIn + q.tOut!) / 2;
    const a = Math.sqrt(Math.max(0, q.lrIn));
    const b = Math.sqrt(q.lrOut);
    const w = b > a ? (Math.sqrt(threshold) - a) / (b - a) : 0.5;
    return q.tIn + clamp(w, 0, 1) * (q.tOut! - q.tIn);
  };
  const next = (q: Probe): number | null => {
    if (q.open) return null;
    const limit = Math.abs(tLimit(q.j, q.side));
    if (q.bracketing) {
      if (q.rounds < 10 && q.tFar < limit && q.lrFar <= lookPast) {
        let t = q.tIn * 2.5;
        if (q.rounds === 0) t = 1.96 * Math.sqrt(threshold / CHI2_95_1DF);
        else if (q.tOut !== null)
          t = q.tFar * 1.6; // looking past an outside point
        else if (smooth && q.lrIn > 0.05 * threshold) t = q.tIn * clamp(1.1 * Math.sqrt(threshold / q.lrIn), 1.2, 2.5);
        return Math.min(t, limit);
      }
      q.bracketing = false;
    }
    if (q.tOut === null) return null;
    const width = q.tOut - q.tIn;
    if (q.rounds >= 20 || width < 0.04 * q.tOut) return null;
    if (!smooth) return (q.tIn + q.tOut) / 2;
    if (q.lrIn >= 0.5 * threshold && q.lrOut <= 2 * threshold) return null;
    return clamp(crossing(q), q.tIn + 0.15 * width, q.tOut - 0.15 * width);
  };
  /** Looks along every other multiplier from each probe's best point at `offsets`; keeps what is lower. */
  const scan = async (
    batch: { q: Probe }[],
    best: { point: number[]; lr: number }[],
    which: number[],
    offsets: readonly number[],
  ) => {
    const tries = which.flatMap((i) =>
      best[i].point
        .map((_v, k) => k)
        .filter((k) => k !== batch[i].q.j)
        .flatMap((k) => offsets.map((d) => ({ i, point: box(best[i].point.map((v, m) => (m === k ? v + d : v))) }))),
    );
    const runs = await opts.evaluate(tries.map((x) => x.point));
    runs.forEach((o, n) => {
      const value = lrOf(o, tries[n].point);
      if (value < best[tries[n].i].lr) best[tries[n].i] = { point: tries[n].point, lr: value };
    });
  };
  // A clearly better point ends the work: the fit moves there and its ranges are taken afresh.
  while (!(better && opts.stopAtBetter)) {
    const batch = probes.map((q) => ({ q, t: next(q) })).filter((x): x is { q: Probe; t: number } => x.t !== null);
    if (batch.length === 0) break;
    const points = batch.map(({ q, t }) =>
      box(pointAt(q.j, q.side * t).map((v, k) => (k === q.j ? v : v + q.shift[k]))),
    );
    const runs = await opts.evaluate(points);
    const best = runs.map((o, i) => ({ point: points[i], lr: lrOf(o, points[i]) }));
    // Two Gauss–Newton corrections of the other multipliers (θ̂'s Jacobian, the probe's residuals).
    let at = points;
    let last = runs;
    for (let step = 0; step < 2 && p > 1; step++) {
      const corrected = batch.map(({ q }, i) => (last[i] ? correct(at[i], last[i]!, q.j) : null));
      const again = await opts.evaluate(corrected.map((c, i) => c ?? at[i]));
      again.forEach((o, i) => {
        const value = corrected[i] ? lrOf(o, corrected[i]!) : Infinity;
        if (value < best[i].lr) best[i] = { point: corrected[i]!, lr: value };
      });
      at = corrected.map((c, i) => c ?? at[i]);
      last = again;
    }
    if (opts.scanOthers && p > 1) {
      const outside = () => best.map((b, i) => i).filter((i) => best[i].lr > threshold);
      const wide = outside().filter((i) => batch[i].q.bracketing);
      const near = outside().filter((i) => !batch[i].q.bracketing);
      await scan(batch, best, wide, COARSE);
      await scan(batch, best, near, NEAR);
      // The fine look only where it could still bring the probe inside.
      await scan(
        batch,
        best,
        outside().filter((i) => best[i].lr <= 3 * threshold),
        FINE,
      );
    }
    batch.forEach(({ q, t }, i) => {
      q.rounds++;
      const value = best[i].lr;
      const line = pointAt(q.j, q.side * t);
      if (Number.isFinite(value)) q.shift = best[i].point.map((v, k) => (k === q.j ? 0 : v - line[k]));
      if (q.bracketing) {
        q.tFar = t;
        q.lrFar = value;
      }
      if (value <= threshold) {
        if (t > q.tIn) {
          q.tIn = t;
          q.lrIn = Math.max(0, value);
          // Inside again past an outside point: the nearest outside is now beyond.
          if (q.tOut !== null && q.tOut <= t) {
            q.tOut = null;
            q.lrOut = Infinity;
          }
        }
        if (t >= Math.abs(tLimit(q.j, q.side)) - 1e-12) q.open = true;
      } else if (t > q.tIn && (q.tOut === null || t < q.tOut)) {
        q.tOut = t;
        q.lrOut = value;
      }
    });
  }
  if (better && opts.stopAtBetter) return { ranges: [], better: (better as { point: number[] }).point };
  const ranges = theta.map((v, j) => {
    const end = (side: 1 | -1) => {
      const q = probes.find((x) => x.j === j && x.side === side)!;
      if (q.open || q.tOut === null) {
        const t = q.open ? Math.abs(tLimit(j, side)) : q.tIn;
        return { at: clamp(v + side * t * dirs[j][j], lower[j], upper[j]), open: q.open || q.tOut === null };
      }
      const t = crossing(q);
      return { at: clamp(v + side * t * dirs[j][j], lower[j], upper[j]), open: false };
    };
    const hi = end(dirs[j][j] >= 0 ? 1 : -1);
    const lo = end(dirs[j][j] >= 0 ? -1 : 1);
    const low = Math.min(lo.at, ...inside.map((x) => x[j]));
    const high = Math.max(hi.at, ...inside.map((x) => x[j]));
    return { low, high, lowOpen: lo.open || low <= lower[j] + 1e-9, highOpen: hi.open || high >= upper[j] - 1e-9 };
  });
  return { ranges, better: null };
}
