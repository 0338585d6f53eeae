/**
 * Calibration: fit up to three of the model's multipliers (feed load, plant uptake, nitrifier
 * capacity) to a keeper's test-kit readings by bounded least squares.
 *
 * Method. Levenberg–Marquardt (Marquardt's scaling, diag(JᵀJ)) on the logarithms of the
 * multipliers: they act multiplicatively, so ×2 and ×0.5 are equally far from 1, and the bounds
 * 0.1–10 of the scenario schema become a symmetric box. The Jacobian is taken by forward
 * differences (one engine run per multiplier); bounds are kept by projection, and a multiplier
 * sitting on a bound with the gradient pushing outwards is held there (a small active set).
 * Linear algebra goes through mathjs (house rule: no hand-written matrix code).
 *
 * Weighting. Nitrate readings are tens of times larger than ammonia or nitrite readings, so
 * raw residuals would let nitrate decide everything. Each residual is divided by a scale for
 * its species: the root mean square of that species' readings, but never less than a typical
 * hobby test kit's resolution (KIT_RESOLUTION_MG_N). A reading a few percent off therefore
 * counts about the same whatever the species, and a species that reads "zero" throughout (TAN
 * in a cycled tank) is judged against the kit's resolution rather than against zero. Every
 * reading counts once; a species tested more often weighs more in total.
 *
 * Uncertainty. Covariance of the log-multipliers ≈ (JᵀJ)⁻¹·s², s² = Σr²/(n − p) at the
 * optimum; the standard error of a multiplier m is m·σ(ln m) (delta method) and the 95 %
 * range is m·exp(±1.96·σ). It assumes the model's shape is right and the readings' errors are
 * independent — a guide, not a guarantee.
 *
 * Pure and framework-free: the engine runs come from the caller's `predict` (the web app sends
 * them to worker threads). Imports mathjs, so — like models/units.ts — it is not re-exported
 * from models/index.ts (the browser bundle stays small).
 */
import { inv, lusolve, multiply, transpose } from "mathjs";
import type { Scenario } from "./scenario";
import { listScenarioFields, MultipliersSchema } from "./scenario";

export const MULTIPLIER_KEYS = ["feedLoad", "plantUptake", "nitrifierCapacity"] as const;
export type MultiplierKey = (typeof MULTIPLIER_KEYS)[number];

/** Bounds of every multiplier, from the scenario schema (0.1–10). */
export const MULTIPLIER_BOUNDS: { min: number; max: number } = (() => {
  const f = listScenarioFields(MultipliersSchema).find((x) => x.key === "feedLoad")!;
  return { min: f.min ?? 0.1, max: f.max ?? 10 };
})();

export const SPECIES = ["tan", "no2", "no3"] as const;
export type Species = (typeof SPECIES)[number];

/**
 * Smallest residual scale per species, mg N/L: one step of a hobby drop-test kit's colour card
 * (ammonia 0.2 mg N/L ≈ 0.25 mg/L NH3, nitrite 0.075 mg N/L ≈ 0.25 mg/L NO2, nitrate
 * 1.13 mg N/L = 5 mg/L NO3): a miss smaller than a step is within what the kit can tell.
 * Common practice, no source.
 */
const KIT_RESOLUTION_MG_N: Record<Species, number> = { tan: 0.2, no2: 0.075, no3: 1.13 };

/** A test reading on a model day, mg N/L; absent or null = not measured. */
export type CalibrationReading = { day: number; tan?: number | null; no2?: number | null; no3?: number | null };

/** Model values at the readings' days (mg N/L), in the readings' order. */
export type ModelSamples = { tan: number[]; no2: number[]; no3: number[] };

/** Residual scale per species: max(kit resolution, RMS of that species' readings), mg N/L. */
export function residualScales(readings: readonly CalibrationReading[]): Record<Species, number> {
  const out = { ...KIT_RESOLUTION_MG_N };
  for (const k of SPECIES) {
    const values = readings.map((r) => r[k]).filter((v): v is number => v != null && Number.isFinite(v));
    if (values.length === 0) continue;
    const rms = Math.sqrt(values.reduce((s, v) => s + v * v, 0) / values.length);
    out[k] = Math.max(out[k], rms);
  }
  return out;
}

