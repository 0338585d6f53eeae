/** What the what-if panel draws (client-safe; built by app/features/runs/what-if.server.ts). */
import type { Quantity } from "~models";

/** Starting values, canonical (g/day, 0–1, days, factor, mg N/L). */
export type WhatIfValues = {
  feedGPerDay: number;
  waterChangeFraction: number;
  waterChangeIntervalDays: number;
  plantMassFactor: number;
  tapNitrate: number;
};

/** A slider's setting: its label and what it holds (canonical unit), from the settings vocabulary. */
export type WhatIfSetting = { label: string; quantity: Quantity; unit: string };

export type WhatIfSettings = Record<Exclude<keyof WhatIfValues, "plantMassFactor">, WhatIfSetting>;

/**
 * The suggested name of a scenario saved from the what-if panel: "Name (what if)", and for a
 * what-if of a what-if "Name (what if 2)", not "Name (what if) (what if)".
 */
export function whatIfName(name: string): string {
  const m = /^(.*) \(what if(?: (\d+))?\)$/.exec(name);
  if (!m) return `${name} (what if)`;
  return `${m[1]} (what if ${m[2] ? Number(m[2]) + 1 : 2})`;
}
