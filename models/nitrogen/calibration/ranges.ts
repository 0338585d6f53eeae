/**
 * How sure the fit is: a 95 % range for each multiplier from the likelihood itself, not from
 * its quadratic approximation alone.
 *
 * The range of multiplier j is where the likelihood-ratio statistic 2(−ln L(θ) + ln L(θ̂))
 * stays below 3.84, the 95 % point of χ² with one degree of freedom (profile-likelihood
 * intervals: Venzon & Moolgavkar 1988; Raue et al. 2009 for model calibration; docs/sources.md
 * §17). The other multipliers follow the line along which the quadratic approximation says
 * they trade off with j (the column j of the covariance (JᵀJ)⁻¹), so a strong correlation
 * widens the range as it should. Along that line the statistic is bracketed and bisected on
 * free model runs: with kit readings the likelihood is flat inside the readings' intervals and
 * steep outside, which no quadratic approximation captures.
 */
import { inv, lusolve } from "mathjs";
import type { Observation } from "./likelihood";
import { negLogLikelihood } from "./likelihood";
import type { Observed } from "./observe";
import { clamp } from "./least-squares";

export const CHI2_95_1DF = 3.841;

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

type Probe = {
  j: number;
  side: 1 | -1;
  tIn: number;
  tOut: number | null;
  lrIn: number;
  lrOut: number;
  open: boolean;
  rounds: number;
};

/**
 * 95 % ranges for every fitted multiplier. `nllAt` is −ln L at θ̂ with noise τ; runs are free
 * runs (pins null) through `evaluate`.
 */
export async function likelihoodRanges(opts: {
  theta: readonly number[];
  nllAt: number;
  tau: number;
  covariance: number[][] | null;
  lower: readonly number[];
  upper: readonly number[];
  observations: readonly Observation[];
  valuesOf: (o: Observed) => number[];
  evaluate: (points: number[][]) => Promise<(Observed | null)[]>;
  /** Residuals of a run (½Σr² = −ln L + const) and their Jacobian at θ̂, for the profile correction. */
  residualsOf: (o: Observed) => number[];
  jacobian: readonly number[][];
  /** Also look along the other multipliers at each probe (for kit readings; costs runs). */
  scanOthers?: boolean;
  /** Other points already known to lie within the range (other local optima), in log units. */
  alsoInside?: readonly number[][];
}): Promise<Range[]> {
  const { theta, covariance: C, lower, upper, jacobian: J } = opts;
  const p = theta.length;
  // Direction per multiplier, scaled so the quadratic approximation puts LR = 3.84 at t = 1.96.
  const dirs = theta.map((_v, j) => {
    if (C) return C.map((row) => row[j] / Math.sqrt(C[j][j]));
    return theta.map((_w, k) => (k === j ? 0.25 : 0)); // no curvature to go on: start at ±28 %
  });
  const pointAt = (j: number, t: number) => theta.map((v, k) => clamp(v + t * dirs[j][k], lower[k], upper[k]));
  const lr = (o: Observed | null) =>
    o ? 2 * (negLogLikelihood(opts.observations, opts.valuesOf(o), opts.tau) - opts.nllAt) : Infinity;
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
      probes.push({ j, side, tIn: 0, tOut: null, lrIn: 0, lrOut: Infinity, open: false, rounds: 0 });
  const next = (q: Probe): number | null => {
    if (q.open) return null;
    if (q.tOut === null) {
      if (q.rounds >= 8) return null;
      const limit = Math.abs(tLimit(q.j, q.side));
      const t = q.rounds === 0 ? 1.96 : q.tIn * 2.5;
      return Math.min(t, limit);
    }
    if (q.rounds >= 14 || q.tOut - q.tIn < 0.02 * q.tOut) return null;
    return (q.tIn + q.tOut) / 2;
  };
  for (;;) {
    const batch = probes.map((q) => ({ q, t: next(q) })).filter((x): x is { q: Probe; t: number } => x.t !== null);
    if (batch.length === 0) break;
    const points = batch.map(({ q, t }) => pointAt(q.j, q.side * t));
    const runs = await opts.evaluate(points);
    // Two Gauss–Newton corrections of the other multipliers (θ̂'s Jacobian, the probe's residuals).
    const values = runs.map(lr);
    let at = points;
    let last = runs;
    for (let step = 0; step < 2 && p > 1; step++) {
      const corrected = batch.map(({ q }, i) => (last[i] ? correct(at[i], last[i]!, q.j) : null));
      const again = await opts.evaluate(corrected.map((c, i) => c ?? at[i]));
      again.forEach((o, i) => (values[i] = Math.min(values[i], corrected[i] ? lr(o) : Infinity)));
      at = corrected.map((c, i) => c ?? at[i]);
      last = again;
    }
    if (opts.scanOthers && p > 1) {
      // Kit readings: the likelihood is flat inside the readings' intervals, so its curvature
      // says little about where the valley runs. Look along every other multiplier as well.
      const offsets = [-0.5, -0.25, 0.25, 0.5];
      const scan = batch.flatMap(({ q }, i) =>
        at[i]
          .map((_v, k) => k)
          .filter((k) => k !== q.j)
          .flatMap((k) =>
            offsets.map((d) => ({ i, point: at[i].map((v, m) => (m === k ? clamp(v + d, lower[m], upper[m]) : v)) })),
          ),
      );
      const found = await opts.evaluate(scan.map((x) => x.point));
      found.forEach((o, n) => (values[scan[n].i] = Math.min(values[scan[n].i], lr(o))));
    }
    batch.forEach(({ q, t }, i) => {
      q.rounds++;
      const value = values[i];
      if (value <= CHI2_95_1DF) {
        q.tIn = t;
        q.lrIn = value;
        if (q.tOut === null && t >= Math.abs(tLimit(q.j, q.side)) - 1e-12) q.open = true;
      } else {
        q.tOut = t;
        q.lrOut = value;
      }
    });
  }
  return theta.map((v, j) => {
    const end = (side: 1 | -1) => {
      const q = probes.find((x) => x.j === j && x.side === side)!;
      if (q.open || q.tOut === null) {
        const t = q.open ? Math.abs(tLimit(j, side)) : q.tIn;
        return { at: clamp(v + side * t * dirs[j][j], lower[j], upper[j]), open: q.open || q.tOut === null };
      }
      // Linear in LR between the last point inside and the first outside.
      const w = Number.isFinite(q.lrOut) ? (CHI2_95_1DF - q.lrIn) / (q.lrOut - q.lrIn) : 0.5;
      const t = q.tIn + clamp(w, 0, 1) * (q.tOut - q.tIn);
      return { at: clamp(v + side * t * dirs[j][j], lower[j], upper[j]), open: false };
    };
    const hi = end(dirs[j][j] >= 0 ? 1 : -1);
    const lo = end(dirs[j][j] >= 0 ? -1 : 1);
    let low = lo.at;
    let high = hi.at;
    for (const other of opts.alsoInside ?? []) {
      low = Math.min(low, other[j]);
      high = Math.max(high, other[j]);
    }
    return { low, high, lowOpen: lo.open || low <= lower[j] + 1e-9, highOpen: hi.open || high >= upper[j] - 1e-9 };
  });
}