/** How many residuals the readings give (one per measured species per reading). */
function countResiduals(readings: readonly CalibrationReading[]): number {
  return readings.reduce((n, r) => n + SPECIES.filter((k) => r[k] != null && Number.isFinite(r[k])).length, 0);
}

/** Weighted residuals (model − reading)/scale, in reading order then species order. NaN if the model has no value. */
function weightedResiduals(
  readings: readonly CalibrationReading[],
  model: ModelSamples,
  scales: Record<Species, number>,
): number[] {
  const out: number[] = [];
  readings.forEach((r, i) => {
    for (const k of SPECIES) {
      const measured = r[k];
      if (measured == null || !Number.isFinite(measured)) continue;
      out.push((model[k][i] - measured) / scales[k]);
    }
  });
  return out;
}

/** Root mean square of (model − reading) per species, mg N/L; null where the species was never measured. */
function rmseBySpecies(readings: readonly CalibrationReading[], model: ModelSamples): Record<Species, number | null> {
  const out = {} as Record<Species, number | null>;
  for (const k of SPECIES) {
    let sum = 0;
    let n = 0;
    readings.forEach((r, i) => {
      const measured = r[k];
      if (measured == null || !Number.isFinite(measured)) return;
      sum += (model[k][i] - measured) ** 2;
      n++;
    });
    out[k] = n ? Math.sqrt(sum / n) : null;
  }
  return out;
}

// ---------------------------------------------------------------------------------------------
// Bounded Levenberg–Marquardt (generic)

export type LeastSquaresOptions = {
  start: readonly number[];
  lower: readonly number[];
  upper: readonly number[];
  /**
   * Residual vectors at several parameter vectors (the caller may compute them in parallel).
   * Null for a point the model cannot evaluate: a trial step there is refused.
   */
  residuals: (points: number[][]) => Promise<(number[] | null)[]>;
  maxIterations?: number;
  /** Forward-difference step in parameter units (default 0.01: for log-multipliers a 1 % change, coarse enough to step over the small kinks that event timing leaves in the model output). */
  step?: number;
  onIteration?: (info: { iteration: number; cost: number; params: number[]; evaluations: number }) => void;
};

export type LeastSquaresFit = {
  params: number[];
  /** ½Σr² at the optimum. */
  cost: number;
  residuals: number[];
  /** Covariance of the parameters, (JᵀJ)⁻¹·s²; null when JᵀJ is singular or n ≤ p. */
  covariance: number[][] | null;
  atBound: boolean[];
  iterations: number;
  evaluations: number;
  converged: boolean;
};

const half = (r: readonly number[]) => 0.5 * r.reduce((s, v) => s + v * v, 0);
const clamp = (x: number, lo: number, hi: number) => Math.min(hi, Math.max(lo, x));

