/**
 * Whether the fitted model follows the readings at all. Ranges and verdicts assume it does: the
 * model's shape is right and what is left is independent reading error. When the readings jump
 * (an event the model was not told of), sit far above or below anything the model can make, or
 * were typed in another unit, the best fit is still *a* fit, and its ranges would claim a
 * precision the readings do not support. Two checks, either one enough:
 *
 * - **Scatter**: the noise level τ (the readings' error beyond their kits' rounding, as a share of
 *   each species' level) is above POOR_NOISE — the model misses readings by a large share of what
 *   was measured.
 * - **Systematic misses**: the model stays on one side of a species' readings for long stretches.
 *   Independent errors fall on either side in no order; too few runs of one sign in time order
 *   is the runs test's sign of lack of fit (Wald & Wolfowitz 1940; Draper & Smith, Applied
 *   Regression Analysis, 3rd ed. 1998, §7.1; docs/sources.md §17).
 */
import type { Species } from "./kits";
import { SPECIES } from "./kits";
import type { Observation } from "./likelihood";

/**
 * Noise level above which the fit is called poor: the model misses readings by more than a
 * quarter of their level beyond the kits' rounding — more than a careful keeper's test errs.
 * Model choice, no source.
 */
const POOR_NOISE = 0.25;

/** The runs test's one-sided level: z below this (p < 0.001) is a systematic miss. */
const RUNS_Z = -3.09;

/**
 * A miss smaller than this share of the species' scale has no sign (the model's own floor of
 * accuracy, as TAU_MIN in likelihood.ts): exact readings the model meets leave no runs to count.
 */
const SIGN_FLOOR = 0.01;

/** Fewest signed misses of a species for its runs test (below this, p < 0.001 is out of reach). */
const MIN_SIGNED = 11;

export type FitQuality =
  | { good: true }
  | { good: false; reason: "scatter"; noiseLevel: number }
  | {
      good: false;
      reason: "systematic";
      species: Species;
      /** The longest stretch on one side, days of the run, and which side the readings are on. */
      from: number;
      to: number;
      readingsAbove: boolean;
    };

/** Wald–Wolfowitz runs test z for a sequence of signs (±1); −Infinity when all share one sign. */
export function runsZ(signs: readonly number[]): number {
  const n1 = signs.filter((s) => s > 0).length;
  const n2 = signs.length - n1;
  const n = signs.length;
  if (n1 === 0 || n2 === 0) return -Infinity;
  const runs = 1 + signs.slice(1).filter((s, i) => s !== signs[i]).length;
  const mean = (2 * n1 * n2) / n + 1;
  const variance = (2 * n1 * n2 * (2 * n1 * n2 - n)) / (n * n * (n - 1));
  return variance > 0 ? (runs - mean) / Math.sqrt(variance) : 0;
}

/**
 * The fit's quality from its model values `mu` (observation order), the readings' days and the
 * noise level it settled on.
 */
export function fitQuality(
  observations: readonly Observation[],
  mu: readonly number[],
  dayOf: (reading: number) => number,
  noiseLevel: number,
): FitQuality {
  for (const species of SPECIES) {
    const signed = observations
      .map((o, i) => {
        const miss = mu[i] < o.lo ? o.lo - mu[i] : mu[i] > o.hi ? -(mu[i] - o.hi) : 0;
        return { day: dayOf(o.reading), sign: Math.sign(miss), size: Math.abs(miss) / o.scale, species: o.species };
      })
      .filter((m) => m.species === species && m.size > SIGN_FLOOR)
      .sort((a, b) => a.day - b.day);
    if (signed.length < MIN_SIGNED) continue;
    const z = runsZ(signed.map((m) => m.sign));
    if (z >= RUNS_Z) continue;
    // The longest run, to say where the model and the readings part.
    let best = { from: 0, to: 0 };
    let start = 0;
    for (let k = 1; k <= signed.length; k++) {
      if (k === signed.length || signed[k].sign !== signed[start].sign) {
        if (k - 1 - start >= best.to - best.from) best = { from: start, to: k - 1 };
        start = k;
      }
    }
    return {
      good: false,
      reason: "systematic",
      species,
      from: signed[best.from].day,
      to: signed[best.to].day,
      readingsAbove: signed[best.from].sign > 0,
    };
  }
  if (noiseLevel > POOR_NOISE) return { good: false, reason: "scatter", noiseLevel };
  return { good: true };
}

const SPECIES_NAMES: Record<Species, string> = { tan: "ammonia", no2: "nitrite", no3: "nitrate" };

/** What a poor fit means for a keeper, and what to check; null for a good fit. */
export function qualityText(q: FitQuality): string | null {
  if (q.good) return null;
  const check =
    "Check that the readings were typed in the unit they were measured in (nitrate as the ion or as nitrogen differ 4.4-fold), and log in the journal what the model was not told (a water change, a dose, fish or plants added or lost).";
  if (q.reason === "scatter")
    return `No good fit: whatever the multipliers, the model misses your readings by about ${Math.round(q.noiseLevel * 100)} % of their level. ${check}`;
  const side = q.readingsAbove ? "above" : "below";
  return `No good fit: your ${SPECIES_NAMES[q.species]} readings stay ${side} the model from day ${Math.round(q.from)} to day ${Math.round(q.to)} of the run, which no choice of multipliers removes. ${check}`;
}
