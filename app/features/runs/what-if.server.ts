/**
 * Quick what-if: a handful of settings changed on top of a saved scenario, run without saving.
 * Each key of the body (the preview API's, docs/api.md) is a setting of the shared vocabulary
 * (models/nitrogen/scenario/settings.ts), with its bounds; values are canonical (g/day,
 * fraction 0–1, days, mg N/L), plus a factor on plant mass.
 */
import { z } from "zod";
import { applyChanges, PLANT_MASS, scenarioSetting, settingField, type Scenario, type SettingChange } from "~models";
import type { WhatIfSetting } from "~/features/runs/what-if";

/** The what-if's keys and the settings they change (plant mass goes as a factor). */
const WHAT_IF_SETTINGS = {
  feedGPerDay: "fish.feedGPerDay",
  waterChangeFraction: "maintenance.waterChangeFraction",
  waterChangeIntervalDays: "maintenance.waterChangeIntervalDays",
  tapNitrate: "tapWater.nitrate",
} as const;

type SettingKey = keyof typeof WHAT_IF_SETTINGS;
const SETTING_KEYS = Object.keys(WHAT_IF_SETTINGS) as SettingKey[];

/** A number within the setting's own bounds. */
function withinBounds(id: string) {
  const field = settingField(id);
  return z
    .number()
    .min(field.min ?? 0)
    .max(field.max ?? Number.MAX_VALUE);
}

export const WhatIfSchema = z
  .object({
    feedGPerDay: withinBounds(WHAT_IF_SETTINGS.feedGPerDay),
    waterChangeFraction: withinBounds(WHAT_IF_SETTINGS.waterChangeFraction),
    waterChangeIntervalDays: withinBounds(WHAT_IF_SETTINGS.waterChangeIntervalDays),
    /** Multiplies every plant group's start and maximum mass (1 = as saved). */
    plantMassFactor: z.number().min(0).max(10),
    tapNitrate: withinBounds(WHAT_IF_SETTINGS.tapNitrate),
  })
  .partial()
  .strict();

export type WhatIf = z.output<typeof WhatIfSchema>;

export function applyWhatIf(scenario: Scenario, changes: WhatIf): Scenario {
  const list: SettingChange[] = [];
  for (const key of SETTING_KEYS) {
    const value = changes[key];
    if (value !== undefined) list.push(...scenarioSetting(scenario, WHAT_IF_SETTINGS[key])!.changes(value));
  }
  // Start and maximum scale together: more plants means more room too (a start above the
  // maximum would be refused, and a fixed maximum makes the outcome non-monotone).
  const plants = scenarioSetting(scenario, PLANT_MASS);
  if (plants && changes.plantMassFactor !== undefined)
    list.push(...plants.changes(plants.current * changes.plantMassFactor));
  return applyChanges(scenario, list);
}

/** The what-if's starting point, read off the saved scenario. */
export function whatIfBase(scenario: Scenario): Required<WhatIf> {
  const current = (key: SettingKey) => scenarioSetting(scenario, WHAT_IF_SETTINGS[key])!.current;
  return {
    feedGPerDay: current("feedGPerDay"),
    waterChangeFraction: current("waterChangeFraction"),
    waterChangeIntervalDays: current("waterChangeIntervalDays"),
    plantMassFactor: 1,
    tapNitrate: current("tapNitrate"),
  };
}

/** The sliders' labels and quantities, from the vocabulary (the panel converts for display). */
export function whatIfSettings(): Record<SettingKey, WhatIfSetting> {
  return Object.fromEntries(
    SETTING_KEYS.map((key) => {
      const field = settingField(WHAT_IF_SETTINGS[key]);
      return [key, { label: field.meta.label, quantity: field.meta.quantity, unit: field.meta.unit }];
    }),
  ) as Record<SettingKey, WhatIfSetting>;
}
