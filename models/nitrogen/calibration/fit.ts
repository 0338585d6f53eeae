/**
 * calibrateMultipliers(): fit some of the model's multipliers to a keeper's readings and say
 * honestly what the readings determine. The search works on ln(multiplier) (they act
 * multiplicatively: ×2 and ×0.5 are equally far from 1; the schema's 0.1–10 becomes a
 * symmetric box). Engine runs come from the caller's `predict` (the web app sends them to
 * worker threads); each distinct run is asked for once.
 */
import type { Scenario } from "../scenario";
import type { MultiplierKey, Sensitivity, Verdict } from "./advice";
import { effectOfDoubling, MULTIPLIER_KEYS, MULTIPLIER_NAMES, sensitivity, suggestion, verdictFor } from "./advice";
import type { Kit, Kits, Species } from "./kits";
import { inferKit, readingInterval, SPECIES } from "./kits";
import type { CalibrationReading, Observation } from "./likelihood";
import { observationsOf, pseudoResiduals, residualScales, scaledMisses } from "./likelihood";
import { clamp } from "./least-squares";
import type { ModelSamples, Observed } from "./observe";
import type { Range } from "./ranges";
import { BETTER_BY, correlationOf, covarianceOf, likelihoodRanges, profiledNll } from "./ranges";
import { rangeThreshold } from "./threshold";
import type { Pins } from "./search";
import { robustSearch } from "./search";
import { MULTIPLIER_BOUNDS, withMultipliers } from "./multipliers";
import type { FitQuality } from "./fit-quality";
import { fitQuality, qualityText } from "./fit-quality";

/** One engine run to make: a scenario, with "when full" trims pinned or not. */
export type ObserveRequest = { scenario: Scenario; pinnedTrimDays: Pins | null };
export type Predict = (requests: ObserveRequest[]) => Promise<(Observed | null)[]>;

type FittedMultiplier = {
  key: MultiplierKey;
  /** Fitted (or, when not fitted, the scenario's) value, ×. */
  value: number;
  start: number;
  fitted: boolean;
  /** 95 % range (likelihood ratio), ×; null when not fitted. */
  low95: number | null;
  high95: number | null;
  /** Whether the range runs into the 0.1–10 box on that side (the readings do not bound it there). */
  lowOpen: boolean;
  highOpen: boolean;
  /** The fitted value sits on the box. */
  atBound: boolean;
  /** Largest change a doubling makes to a measured value, as a share of its species' scale. */
  effect: number | null;
  verdict: Verdict | null;
  /** Which reading would help; null when determined, not fitted, or no good fit (then see qualityText). */
  suggestion: string | null;
};

export type CalibrationResult = {
  multipliers: FittedMultiplier[];
  /** The kit each measured species was read with, and whether it was inferred from the values. */
  kits: { species: Species; kit: Kit; inferred: boolean }[];
  scales: Record<Species, number>;
  /** Noise level τ: the readings' error as a share of each species' scale. */
  noiseLevel: number;
  rmseBefore: Record<Species, number | null>;
  rmseAfter: Record<Species, number | null>;
  /** RMS of how far the model is outside each reading's interval, on the species' scales. */
  weightedRmseBefore: number;
  weightedRmseAfter: number;
  modelBefore: ModelSamples;
  modelAfter: ModelSamples;
  residualCount: number;
  evaluations: number;
  localFits: number;
  /** A stationary point whose neighbourhood holds nothing better. */
  converged: boolean;
  /** Whether the fitted model follows the readings at all (fit-quality.ts); when not, nothing is called determined. */
  quality: FitQuality;
  /** What a poor fit means and what to check; null for a good fit. */
  qualityText: string | null;
};

export type CalibrateOptions = {
  scenario: Scenario;
  readings: readonly CalibrationReading[];
  fit: readonly MultiplierKey[];
  /** How each species was tested; missing species are inferred from their values. */
  kits?: Kits;
  /** Unit id each species is shown in (for inferring kits), e.g. { no3: "asNO3" }. */
  preferredUnits?: Partial<Record<Species, string>>;
  predict: Predict;
  /** Iterations of each local fit at most (default 40). */
  maxIterations?: number;
  onProgress?: (info: { stage: string; runs: number }) => void;
};

/** How many times the fit may move to a better point the ranges met. Model choice, no source. */
const MAX_MOVES = 2;

/** Forward-difference step in ln(multiplier) for sensitivities (as the local fits use). */
const STEP = 1e-3;

function rmseBySpecies(readings: readonly CalibrationReading[], model: ModelSamples): Record<Species, number | null> {
  const out = {} as Record<Species, number | null>;
  for (const k of SPECIES) {
    let sum = 0;
    let n = 0;
    readings.forEach((r, i) => {
      const m = r[k];
      if (m == null || !Number.isFinite(m)) return;
      sum += (model[k][i] - m) ** 2;
      n++;
    });
    out[k] = n ? Math.sqrt(sum / n) : null;
  }
  return out;
}

