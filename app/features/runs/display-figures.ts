/**
 * Key figures, series and guides converted from the engine's mg N/L into a viewer's units.
 * Isomorphic: loaders convert stored runs with it, and the what-if panel converts previews.
 */
import type { KeyFigures, Series } from "~models";
import { speciesFactor } from "~models/units";
import type { TanCriterionLines } from "~/features/runs/criterion-line";
import type { ChartGuides, ChartSeries, DisplayKeyFigures } from "~/utils/chart-data";
import type { DisplayUnits } from "~/utils/display-units";
import { fourFigures } from "~/utils/four-figures";

export function displayKeyFigures(k: KeyFigures, units: DisplayUnits): DisplayKeyFigures {
  const nh3 = speciesFactor("ammonia", units);
  const no2 = speciesFactor("nitrite", units);
  const no3 = speciesFactor("nitrate", units);
  return {
    peakFreeNh3: { value: k.peakFreeNh3.value * nh3, day: k.peakFreeNh3.day },
    peakNitrite: { value: k.peakNitrite.value * no2, day: k.peakNitrite.day },
    nitrateEnd: k.nitrateEnd * no3,
    nitrateBeforeLastWaterChange: k.nitrateBeforeLastWaterChange === null ? null : k.nitrateBeforeLastWaterChange * no3,
    daysAboveNitrateTarget: k.daysAboveNitrateTarget,
    cyclingFinishedDay: k.cyclingFinishedDay,
    cycleSeen: k.cycleSeen,
    plantsTrimmedG: k.plantsTrimmedG,
  };
}

// Four significant figures: finer than any test kit or chart pixel, and a quarter of the bytes.
const scale = (values: number[], f: number) => values.map((v) => fourFigures(v * f));

/**
 * The chart's columns in display units (the engine's extra columns stay on the server).
 * @param criteria the long-term and short-term TAN criteria per sample (criterion-line.ts),
 *   mg TAN-N/L; left out where no caution line is drawn (what-if previews)
 */
export function displaySeries(s: Series, units: DisplayUnits, criteria?: TanCriterionLines): ChartSeries {
  const nh3 = speciesFactor("ammonia", units);
  return {
    t: s.t,
    tan: scale(s.tan, nh3),
    nh3: scale(s.nh3, nh3),
    no2: scale(s.no2, speciesFactor("nitrite", units)),
    no3: scale(s.no3, speciesFactor("nitrate", units)),
    plants: s.plants.map((p) => ({ id: p.id, name: p.name, massG: p.massG.map(fourFigures) })),
    ...(s.o2 ? { o2: s.o2.map(fourFigures) } : {}),
    ...(criteria && criteria.longTerm.length === s.t.length && criteria.shortTerm.length === s.t.length
      ? { tanLongTerm: scale(criteria.longTerm, nh3), tanShortTerm: scale(criteria.shortTerm, nh3) }
      : {}),
  };
}

/**
 * Free ammonia caution 0.02 mg/L as NH3 (common practice, no source; EIFAC 1970 gives 0.025 —
 * from memory) and nitrite caution 0.1 mg/L NO2-N (common practice, no source).
 */
export const FREE_NH3_CAUTION_MG_N = 0.02 * 0.82244;
export const NITRITE_CAUTION_MG_N = 0.1;

/** Which toxic peaks of a run (canonical key figures) cross their caution lines: the cells to flag. */
export function toxicPeaksAboveCaution(k: Pick<KeyFigures, "peakFreeNh3" | "peakNitrite">) {
  return {
    peakFreeNh3: k.peakFreeNh3.value > FREE_NH3_CAUTION_MG_N,
    peakNitrite: k.peakNitrite.value > NITRITE_CAUTION_MG_N,
  };
}

/** The flat caution lines and the nitrate band (the TAN criterion moves with pH: it is a series column). */
export function displayGuides(targets: { nitrateLow: number; nitrateHigh: number }, units: DisplayUnits): ChartGuides {
  const no3 = speciesFactor("nitrate", units);
  return {
    nitrateBand: { low: targets.nitrateLow * no3, high: targets.nitrateHigh * no3 },
    freeAmmoniaCaution: FREE_NH3_CAUTION_MG_N * speciesFactor("ammonia", units),
    nitriteCaution: NITRITE_CAUTION_MG_N * speciesFactor("nitrite", units),
  };
}
