import { ScenarioSchema } from "../../models/index";
import type { Scenario, ScenarioInput, SimulationResult } from "../../models/index";

/** Deep merge of plain objects (arrays replaced), for building test scenarios. */
export function merge<T>(base: T, over: unknown): T {
  if (over === undefined) return base;
  if (Array.isArray(over) || over === null || typeof over !== "object") return over as T;
  const out: Record<string, unknown> = { ...(base as Record<string, unknown>) };
  for (const [k, v] of Object.entries(over as Record<string, unknown>)) {
    out[k] = merge((base as Record<string, unknown>)?.[k], v);
  }
  return out as T;
}

/**
 * A bare tank: established filter, no plants, no water changes, no cleanings, no gravel
 * cleaning, no tap nitrogen. Tests add only what they exercise.
 */
export function bareTank(over: ScenarioInput = {}): Scenario {
  const base: ScenarioInput = {
    water: { volumeL: 100, temperatureC: 25, pH: 7.2, khDkh: 6, startTan: 0, startNitrite: 0, startNitrate: 0 },
    fish: { feedGPerDay: 0, fractionEaten: 1 },
    plants: [],
    filter: { establishedAtStart: true, cleaningIntervalDays: 0 },
    maintenance: { waterChangeIntervalDays: 0, gravelCleaningFraction: 0, dripLPerDay: 0 },
    tapWater: { nitrate: 0, tan: 0, khDkh: 6, roShare: 0 },
    run: { lengthDays: 30, outputIntervalDays: 1 },
  };
  return ScenarioSchema.parse(merge(base, over));
}

/** Total dissolved inorganic N (mg N/L) at sample k. */
export function din(r: SimulationResult, k: number): number {
  return r.series.tan[k] + r.series.no2[k] + r.series.no3[k];
}

export function lastIndex(r: SimulationResult): number {
  return r.series.t.length - 1;
}

/** Feed (g/day) whose nitrogen not kept by the fish is L mg N/day, when all food is eaten. */
export function feedForLoad(loadMgNPerDay: number, proteinFraction = 0.45): number {
  // Timmons & Ebeling: eaten N = feed × protein × 0.16; fish keep 0.8 × 0.2 = 0.16 of it
  return loadMgNPerDay / (1 - 0.16) / (proteinFraction * 0.16 * 1000);
}

export const rel = (a: number, b: number) => Math.abs(a - b) / Math.abs(b);
