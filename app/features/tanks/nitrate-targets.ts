/**
 * A tank's nitrate target band: stored in mg N/L, typed and shown in the person's units.
 * Client-safe (the tank pages and the seed share it).
 */
import { toCanonical } from "~models/units";

/**
 * A new tank's band, 5–20 mg/L as NO3 (common practice, no source), stored as the exact
 * conversion so it reads back as 5 and 20, not 5.002 and 20.01.
 */
export const DEFAULT_NITRATE_TARGETS = {
  nitrateTargetLow: toCanonical("nitrate", 5, "asNO3"),
  nitrateTargetHigh: toCanonical("nitrate", 20, "asNO3"),
} as const;

/**
 * A stored target (mg N/L) in the person's units, with the floating-point noise of the round
 * trip removed, so a value typed as 12.5 comes back as 12.5 (12 significant digits is far
 * beyond what anyone types and far above the ~1e-16 of a divide and multiply).
 */
export function typedTarget(storedMgN: number, factor: number): number {
  return Number((storedMgN * factor).toPrecision(12));
}

/**
 * The target fields' hint in the person's units: the usual 5–20 mg/L NO3 band (common
 * practice, no source), or its NO3-N equivalent (about 1.1–4.5) for those who read nitrate as N.
 */
export function nitrateBandHint(factor: number, unitLabel: string): string {
  const lo = Number((DEFAULT_NITRATE_TARGETS.nitrateTargetLow * factor).toPrecision(2));
  const hi = Number((DEFAULT_NITRATE_TARGETS.nitrateTargetHigh * factor).toPrecision(2));
  return `Planted tanks often aim for ${lo}–${hi} ${unitLabel} (common practice).`;
}
