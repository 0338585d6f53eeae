/** The multipliers calibration may fit, their bounds, and a scenario with some of them set. */
import type { Scenario } from "../scenario";
import { listScenarioFields, MultipliersSchema } from "../scenario";
import type { MultiplierKey } from "./advice";

/** Bounds of every multiplier, from the scenario schema (0.1–10). */
export const MULTIPLIER_BOUNDS: { min: number; max: number } = (() => {
  const f = listScenarioFields(MultipliersSchema).find((x) => x.key === "feedLoad")!;
  return { min: f.min ?? 0.1, max: f.max ?? 10 };
})();

export function withMultipliers(scenario: Scenario, values: Partial<Record<MultiplierKey, number>>): Scenario {
  return { ...scenario, multipliers: { ...scenario.multipliers, ...values } };
}
