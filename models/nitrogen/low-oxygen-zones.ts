/**
 * Low-oxygen zones as keepers know them (porous rock, a sand bed) mapped to a denitrification
 * capacity with a low, typical and high value (docs/sources.md §8, §16). The range is wide
 * because published rates are: the result reports all three so the keeper can see it.
 */
import { LOW_OXYGEN_MEDIA as M } from "./parameters";
import type { Scenario } from "./scenario";

export interface ZoneCapacity {
  /** How the capacity was set. */
  readonly sizedFrom: "fromMedia" | "fromCapacity";
  /** Denitrification capacity, mg NO3-N/day with plenty of nitrate and organic matter and no oxygen. */
  readonly lowMgNPerDay: number;
  readonly typicalMgNPerDay: number;
  readonly highMgNPerDay: number;
  /** The value the run used (the chosen estimate, or the stated capacity). */
  readonly usedMgNPerDay: number;
}

/** Share of a sand bed's areal rate reached at a depth (cm): none above the oxic layer, full from `sandFullDepth`. */
export function sandDepthFactor(depthCm: number): number {
  const f = (depthCm - M.sandOxicDepth.value) / (M.sandFullDepth.value - M.sandOxicDepth.value);
  return f <= 0 ? 0 : f >= 1 ? 1 : f;
}

/** The zones' denitrification capacity for a scenario (null when the zones are off). */
export function zoneCapacity(s: Scenario): ZoneCapacity | null {
  const lo = s.lowOxygen;
  if (!lo.enabled) return null;
  if (lo.zoneSize === "fromCapacity") {
    const c = lo.denitrificationCapacityMgNPerDay;
    return { sizedFrom: "fromCapacity", lowMgNPerDay: c, typicalMgNPerDay: c, highMgNPerDay: c, usedMgNPerDay: c };
  }
  const sand = lo.sandBedAreaM2 * sandDepthFactor(lo.sandBedDepthCm);
  const at = (rock: number, perM2: number) => lo.porousRockL * rock + sand * perM2;
  const low = at(M.rockLow.value, M.sandLow.value);
  const typical = at(M.rockTypical.value, M.sandTypical.value);
  const high = at(M.rockHigh.value, M.sandHigh.value);
  const used = lo.capacityEstimate === "low" ? low : lo.capacityEstimate === "high" ? high : typical;
  return {
    sizedFrom: "fromMedia",
    lowMgNPerDay: low,
    typicalMgNPerDay: typical,
    highMgNPerDay: high,
    usedMgNPerDay: used,
  };
}
