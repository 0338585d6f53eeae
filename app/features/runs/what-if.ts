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
