/**
 * Bounded Levenberg–Marquardt: minimises ½Σr(θ)² within a box.
 *
 * Marquardt's scaling (the damping term λ·diag(JᵀJ)) and the trust-region view of the damping
 * (Moré 1978, "The Levenberg–Marquardt algorithm: implementation and theory"; Nocedal & Wright,
 * Numerical Optimization, 2nd ed., §10.3; docs/sources.md §17): a step is accepted when the
 * actual reduction of the cost is a fair share of the reduction the linear model predicted, and
 * λ shrinks or grows with that ratio (Nielsen's update). Bounds are kept by projection; a
 * parameter on a bound whose descent points outwards is held there (a small active set). The
 * Jacobian is taken by forward differences. Linear algebra through mathjs.
 *
 * Stopping: only on evidence of a stationary point — the residuals orthogonal to every free
 * column of J (MINPACK's gtol test), a step too small to matter, or no decrease for a step as
 * small as the model's own resolution — never on a merely small gain, which in a narrow curved
 * valley says nothing about being at the bottom.
 */
import { lusolve, multiply, transpose } from "mathjs";

export type LeastSquaresOptions = {
  start: readonly number[];
  lower: readonly number[];
  upper: readonly number[];
  /** Residual vectors at several points (the caller may compute them in parallel); null where the model cannot run. */
  residuals: (points: number[][]) => Promise<(number[] | null)[]>;
  maxIterations?: number;
  /** Forward-difference step in parameter units (default 1e-3: for log-multipliers a 0.1 % change). */
  step?: number;
  /**
   * Columns of ∂r/∂θ at `at` for the given steps (each step[j] along axis j), when the caller
   * differentiates a smoother stand-in of the residuals than the one it evaluates (see search.ts).
   * Default: forward differences of `residuals`.
   */
  differences?: (at: number[], steps: number[]) => Promise<(number[] | null)[]>;
};

export type LeastSquaresFit = {
  params: number[];
  /** ½Σr² at the end. */
  cost: number;
  residuals: number[];
  /** ∂r/∂θ at the end, n × p. */
  jacobian: number[][];
  atBound: boolean[];
  iterations: number;
  evaluations: number;
  /** Whether it stopped at a stationary point (not at its iteration limit). */
  converged: boolean;
};

const half = (r: readonly number[]) => 0.5 * r.reduce((s, v) => s + v * v, 0);
export const clamp = (x: number, lo: number, hi: number) => Math.min(hi, Math.max(lo, x));

/** Smallest step worth taking, in parameter units (for log-multipliers 1e-7 is a 0.00001 % change). */
const X_TOL = 1e-7;
/** Residuals this close to orthogonal to every free column of J: a stationary point. */
const G_TOL = 1e-9;

export async function levenbergMarquardt(opts: LeastSquaresOptions): Promise<LeastSquaresFit> {
  const maxIterations = opts.maxIterations ?? 40;
  const h = opts.step ?? 1e-3;
  let evaluations = 0;
  const evaluate = async (points: number[][]) => {
    evaluations += points.length;
    return opts.residuals(points);
  };
  let theta = opts.start.map((v, j) => clamp(v, opts.lower[j], opts.upper[j]));
  const [r0] = await evaluate([theta]);
  if (!r0 || r0.some((v) => !Number.isFinite(v)))
    throw new Error("The model could not be run at the starting multipliers.");
  let r = r0;
  let cost = half(r);

  const jacobianAt = async (at: number[], rAt: number[]): Promise<number[][]> => {
    const steps = at.map((v, j) => (v + h <= opts.upper[j] ? h : -h));
    const cols = opts.differences
      ? await opts.differences(at, steps).finally(() => (evaluations += steps.length))
      : await evaluate(at.map((_v, j) => at.map((x, k) => (k === j ? x + steps[j] : x))));
    return rAt.map((ri, i) =>
      cols.map((col, j) => {
        if (!col || !Number.isFinite(col[i])) throw new Error("The model could not be run near these multipliers.");
        return (col[i] - ri) / steps[j];
      }),
    );
  };

  let J = await jacobianAt(theta, r);
  let lambda = 1e-3;
  let nu = 2;
  let converged = false;
  let iteration = 0;
  while (iteration < maxIterations && !converged) {
    iteration++;
    const A = multiply(transpose(J), J) as number[][];
    const g = multiply(transpose(J), r) as number[];
    const free = theta
      .map((_v, j) => j)
      .filter((j) => !((theta[j] <= opts.lower[j] && g[j] > 0) || (theta[j] >= opts.upper[j] && g[j] < 0)));
    const norm = Math.sqrt(2 * cost);
    const orthogonal = free.every((j) => Math.abs(g[j]) <= G_TOL * Math.max(norm * Math.sqrt(A[j][j]), 1e-300));
    if (free.length === 0 || cost < 1e-24 || orthogonal) {
      converged = true;
      break;
    }
    let accepted = false;
    while (!accepted) {
      const Af = free.map((a) => free.map((b) => A[a][b] + (a === b ? lambda * Math.max(A[a][a], 1e-12) : 0)));
      let delta: number[];
      try {
        delta = (
          lusolve(
            Af,
            free.map((j) => -g[j]),
          ) as number[][]
        ).map((row) => row[0]);
      } catch {
        lambda *= nu;
        nu *= 2;
        continue;
      }
      const trial = [...theta];
      free.forEach((j, k) => (trial[j] = clamp(theta[j] + delta[k], opts.lower[j], opts.upper[j])));
      const d = trial.map((v, j) => v - theta[j]);
      const moved = Math.max(...d.map(Math.abs));
      if (moved < X_TOL) {
        converged = true; // no step the model can resolve lowers the cost
        break;
      }
      const Ad = multiply(A, d) as number[];
      const predicted = -(d.reduce((s, v, j) => s + v * g[j], 0) + 0.5 * d.reduce((s, v, j) => s + v * Ad[j], 0));
      const [rt] = await evaluate([trial]);
      const trialCost = rt && rt.every(Number.isFinite) ? half(rt) : Infinity;
      const actual = cost - trialCost;
      if (actual > 0 && predicted > 0) {
        const rho = actual / predicted;
        theta = trial;
        r = rt!;
        cost = trialCost;
        lambda *= Math.max(1 / 3, 1 - (2 * rho - 1) ** 3);
        nu = 2;
        accepted = true;
        if (moved < 10 * X_TOL) converged = true;
      } else {
        lambda *= nu;
        nu *= 2;
        if (lambda > 1e16) {
          converged = true;
          break;
        }
      }
    }
    if (accepted) J = await jacobianAt(theta, r);
  }
  const atBound = theta.map((v, j) => v <= opts.lower[j] + 1e-9 || v >= opts.upper[j] - 1e-9);
  return { params: theta, cost, residuals: r, jacobian: J, atBound, iterations: iteration, evaluations, converged };
}