/** Minimises ½Σr(θ)² within [lower, upper]. Throws if the starting point cannot be evaluated. */
export async function levenbergMarquardt(opts: LeastSquaresOptions): Promise<LeastSquaresFit> {
  const p = opts.start.length;
  const maxIterations = opts.maxIterations ?? 30;
  const h = opts.step ?? 1e-2;
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
  let lambda = 1e-2;
  let converged = false;
  let iteration: number;

  const jacobianAt = async (at: number[], rAt: number[]): Promise<number[][]> => {
    const steps = at.map((v, j) => (v + h <= opts.upper[j] ? h : -h));
    const cols = await evaluate(at.map((_v, j) => at.map((x, k) => (k === j ? x + steps[j] : x))));
    // J as n × p (rows: residuals).
    return rAt.map((ri, i) =>
      cols.map((col, j) => {
        if (!col || !Number.isFinite(col[i])) throw new Error("The model could not be run near these multipliers.");
        return (col[i] - ri) / steps[j];
      }),
    );
  };

  let J = await jacobianAt(theta, r);
  for (iteration = 1; iteration <= maxIterations; iteration++) {
    const Jt = transpose(J) as number[][];
    const A = multiply(Jt, J) as number[][];
    const g = multiply(Jt, r) as number[]; // gradient of ½Σr²
    // Active set: a parameter on a bound whose descent direction (−g) points outwards stays put.
    const free = theta
      .map((v, j) => j)
      .filter((j) => !((theta[j] <= opts.lower[j] && g[j] > 0) || (theta[j] >= opts.upper[j] && g[j] < 0)));
    if (free.length === 0 || Math.max(...free.map((j) => Math.abs(g[j]))) < 1e-12) {
      converged = true;
      break;
    }
    let accepted = false;
    for (let attempt = 0; attempt < 12 && !accepted; attempt++) {
      const Af = free.map((a) => free.map((b) => A[a][b] + (a === b ? lambda * Math.max(A[a][a], 1e-12) : 0)));
      const gf = free.map((j) => -g[j]);
      let delta: number[];
      try {
        delta = (lusolve(Af, gf) as number[][]).map((row) => row[0]);
      } catch {
        lambda *= 10;
        continue;
      }
      const trial = [...theta];
      free.forEach((j, k) => (trial[j] = clamp(theta[j] + delta[k], opts.lower[j], opts.upper[j])));
      const moved = Math.max(...trial.map((v, j) => Math.abs(v - theta[j])));
      const [rt] = await evaluate([trial]);
      const trialCost = rt && rt.every(Number.isFinite) ? half(rt) : Infinity;
      if (trialCost < cost) {
        const improvement = (cost - trialCost) / Math.max(cost, 1e-300);
        theta = trial;
        r = rt!;
        cost = trialCost;
        lambda = Math.max(lambda / 3, 1e-9);
        accepted = true;
        // Engine series carry 6 significant figures: a 0.01 % step or gain is at the level of that rounding.
        if (moved < 1e-4 || improvement < 1e-4) converged = true;
      } else {
        lambda *= 4;
        if (moved < 1e-9) {
          converged = true;
          break;
        }
      }
    }
    opts.onIteration?.({ iteration, cost, params: [...theta], evaluations });
    if (!accepted || converged) {
      if (!accepted) converged = true; // no step improves: a (local) minimum to the resolution of the runs
      break;
    }
    J = await jacobianAt(theta, r);
  }

  // Covariance from the Jacobian at the optimum (recomputed if the last step moved).
  const Jend = await jacobianAt(theta, r);
  const n = r.length;
  let covariance: number[][] | null = null;
  if (n > p) {
    try {
      const s2 = (2 * cost) / (n - p);
      const JtJ = multiply(transpose(Jend), Jend) as number[][];
      covariance = (inv(JtJ) as number[][]).map((row) => row.map((v) => v * s2));
      if (covariance.some((row, j) => !Number.isFinite(row[j]) || row[j] < 0)) covariance = null;
    } catch {
      covariance = null;
    }
  }
  const atBound = theta.map((v, j) => v <= opts.lower[j] + 1e-9 || v >= opts.upper[j] - 1e-9);
  return {
    params: theta,
    cost,
    residuals: r,
    covariance,
    atBound,
    iterations: Math.min(iteration, maxIterations),
    evaluations,
    converged,
  };
}

// ---------------------------------------------------------------------------------------------
// Multipliers

type FittedMultiplier = {
  key: MultiplierKey;
  /** Fitted (or, when not fitted, the scenario's) value, ×. */
  value: number;
  start: number;
  fitted: boolean;
  /** Standard error (delta method), × ; null when it cannot be estimated. */
  standardError: number | null;
  /** Approximate 95 % range, ×. */
  low95: number | null;
  high95: number | null;
  atBound: boolean;
};

export type CalibrationResult = {
  multipliers: FittedMultiplier[];
  scales: Record<Species, number>;
  rmseBefore: Record<Species, number | null>;
  rmseAfter: Record<Species, number | null>;
  /** RMS of the weighted residuals (dimensionless; 1 ≈ one scale unit off on average). */
  weightedRmseBefore: number;
  weightedRmseAfter: number;
  modelBefore: ModelSamples;
  modelAfter: ModelSamples;
  residualCount: number;
  iterations: number;
  evaluations: number;
  converged: boolean;
};

export function withMultipliers(scenario: Scenario, values: Partial<Record<MultiplierKey, number>>): Scenario {
  return { ...scenario, multipliers: { ...scenario.multipliers, ...values } };
}