/** The kits to read each measured species with: the caller's, else inferred from the values. */
export function kitsFor(
  readings: readonly CalibrationReading[],
  kits: Kits = {},
  preferredUnits: Partial<Record<Species, string>> = {},
): { species: Species; kit: Kit; inferred: boolean }[] {
  return SPECIES.flatMap((species) => {
    const values = readings.map((r) => r[species]).filter((v): v is number => v != null && Number.isFinite(v));
    if (values.length === 0) return [];
    const given = kits[species];
    return [{ species, kit: given ?? inferKit(species, values, preferredUnits[species]), inferred: !given }];
  });
}

export async function calibrateMultipliers(opts: CalibrateOptions): Promise<CalibrationResult> {
  const { scenario, readings, fit } = opts;
  if (fit.length === 0) throw new RangeError("Choose at least one multiplier to fit.");
  const kits = kitsFor(readings, opts.kits, opts.preferredUnits);
  const kitOf = Object.fromEntries(kits.map((k) => [k.species, k.kit])) as Record<Species, Kit>;
  const scales = residualScales(readings);
  const observations: Observation[] = observationsOf(readings, (s, v) => ({
    ...readingInterval(s, v, kitOf[s]),
    colour: kitOf[s].kind === "card",
  }));
  const n = observations.length;
  if (n <= fit.length)
    throw new RangeError(
      `Fitting ${fit.length} multipliers needs more than ${fit.length} measured values; there are ${n}.`,
    );
  const lo = Math.log(MULTIPLIER_BOUNDS.min);
  const hi = Math.log(MULTIPLIER_BOUNDS.max);
  const lower = fit.map(() => lo);
  const upper = fit.map(() => hi);
  const start = fit.map((k) => Math.log(clamp(scenario.multipliers[k], MULTIPLIER_BOUNDS.min, MULTIPLIER_BOUNDS.max)));
  // exp(ln 10) is 10.000000000000002: clamp, or the schema refuses a multiplier on its bound.
  const value = (t: number) => clamp(Math.exp(t), MULTIPLIER_BOUNDS.min, MULTIPLIER_BOUNDS.max);
  const scenarioAt = (theta: number[]) =>
    withMultipliers(scenario, Object.fromEntries(fit.map((k, j) => [k, value(theta[j])])));
  const valuesOf = (o: Observed) => observations.map((ob) => o.samples[ob.species][ob.reading]);

  // Every distinct run once: the same point with the same pins gives the same answer.
  const cache = new Map<string, Promise<Observed | null>>();
  /** Every free run made, by point: the ranges take in any the likelihood ratio allows. */
  const freeRuns: { theta: number[]; observed: Promise<Observed | null> }[] = [];
  let evaluations = 0;
  const evaluate = async (points: number[][], pins: Pins | null) => {
    const keys = points.map((p) => `${p.join(",")}|${pins ? JSON.stringify(pins) : "free"}`);
    const missing = keys.map((k, i) => ({ k, i })).filter(({ k }) => !cache.has(k));
    if (missing.length) {
      evaluations += missing.length;
      const answers = opts.predict(missing.map(({ i }) => ({ scenario: scenarioAt(points[i]), pinnedTrimDays: pins })));
      missing.forEach(({ k, i }, m) => {
        const observed = answers.then((a) => a[m]);
        cache.set(k, observed);
        if (!pins) freeRuns.push({ theta: points[i], observed });
      });
      opts.onProgress?.({ stage: "runs", runs: evaluations });
    }
    return Promise.all(keys.map((k) => cache.get(k)!));
  };

  const [before] = await evaluate([start], null);
  if (!before) throw new Error("The model could not be run at the starting multipliers.");
  const threshold = rangeThreshold(n, fit.length);
  const search = (extraStarts: number[][]) =>
    robustSearch({
      observations,
      valuesOf,
      evaluate,
      start,
      lower,
      upper,
      extraStarts,
      maxIterations: opts.maxIterations ?? 40,
      onProgress: (stage) => opts.onProgress?.({ stage, runs: evaluations }),
    });
  const profiled = (o: Observed) => profiledNll(observations, valuesOf(o));
  /** Every free run made so far with its profiled −ln L: the ranges take in any the threshold allows. */
  const freeRunsScored = async () => {
    const runs = await Promise.all(freeRuns.map((f) => f.observed));
    return freeRuns.flatMap((f, i) => (runs[i] ? [{ theta: f.theta, nll: profiled(runs[i]!) }] : []));
  };
  const extraStarts: number[][] = [];
  let best = await search(extraStarts);
  let ranges: Range[] = [];
  // The ranges explore the likelihood further than the search did; when they meet a clearly
  // better point (another valley), the fit moves there and its ranges are taken again.
  for (let attempt = 0; ; attempt++) {
    opts.onProgress?.({ stage: "ranges", runs: evaluations });
    const nllAt = profiled(best.observed);
    const met = await freeRunsScored();
    const lowest = met.reduce((a, b) => (b.nll < a.nll ? b : a), { theta: best.theta, nll: nllAt });
    if (lowest.nll < nllAt - BETTER_BY && attempt < MAX_MOVES) {
      extraStarts.push(lowest.theta);
      best = await search(extraStarts);
      continue;
    }
    const found = await likelihoodRanges({
      theta: best.theta,
      nllAt,
      threshold,
      alsoInside: met.filter((m) => 2 * (m.nll - nllAt) <= threshold).map((m) => m.theta),
      scanOthers: observations.some((o) => o.lo !== o.hi),
      jacobian: best.fit.jacobian,
      residualsOf: (o) => pseudoResiduals(observations, valuesOf(o), best.tau),
      covariance: covarianceOf(best.fit.jacobian, fit.length),
      lower,
      upper,
      observations,
      valuesOf,
      evaluate: (points) => evaluate(points, null),
      stopAtBetter: attempt < MAX_MOVES,
    });
    if (!found.better) {
      ranges = found.ranges;
      break;
    }
    extraStarts.push(found.better);
    best = await search(extraStarts);
  }
  const theta = best.theta;
  const covariance = covarianceOf(best.fit.jacobian, fit.length);
  // Sensitivities at the fit (pinned like the local fit's own Jacobian, so these runs are cached).
  const steps = theta.map((v, j) => (v + STEP <= upper[j] ? STEP : -STEP));
  const perturbed = await evaluate(
    theta.map((_v, j) => theta.map((x, k) => (k === j ? x + steps[j] : x))),
    best.pins,
  );
  const sens: Sensitivity[] = perturbed.map((o, j) =>
    sensitivity(best.observed, o ?? best.observed, steps[j], valuesOf),
  );
  const correlation = covariance ? correlationOf(covariance) : null;
  const measured = new Set(kits.map((k) => k.species));
  const quality = fitQuality(observations, valuesOf(best.observed), (i) => readings[i].day, best.tau);
  const obsScales = observations.map((o) => o.scale);

  const multipliers: FittedMultiplier[] = MULTIPLIER_KEYS.map((key) => {
    const j = fit.indexOf(key);
    if (j < 0) {
      const v = scenario.multipliers[key];
      const none = { low95: null, high95: null, lowOpen: false, highOpen: false, atBound: false };
      return { key, value: v, start: v, fitted: false, ...none, effect: null, verdict: null, suggestion: null };
    }
    const r = ranges[j];
    const effect = effectOfDoubling(sens[j], obsScales);
    const correlations = fit
      .map((k, m) => ({ key: k, correlation: correlation ? correlation[j][m] : 0 }))
      .filter((c) => c.key !== key);
    const fittedValue = value(theta[j]);
    const verdict: Verdict = !quality.good
      ? { determined: false, reason: "poorFit", correlatedWith: null }
      : verdictFor({
          value: fittedValue,
          low: value(r.low),
          high: value(r.high),
          lowOpen: r.lowOpen,
          highOpen: r.highOpen,
          effect,
          correlations,
        });
    const others = fit.filter((k) => k !== key);
    return {
      key,
      value: fittedValue,
      start: value(start[j]),
      fitted: true,
      // With no good fit the likelihood's curvature says nothing about the truth: the range is the whole box, open.
      ...(quality.good
        ? { low95: value(r.low), high95: value(r.high), lowOpen: r.lowOpen, highOpen: r.highOpen }
        : { low95: MULTIPLIER_BOUNDS.min, high95: MULTIPLIER_BOUNDS.max, lowOpen: true, highOpen: true }),
      atBound: best.fit.atBound[j],
      effect,
      verdict,
      suggestion: verdict.determined
        ? null
        : !quality.good
          ? null // the result's qualityText says what to check, once for all
          : suggestion(
              key,
              sens[j],
              sens.filter((_s, m) => m !== j),
              best.observed.grid.t,
              measured,
              others.map((k) => MULTIPLIER_NAMES[k]),
            ),
    };
  });
  const wrms = (o: Observed) => {
    const m = scaledMisses(observations, valuesOf(o));
    return Math.sqrt(m.reduce((a, v) => a + v * v, 0) / m.length);
  };
  return {
    multipliers,
    kits,
    scales,
    noiseLevel: best.tau,
    rmseBefore: rmseBySpecies(readings, before.samples),
    rmseAfter: rmseBySpecies(readings, best.observed.samples),
    weightedRmseBefore: wrms(before),
    weightedRmseAfter: wrms(best.observed),
    modelBefore: before.samples,
    modelAfter: best.observed.samples,
    residualCount: n,
    evaluations,
    localFits: best.localFits,
    converged: best.converged,
    quality,
    qualityText: qualityText(quality),
  };
}
