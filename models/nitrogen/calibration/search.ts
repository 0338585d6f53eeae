/**
 * Finding the best multipliers, robustly.
 *
 * 1. A coarse global stage: the likelihood at the starting multipliers and at a spread of
 *    points (a Halton sequence over ×0.2–×5 in every fitted multiplier) — a local search from
 *    one point stops in whatever valley it starts in (Nocedal & Wright §2.1: these methods find
 *    local minima only; docs/sources.md §17).
 * 2. Local fits (least-squares.ts) from the start and the best distinct points of that stage.
 *    During a local fit the "when full" trims are pinned to the days a free run at the fit's
 *    start put them, so a trim never crosses a reading's time between two nearby trial points
 *    and the readings' model values stay smooth in the multipliers. After the fit the trims are
 *    re-pinned from a free run at the result, and the fit repeats until the pinned and free
 *    trim days (and the noise level) agree: at that point the pinned run is the free run.
 * 3. A neighbourhood check before a result is called converged: the free model a little way
 *    along every axis, and near and far along the valley floor (the weakest direction of JᵀJ);
 *    a lower point there restarts the local fit from it.
 */
import { eigs } from "mathjs";
import type { Observed } from "./observe";
import type { Observation } from "./likelihood";
import { negLogLikelihood, noiseLevel, pseudoResiduals } from "./likelihood";
import { clamp, levenbergMarquardt, type LeastSquaresFit } from "./least-squares";

/** Pinned trim days per plant group (see SimulateOptions.pinnedTrimDays). */
export type Pins = number[][];

/** Model runs: free (pins null) or with the given trims pinned, at points in log-multiplier space. */
type Evaluate = (points: number[][], pins: Pins | null) => Promise<(Observed | null)[]>;

export type SearchContext = {
  observations: readonly Observation[];
  /** The model values of the observations in a run. */
  valuesOf: (o: Observed) => number[];
  evaluate: Evaluate;
  start: number[];
  lower: number[];
  upper: number[];
  maxIterations: number;
  /** More starting points for local fits (better points the ranges met), in log units. */
  extraStarts?: readonly number[][];
  onProgress?: (stage: string) => void;
};

export type LocalResult = {
  theta: number[];
  /** Free run at theta. */
  observed: Observed;
  pins: Pins;
  tau: number;
  /** −ln L at theta with tau. */
  nll: number;
  fit: LeastSquaresFit;
  converged: boolean;
};

/** Ranking of points with different noise: −ln L with τ at its own best for each point. */
function profileNll(ctx: SearchContext, o: Observed): number {
  const mu = ctx.valuesOf(o);
  return negLogLikelihood(ctx.observations, mu, noiseLevel(ctx.observations, mu, 0));
}

function halton(index: number, base: number): number {
  let f = 1;
  let r = 0;
  for (let i = index; i > 0; i = Math.floor(i / base)) {
    f /= base;
    r += f * (i % base);
  }
  return r;
}

/** The global stage's points: 4 + 4p Halton points over ln(0.2)–ln(5) in each coordinate. */
function designPoints(p: number, lower: readonly number[], upper: readonly number[]): number[][] {
  const bases = [2, 3, 5, 7];
  const a = Math.log(0.2);
  const b = Math.log(5);
  return Array.from({ length: 4 + 4 * p }, (_v, k) =>
    Array.from({ length: p }, (_w, j) => clamp(a + (b - a) * halton(k + 1, bases[j]), lower[j], upper[j])),
  );
}

async function freeRun(ctx: SearchContext, theta: number[]): Promise<Observed> {
  const [o] = await ctx.evaluate([theta], null);
  if (!o) throw new Error("The model could not be run at these multipliers.");
  return o;
}

/**
 * A local fit from `start`. Trial points are judged on free runs (the real model); the
 * Jacobian is taken with the trims pinned where the free run at that point put them, so a
 * difference step never moves a trim across a reading. Repeats while the noise level moves.
 */
async function localFit(ctx: SearchContext, start: number[]): Promise<LocalResult> {
  const p = start.length;
  let theta = start;
  let observed = await freeRun(ctx, theta);
  let tau = noiseLevel(ctx.observations, ctx.valuesOf(observed), p);
  let fit: LeastSquaresFit | null = null;
  let agreed = false;
  const seen = new Map<string, Observed>();
  for (let round = 0; round < 4 && !agreed; round++) {
    const usedTau = tau;
    const residualsOf = (o: Observed | null) =>
      o ? pseudoResiduals(ctx.observations, ctx.valuesOf(o), usedTau) : null;
    fit = await levenbergMarquardt({
      start: theta,
      lower: ctx.lower,
      upper: ctx.upper,
      maxIterations: ctx.maxIterations,
      residuals: async (points) => {
        const runs = await ctx.evaluate(points, null);
        runs.forEach((o, i) => o && seen.set(points[i].join(","), o));
        return runs.map(residualsOf);
      },
      differences: async (at, steps) => {
        const pins = (seen.get(at.join(",")) ?? (await freeRun(ctx, at))).trimDays;
        const runs = await ctx.evaluate(
          at.map((_v, j) => at.map((x, k) => (k === j ? x + steps[j] : x))),
          pins,
        );
        return runs.map(residualsOf);
      },
    });
    theta = fit.params;
    observed = await freeRun(ctx, theta);
    tau = noiseLevel(ctx.observations, ctx.valuesOf(observed), p);
    agreed = Math.abs(Math.log(tau / usedTau)) < 0.1;
  }
  const nll = negLogLikelihood(ctx.observations, ctx.valuesOf(observed), tau);
  return { theta, observed, pins: observed.trimDays, tau, nll, fit: fit!, converged: agreed && fit!.converged };
}