/**
 * Fits the multipliers in `fit` to `readings` (days on the scenario's timeline, mg N/L).
 * `predict` runs the engine on each scenario and returns its values at the readings' days
 * (null where the engine cannot run it).
 */
export async function calibrateMultipliers(opts: {
  scenario: Scenario;
  readings: readonly CalibrationReading[];
  fit: readonly MultiplierKey[];
  predict: (scenarios: Scenario[]) => Promise<(ModelSamples | null)[]>;
  maxIterations?: number;
  onIteration?: LeastSquaresOptions["onIteration"];
}): Promise<CalibrationResult> {
  const { scenario, readings, fit } = opts;
  if (fit.length === 0) throw new RangeError("Choose at least one multiplier to fit.");
  const n = countResiduals(readings);
  if (n <= fit.length)
    throw new RangeError(
      `Fitting ${fit.length} multipliers needs more than ${fit.length} measured values; there are ${n}.`,
    );
  const scales = residualScales(readings);
  const lo = Math.log(MULTIPLIER_BOUNDS.min);
  const hi = Math.log(MULTIPLIER_BOUNDS.max);
  const start = fit.map((k) => Math.log(clamp(scenario.multipliers[k], MULTIPLIER_BOUNDS.min, MULTIPLIER_BOUNDS.max)));
  // exp(ln 10) is 10.000000000000002: clamp, or the schema refuses a multiplier on its bound.
  const value = (t: number) => clamp(Math.exp(t), MULTIPLIER_BOUNDS.min, MULTIPLIER_BOUNDS.max);
  const at = (theta: number[]) =>
    withMultipliers(scenario, Object.fromEntries(fit.map((k, j) => [k, value(theta[j])])));

  const samplesOf = new Map<string, ModelSamples>();
  const fitResult = await levenbergMarquardt({
    start,
    lower: fit.map(() => lo),
    upper: fit.map(() => hi),
    maxIterations: opts.maxIterations,
    onIteration: opts.onIteration,
    residuals: async (points) => {
      const samples = await opts.predict(points.map(at));
      return samples.map((s, i) => {
        if (!s) return null;
        samplesOf.set(points[i].join(","), s);
        return weightedResiduals(readings, s, scales);
      });
    },
  });

  const modelBefore = samplesOf.get(start.map((v) => Math.max(lo, Math.min(hi, v))).join(","))!;
  const modelAfter = samplesOf.get(fitResult.params.join(","))!;
  const wrms = (s: ModelSamples) => {
    const w = weightedResiduals(readings, s, scales);
    return Math.sqrt(w.reduce((a, v) => a + v * v, 0) / w.length);
  };
  const multipliers: FittedMultiplier[] = MULTIPLIER_KEYS.map((key) => {
    const j = fit.indexOf(key);
    if (j < 0) {
      const value = scenario.multipliers[key];
      return {
        key,
        value,
        start: value,
        fitted: false,
        standardError: null,
        low95: null,
        high95: null,
        atBound: false,
      };
    }
    const fittedValue = value(fitResult.params[j]);
    const sigma = fitResult.covariance ? Math.sqrt(fitResult.covariance[j][j]) : null;
    return {
      key,
      value: fittedValue,
      start: value(start[j]),
      fitted: true,
      standardError: sigma === null ? null : fittedValue * sigma,
      low95: sigma === null ? null : Math.max(MULTIPLIER_BOUNDS.min, fittedValue * Math.exp(-1.96 * sigma)),
      high95: sigma === null ? null : Math.min(MULTIPLIER_BOUNDS.max, fittedValue * Math.exp(1.96 * sigma)),
      atBound: fitResult.atBound[j],
    };
  });
  return {
    multipliers,
    scales,
    rmseBefore: rmseBySpecies(readings, modelBefore),
    rmseAfter: rmseBySpecies(readings, modelAfter),
    weightedRmseBefore: wrms(modelBefore),
    weightedRmseAfter: wrms(modelAfter),
    modelBefore,
    modelAfter,
    residualCount: n,
    iterations: fitResult.iterations,
    evaluations: fitResult.evaluations,
    converged: fitResult.converged,
  };
}
