/**
 * Quick what-if: a handful of settings changed on top of a saved scenario, run without saving.
 * Values are canonical (g/day, fraction 0–1, days, mg N/L), plus a factor on plant mass.
 */
import { z } from "zod";
import type { Scenario } from "~models";

export const WhatIfSchema = z
  .object({
    feedGPerDay: z.number().min(0).max(1000),
    waterChangeFraction: z.number().min(0).max(0.95),
    waterChangeIntervalDays: z.number().min(0).max(365),
    /** Multiplies every plant group's start and maximum mass (1 = as saved). */
    plantMassFactor: z.number().min(0).max(10),
    tapNitrate: z.number().min(0).max(100),
  })
  .partial()
  .strict();

export type WhatIf = z.output<typeof WhatIfSchema>;

export function applyWhatIf(scenario: Scenario, changes: WhatIf): Scenario {
  const factor = changes.plantMassFactor ?? 1;
  return {
    ...scenario,
    fish: { ...scenario.fish, feedGPerDay: changes.feedGPerDay ?? scenario.fish.feedGPerDay },
    maintenance: {
      ...scenario.maintenance,
      waterChangeFraction: changes.waterChangeFraction ?? scenario.maintenance.waterChangeFraction,
      waterChangeIntervalDays: changes.waterChangeIntervalDays ?? scenario.maintenance.waterChangeIntervalDays,
    },
    tapWater: { ...scenario.tapWater, nitrate: changes.tapNitrate ?? scenario.tapWater.nitrate },
    // Start and maximum scale together: more plants means more room too (a start above the
    // maximum would be refused, and a fixed maximum makes the outcome non-monotone).
    plants: scenario.plants.map((g) => ({
      ...g,
      startMassG: g.startMassG * factor,
      maxMassG: Math.max(0.01, g.maxMassG * factor),
    })),
  };
}

/** The what-if's starting point, read off the saved scenario. */
export function whatIfBase(scenario: Scenario): Required<WhatIf> {
  return {
    feedGPerDay: scenario.fish.feedGPerDay,
    waterChangeFraction: scenario.maintenance.waterChangeFraction,
    waterChangeIntervalDays: scenario.maintenance.waterChangeIntervalDays,
    plantMassFactor: 1,
    tapNitrate: scenario.tapWater.nitrate,
  };
}
