/**
 * Before fitting: which multipliers can these readings tell? From the model's sensitivities at
 * the scenario's current multipliers and the readings' expected errors, the Fisher information
 * F = Σ s·sᵀ/σ² predicts each multiplier's 95 % range (±1.96·√(F⁻¹)ⱼⱼ in ln units) and the
 * correlations — the usual a-priori identifiability check of experimental design (Raue et al.
 * 2009; docs/sources.md §17). Multipliers whose predicted range is too wide are dropped one by
 * one (worst first), since an undetermined one also widens the others'.
 */
import { inv } from "mathjs";
import type { MultiplierKey, Sensitivity, Verdict } from "./advice";
import {
  DETERMINED_FACTOR,
  effectOfDoubling,
  MULTIPLIER_NAMES,
  NO_EFFECT_SHARE,
  sensitivity,
  STRONG_CORRELATION,
  suggestion,
} from "./advice";
import type { Kit, Kits, Species } from "./kits";
import { readingInterval } from "./kits";
import type { CalibrationReading, Observation } from "./likelihood";
import { observationsOf } from "./likelihood";
import type { Predict } from "./fit";
import { kitsFor } from "./fit";
import { clamp } from "./least-squares";
import { MULTIPLIER_BOUNDS, withMultipliers } from "./multipliers";

/**
 * Expected error of a reading beyond its kit's rounding, as a share of its species' scale (a
 * keeper's test a few hours off the model's day, a colour judged a little high or low). Model
 * choice, no source.
 */
const DESIGN_NOISE = 0.05;
const STEP = 0.01;

export type Assessment = {
  key: MultiplierKey;
  determinable: boolean;
  /** Predicted 95 % range as a factor either side of the value (×/÷), null when unbounded. */
  expectedFactor: number | null;
  reason: Verdict["reason"];
  correlatedWith: { key: MultiplierKey; correlation: number } | null;
  effect: number;
  suggestion: string | null;
};

/** Expected standard deviation of an observation: its kit's rounding (uniform: width/√12) or the design noise. */
function expectedSd(o: Observation): number {
  const lo = Number.isFinite(o.lo) ? Math.max(0, o.lo) : 0;
  const hi = Number.isFinite(o.hi) ? o.hi : 2 * lo;
  return Math.max(DESIGN_NOISE * o.scale, (hi - lo) / Math.sqrt(12));
}

export async function assessReadings(opts: {
  scenario: import("../scenario").Scenario;
  readings: readonly CalibrationReading[];
  candidates: readonly MultiplierKey[];
  kits?: Kits;
  preferredUnits?: Partial<Record<Species, string>>;
  predict: Predict;
}): Promise<{ multipliers: Assessment[]; kits: { species: Species; kit: Kit; inferred: boolean }[] }> {
  const { scenario, readings, candidates } = opts;
  const kits = kitsFor(readings, opts.kits, opts.preferredUnits);
  const kitOf = Object.fromEntries(kits.map((k) => [k.species, k.kit])) as Record<Species, Kit>;
  const observations = observationsOf(readings, (s, v) => ({
    ...readingInterval(s, v, kitOf[s]),
    colour: kitOf[s].kind === "card",
  }));
  if (observations.length === 0 || candidates.length === 0) return { multipliers: [], kits };
  const valuesOf = (o: import("./observe").Observed) => observations.map((ob) => o.samples[ob.species][ob.reading]);
  const at = candidates.map((k) => clamp(scenario.multipliers[k], MULTIPLIER_BOUNDS.min, MULTIPLIER_BOUNDS.max));
  const [base] = await opts.predict([{ scenario, pinnedTrimDays: null }]);
  if (!base) throw new Error("The model could not be run with these settings.");
  const moved = await opts.predict(
    candidates.map((k, j) => ({
      scenario: withMultipliers(scenario, { [k]: Math.min(MULTIPLIER_BOUNDS.max, at[j] * Math.exp(STEP)) }),
      pinnedTrimDays: base.trimDays,
    })),
  );
  const sens: Sensitivity[] = moved.map((o, j) =>
    sensitivity(
      base,
      o ?? base,
      Math.log(Math.min(MULTIPLIER_BOUNDS.max, at[j] * Math.exp(STEP)) / at[j]) || STEP,
      valuesOf,
    ),
  );
  const sd = observations.map(expectedSd);
  const scales = observations.map((o) => o.scale);
  const effects = sens.map((s) => effectOfDoubling(s, scales));
  const info = (set: number[]) =>
    set.map((a) =>
      set.map((b) => sens[a].observations.reduce((s, v, i) => s + (v * sens[b].observations[i]) / sd[i] ** 2, 0)),
    );

  let set = candidates.map((_k, j) => j);
  const dropped = new Map<number, Pick<Assessment, "expectedFactor" | "reason" | "correlatedWith">>();
  const factors = new Map<number, number | null>();
  while (set.length) {
    let C: number[][] | null = null;
    try {
      C = inv(info(set)) as number[][];
      if (C.some((row, a) => !(row[a] > 0) || !row.every(Number.isFinite))) C = null;
    } catch {
      C = null;
    }
    const factor = (a: number) => (C ? Math.exp(1.96 * Math.sqrt(C[a][a])) : null);
    const corr = (a: number) => {
      if (!C || set.length < 2) return null;
      const others = set.map((j, b) => ({
        key: candidates[j],
        correlation: C![a][b] / Math.sqrt(C![a][a] * C![b][b]),
      }));
      const best = others
        .filter((_o, b) => b !== a)
        .sort((x, y) => Math.abs(y.correlation) - Math.abs(x.correlation))[0];
      return best && Math.abs(best.correlation) >= STRONG_CORRELATION ? best : null;
    };
    const bad = set
      .map((j, a) => ({ j, a, f: factor(a) }))
      .filter((x) => x.f === null || x.f > DETERMINED_FACTOR || effects[x.j] < NO_EFFECT_SHARE);
    if (bad.length === 0) {
      set.forEach((j, a) => factors.set(j, factor(a)));
      break;
    }
    const worst = bad.sort((x, y) => (y.f ?? Infinity) - (x.f ?? Infinity) || effects[x.j] - effects[y.j])[0];
    const c = corr(worst.a);
    dropped.set(worst.j, {
      expectedFactor: worst.f,
      reason: effects[worst.j] < NO_EFFECT_SHARE ? "noEffect" : c ? "correlated" : "wide",
      correlatedWith: c,
    });
    set = set.filter((j) => j !== worst.j);
  }
  const measured = new Set(kits.map((k) => k.species));
  const multipliers = candidates.map((key, j): Assessment => {
    const d = dropped.get(j);
    if (!d) {
      const f = factors.get(j) ?? null;
      return {
        key,
        determinable: true,
        expectedFactor: f,
        reason: "determined",
        correlatedWith: null,
        effect: effects[j],
        suggestion: null,
      };
    }
    const others = set.map((m) => sens[m]);
    const names = set.map((m) => MULTIPLIER_NAMES[candidates[m]]);
    return {
      key,
      determinable: false,
      ...d,
      effect: effects[j],
      suggestion: suggestion(key, sens[j], others, base.grid.t, measured, names),
    };
  });
  return { multipliers, kits };
}
