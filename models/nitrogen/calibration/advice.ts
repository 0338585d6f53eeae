/**
 * Saying plainly what the readings can and cannot tell: whether a multiplier is determined,
 * why not (no effect on what was measured, a trade-off with another multiplier, or simply a
 * wide range), and which reading would help — from the model's sensitivities: how much each
 * species moves, day by day, when a multiplier doubles, after taking out what the other
 * multipliers could mimic.
 */
import { lusolve } from "mathjs";
import type { Species } from "./kits";
import { SPECIES } from "./kits";
import type { ModelSamples, Observed } from "./observe";

export const MULTIPLIER_KEYS = ["feedLoad", "plantUptake", "nitrifierCapacity"] as const;
export type MultiplierKey = (typeof MULTIPLIER_KEYS)[number];

/** Names for sentences. */
export const MULTIPLIER_NAMES: Record<MultiplierKey, string> = {
  feedLoad: "feed load",
  plantUptake: "plant uptake",
  nitrifierCapacity: "filter capacity",
};
const SPECIES_NAMES: Record<Species, string> = { tan: "ammonia", no2: "nitrite", no3: "nitrate" };

/**
 * A multiplier counts as determined when its 95 % range lies within ×/÷ DETERMINED_FACTOR of
 * the fitted value and inside the 0.1–10 box: narrower than that, the fit tells a keeper
 * something to act on. Model choice, no source.
 */
export const DETERMINED_FACTOR = 1.5;
/** A doubling that moves no measured value by 2 % of its species' scale has no visible effect. Model choice, no source. */
export const NO_EFFECT_SHARE = 0.02;
/** Correlations beyond this (in size) mean the readings fix a combination, not each multiplier. Model choice, no source. */
export const STRONG_CORRELATION = 0.9;
/**
 * One step of a hobby kit per species, mg N/L (common practice, no source; as in
 * likelihood.ts): a reading helps where a doubling moves the value by at least this.
 */
const KIT_STEP_MG_N: Record<Species, number> = { tan: 0.2, no2: 0.075, no3: 1.13 };

/** ∂(model value)/∂(ln multiplier), by forward difference from a base run and one run per multiplier. */
export type Sensitivity = { observations: number[]; grid: ModelSamples };

export function sensitivity(
  base: Observed,
  perturbed: Observed,
  step: number,
  valuesOf: (o: Observed) => number[],
): Sensitivity {
  const d = (a: number[], b: number[]) => a.map((v, i) => (b[i] - v) / step);
  const mu0 = valuesOf(base);
  return {
    observations: d(mu0, valuesOf(perturbed)),
    grid: {
      tan: d(base.grid.tan, perturbed.grid.tan),
      no2: d(base.grid.no2, perturbed.grid.no2),
      no3: d(base.grid.no3, perturbed.grid.no3),
    },
  };
}

/** The largest change a doubling makes to a measured value, as a share of its species' scale. */
export function effectOfDoubling(s: Sensitivity, scales: readonly number[]): number {
  return Math.max(0, ...s.observations.map((v, i) => (Math.abs(v) * Math.LN2) / scales[i]));
}

/** `target` minus its least-squares projection on `others` (vectors of equal length). */
function residualised(target: number[], others: number[][]): number[] {
  if (others.length === 0) return target;
  const A = others.map((a) => others.map((b) => a.reduce((s, v, i) => s + v * b[i], 0) + (a === b ? 1e-12 : 0)));
  const rhs = others.map((a) => a.reduce((s, v, i) => s + v * target[i], 0));
  let coef: number[];
  try {
    coef = (lusolve(A, rhs) as number[][]).map((r) => r[0]);
  } catch {
    return target;
  }
  return target.map((v, i) => v - others.reduce((s, o, k) => s + coef[k] * o[i], 0));
}

const stack = (g: ModelSamples) => SPECIES.flatMap((k) => g[k].map((v) => v / KIT_STEP_MG_N[k]));