/** Points around theta: ±0.05 on each axis, ±0.15, ±0.35 and ±0.7 along the valley floor (ln units). */
function neighbours(ctx: SearchContext, best: LocalResult): number[][] {
  const { theta, fit } = best;
  const p = theta.length;
  const out: number[][] = [];
  const push = (dir: number[], size: number) => {
    for (const s of [size, -size]) out.push(theta.map((v, j) => clamp(v + s * dir[j], ctx.lower[j], ctx.upper[j])));
  };
  for (let j = 0; j < p; j++)
    push(
      theta.map((_v, k) => (k === j ? 1 : 0)),
      0.05,
    );
  if (p > 1) {
    const J = fit.jacobian;
    const A = theta.map((_a, a) => theta.map((_b, b) => J.reduce((s, row) => s + row[a] * row[b], 0)));
    try {
      const { eigenvectors } = eigs(A);
      const weakest = [...eigenvectors].sort((x, y) => Math.abs(Number(x.value)) - Math.abs(Number(y.value)))[0];
      const v = (weakest.vector as unknown as number[]).map(Number);
      const norm = Math.hypot(...v);
      if (norm > 0)
        for (const size of [0.15, 0.35, 0.7])
          push(
            v.map((x) => x / norm),
            size,
          );
    } catch {
      // A degenerate JᵀJ: the axis points still check the neighbourhood.
    }
  }
  return out;
}

/** A point of the neighbourhood that beats `best` by more than a likelihood ratio of e^0.5, or null. */
async function betterNeighbour(ctx: SearchContext, best: LocalResult): Promise<number[] | null> {
  const points = neighbours(ctx, best);
  const runs = await ctx.evaluate(points, null);
  let found: number[] | null = null;
  let lowest = best.nll - 0.5;
  runs.forEach((o, i) => {
    if (!o) return;
    const nll = negLogLikelihood(ctx.observations, ctx.valuesOf(o), best.tau);
    if (nll < lowest) {
      lowest = nll;
      found = points[i];
    }
  });
  return found;
}

const distance = (a: number[], b: number[]) => Math.max(...a.map((v, j) => Math.abs(v - b[j])));

/** The whole search: global stage, local fits, neighbourhood check. */
export async function robustSearch(
  ctx: SearchContext,
): Promise<LocalResult & { localFits: number; visited: { theta: number[]; observed: Observed }[] }> {
  const p = ctx.start.length;
  ctx.onProgress?.("global");
  const design = designPoints(p, ctx.lower, ctx.upper);
  const runs = await ctx.evaluate(design, null);
  const visited: { theta: number[]; observed: Observed }[] = [];
  runs.forEach((o, i) => o && visited.push({ theta: design[i], observed: o }));
  const ranked = design
    .map((point, i) => ({ point, cost: runs[i] ? profileNll(ctx, runs[i]!) : Infinity }))
    .filter((x) => Number.isFinite(x.cost))
    .sort((a, b) => a.cost - b.cost);
  const starts: number[][] = [ctx.start, ...(ctx.extraStarts ?? [])];
  const limit = starts.length + 2;
  for (const { point } of ranked) {
    if (starts.length >= limit) break;
    if (starts.every((s) => distance(s, point) > 0.4)) starts.push(point);
  }
  let best: LocalResult | null = null;
  let localFits = 0;
  for (const s of starts) {
    ctx.onProgress?.("local");
    const r = await localFit(ctx, s).catch(() => null);
    localFits++;
    if (r) visited.push({ theta: r.theta, observed: r.observed });
    if (r && (!best || profileNll(ctx, r.observed) < profileNll(ctx, best.observed))) best = r;
  }
  if (!best) throw new Error("The model could not be run at the starting multipliers.");
  let checked = false;
  for (let k = 0; k < 3 && !checked; k++) {
    ctx.onProgress?.("neighbourhood");
    const better = await betterNeighbour(ctx, best);
    if (!better) {
      checked = true;
      break;
    }
    const r = await localFit(ctx, better);
    localFits++;
    visited.push({ theta: r.theta, observed: r.observed });
    if (profileNll(ctx, r.observed) < profileNll(ctx, best.observed)) best = r;
  }
  return { ...best, converged: best.converged && checked, localFits, visited };
}
