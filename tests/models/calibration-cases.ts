/**
 * Synthetic readings from a known truth, for the calibration recovery suite: the usual
 * identifiability practice of fitting data made by the model itself with known parameters
 * (Raue et al. 2009; docs/sources.md §17). Everything here is our own worked example.
 */
import fs from "node:fs";
import path from "node:path";
import { parseScenario, plantGroupFromForm, ScenarioSchema } from "../../models/index";
import type { Scenario } from "../../models/index";
import {
  DEFAULT_CARDS,
  kitUnit,
  observe,
  withMultipliers,
  type CalibrationReading,
  type Kit,
  type Kits,
  type MultiplierKey,
  type Predict,
  type Species,
} from "../../models/nitrogen/calibrate";

/** A 120 L planted tank, plants trimmed every 14 days (no "when full" trims), 90 days. */
export const PLANTED_120: Scenario = ScenarioSchema.parse({
  water: { volumeL: 120, temperatureC: 25, pH: 7.2, khDkh: 5, startNitrate: 3.4 },
  fish: { feedGPerDay: 1, proteinFraction: 0.42, feedsPerDay: 2, fractionEaten: 0.9 },
  plants: [
    plantGroupFromForm("stem", {
      id: "stems",
      name: "Stem plants",
      startMassG: 5,
      maxMassG: 60,
      trim: { rule: "everyDays", everyDays: 14, trimToFraction: 0.5, fullAtFraction: 0.9 },
    }),
  ],
  filter: { capacityMgTanPerDay: 600, cleaningIntervalDays: 30 },
  maintenance: { waterChangeIntervalDays: 7, waterChangeFraction: 0.25, gravelCleaningFraction: 0.2 },
  tapWater: { nitrate: 2.26, khDkh: 6 },
  run: { lengthDays: 90 },
});

/** The shipped example: a stem group trimmed "when full", floaters every 10 days, 120 days. */
export const MOSSBANK: Scenario = (() => {
  const file = path.join(__dirname, "../../models/examples/mossbank-90l.json");
  const parsed = parseScenario(JSON.parse(fs.readFileSync(file, "utf8")));
  if (!parsed.success) throw new Error("The example scenario does not parse.");
  return parsed.data;
})();

/** Thirty readings, every third day from day 1.35 (an evening test). */
export const DAYS = Array.from({ length: 30 }, (_v, i) => 1.35 + 3 * i);

/** Seeded normal noise (Box–Muller on a linear congruential generator), so every case repeats. */
export function normalNoise(seed: number) {
  let x = seed;
  const u = () => ((x = (x * 1103515245 + 12345) % 2147483648) + 1) / 2147483649;
  return () => Math.sqrt(-2 * Math.log(u())) * Math.cos(2 * Math.PI * u());
}

/** The engine as the app's worker runs it, in-process. */
export const predictIn =
  (days: readonly number[]): Predict =>
  async (requests) =>
    requests.map((r) => {
      try {
        return observe(r.scenario, days, { pinnedTrimDays: r.pinnedTrimDays ?? undefined });
      } catch {
        return null;
      }
    });

/** The default colour card for each species, read in the ion's own unit. */
export const CARD_KITS: Record<Species, Kit> = {
  tan: { kind: "card", unit: "asNH3", values: [...DEFAULT_CARDS.tan] },
  no2: { kind: "card", unit: "asNO2", values: [...DEFAULT_CARDS.no2] },
  no3: { kind: "card", unit: "asNO3", values: [...DEFAULT_CARDS.no3] },
};

/** What a keeper would write down from `kit` for a true value (mg N/L). */
export function kitValue(species: Species, valueMgN: number, kit: Kit): number {
  if (kit.kind === "exact") return valueMgN;
  const f = kitUnit(species, kit.unit).mgNPerUnit;
  const v = valueMgN / f;
  if (kit.kind === "steps") return Math.max(0, Math.round(v / kit.step)) * kit.step * f;
  const nearest = kit.values.reduce((best, c) => (Math.abs(c - v) < Math.abs(best - v) ? c : best), kit.values[0]);
  return nearest * f;
}

export type Case = {
  name: string;
  scenario: Scenario;
  truth: Partial<Record<MultiplierKey, number>>;
  species: readonly Species[];
  /** Kits to round to (null: exact readings). */
  kits: Kits | null;
  /** Relative reading noise before rounding (seeded). */
  noise: number;
  seed: number;
};

/** The readings of a case: the truth's model values, with seeded noise, rounded to the kits. */
export function readingsOf(c: Case): CalibrationReading[] {
  const m = observe(withMultipliers(c.scenario, c.truth), DAYS).samples;
  const n = normalNoise(c.seed);
  return DAYS.map((day, i) => {
    const r: CalibrationReading = { day };
    for (const k of c.species) {
      const noisy = Math.max(0, m[k][i] * (1 + c.noise * n()));
      r[k] = c.kits?.[k] ? kitValue(k, noisy, c.kits[k]!) : noisy;
    }
    return r;
  });
}