/**
 * Which species, over which days, moves most (in kit steps, per doubling) when `key` changes
 * and the other multipliers cannot mimic it; null when nothing moves by a kit step.
 */
function bestWindow(own: Sensitivity, others: Sensitivity[], t: readonly number[]) {
  const r = residualised(
    stack(own.grid),
    others.map((o) => stack(o.grid)),
  );
  const n = t.length;
  let best: { species: Species; from: number; to: number; steps: number } | null = null;
  SPECIES.forEach((species, k) => {
    const part = r.slice(k * n, (k + 1) * n).map((v) => Math.abs(v) * Math.LN2);
    const peak = Math.max(0, ...part);
    if (peak < 1 || (best && peak <= best.steps)) return;
    const days = t.filter((_d, i) => part[i] >= 0.5 * peak);
    best = { species, from: days[0], to: days[days.length - 1], steps: peak };
  });
  return best as { species: Species; from: number; to: number; steps: number } | null;
}

const dayText = (d: number) => String(Math.round(d));

/**
 * A sentence saying which reading would help tell `key`, or why none can in this run.
 * `measured` lists the species the keeper tested.
 */
export function suggestion(
  key: MultiplierKey,
  own: Sensitivity,
  others: Sensitivity[],
  t: readonly number[],
  measured: ReadonlySet<Species>,
  otherNames: readonly string[],
): string {
  const w = bestWindow(own, others, t);
  const name = MULTIPLIER_NAMES[key];
  const apart = otherNames.length ? ` apart from ${otherNames.join(" and ")}` : "";
  if (w) {
    const when =
      w.from === w.to ? `around day ${dayText(w.from)}` : `between days ${dayText(w.from)} and ${dayText(w.to)}`;
    const again = measured.has(w.species) ? "more often" : "as well";
    return `To tell ${name}${apart}, test ${SPECIES_NAMES[w.species]} ${again} ${when} of this run, where a change in ${name} shows most.`;
  }
  if (key === "nitrifierCapacity")
    return "The filter handles far more than this tank gives it, so ammonia and nitrite stay near zero whatever its capacity and no reading in this run can tell it. Test ammonia and nitrite during the first weeks of a new filter (or after a thorough cleaning) to tell filter capacity.";
  if (key === "plantUptake")
    return "The plants' share barely shows in these readings. Test nitrate every few days over several weeks while the plants grow, including just before water changes, to tell plant uptake.";
  return "Feeding barely shows in these readings. Test nitrate every few days between water changes for several weeks to tell feed load.";
}

export type Verdict = {
  determined: boolean;
  /** Why (or why not): "determined", "noEffect", "correlated", "wide", or "poorFit" (the model does not follow the readings). */
  reason: "determined" | "noEffect" | "correlated" | "wide" | "poorFit";
  correlatedWith: { key: MultiplierKey; correlation: number } | null;
};

/** The verdict for one fitted multiplier from its range, its effect and its correlations. */
export function verdictFor(opts: {
  value: number;
  low: number;
  high: number;
  lowOpen: boolean;
  highOpen: boolean;
  effect: number;
  correlations: { key: MultiplierKey; correlation: number }[];
}): Verdict {
  const strongest = [...opts.correlations].sort((a, b) => Math.abs(b.correlation) - Math.abs(a.correlation))[0] ?? null;
  const narrow =
    !opts.lowOpen &&
    !opts.highOpen &&
    opts.high <= opts.value * DETERMINED_FACTOR &&
    opts.low >= opts.value / DETERMINED_FACTOR;
  const correlatedWith = strongest && Math.abs(strongest.correlation) >= STRONG_CORRELATION ? strongest : null;
  if (narrow && opts.effect >= NO_EFFECT_SHARE) return { determined: true, reason: "determined", correlatedWith };
  if (opts.effect < NO_EFFECT_SHARE) return { determined: false, reason: "noEffect", correlatedWith };
  if (correlatedWith) return { determined: false, reason: "correlated", correlatedWith };
  return { determined: false, reason: "wide", correlatedWith: null };
}
