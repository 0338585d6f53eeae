/**
 * A calibration in the person's units: the multipliers' names, the kits as the form shows them,
 * and the fit's result as the page and the API report it (calibration-json.ts).
 */
import {
  describeKit,
  kitStepIn,
  kitUnit,
  SPECIES,
  type CalibrationReading,
  type CalibrationResult,
  type Kit,
  type MultiplierKey,
  type Species,
} from "~models/nitrogen/calibrate";
import { speciesFactor } from "~models/units";
import { unitLabels, type DisplayUnits } from "~/utils/display-units";
import type { CalibrationJson, KitView } from "~/features/calibration/calibration-json";

export const MULTIPLIER_LABELS: Record<MultiplierKey, { label: string; hint: string }> = {
  feedLoad: { label: "Feed load", hint: "How much ammonia the food brings in, compared with the model's estimate." },
  plantUptake: { label: "Plant uptake", hint: "How fast the plants grow and take nitrogen up." },
  nitrifierCapacity: {
    label: "Filter capacity",
    hint: "How much ammonia and nitrite the filter bacteria can process.",
  },
};

export const SPECIES_UNIT: Record<Species, "ammonia" | "nitrite" | "nitrate"> = {
  tan: "ammonia",
  no2: "nitrite",
  no3: "nitrate",
};
const SPECIES_NAME: Record<Species, string> = { tan: "TAN", no2: "Nitrite", no3: "Nitrate" };

/** The unit id each species is shown in, for inferring kits. */
export const preferredUnits = (units: DisplayUnits) => ({ tan: units.ammonia, no2: units.nitrite, no3: units.nitrate });

/** A kit for the page, in the person's units: its words, and its step as the step field takes it. */
export function kitView(k: { species: Species; kit: Kit; inferred: boolean }, units: DisplayUnits): KitView {
  const shownIn = preferredUnits(units)[k.species];
  return {
    species: k.species,
    name: SPECIES_NAME[k.species],
    choice: k.kit.kind,
    step: k.kit.kind === "steps" ? kitStepIn(k.species, k.kit, shownIn) : null,
    text: describeKit(k.species, k.kit, shownIn),
    unit: kitUnit(k.species, shownIn).label,
    inferred: k.inferred,
  };
}

const round = (v: number) => Number(v.toPrecision(4));

export function calibrationJson(
  scenario: { id: number; name: string },
  readings: CalibrationReading[],
  r: CalibrationResult,
  units: DisplayUnits,
): CalibrationJson {
  const labels = unitLabels(units);
  const factor = (k: Species) => speciesFactor(SPECIES_UNIT[k], units);
  return {
    scenario,
    readingsUsed: readings.length,
    residualCount: r.residualCount,
    kits: r.kits.map((k) => kitView(k, units)),
    multipliers: r.multipliers.map((m) => ({
      key: m.key,
      label: MULTIPLIER_LABELS[m.key].label,
      fitted: m.fitted,
      start: round(m.start),
      value: round(m.value),
      low95: m.low95 === null ? null : round(m.low95),
      high95: m.high95 === null ? null : round(m.high95),
      lowOpen: m.lowOpen,
      highOpen: m.highOpen,
      atBound: m.atBound,
      determined: m.verdict ? m.verdict.determined : null,
      reason: m.verdict ? m.verdict.reason : null,
      correlatedWith: m.verdict?.correlatedWith
        ? {
            label: MULTIPLIER_LABELS[m.verdict.correlatedWith.key].label,
            correlation: round(m.verdict.correlatedWith.correlation),
          }
        : null,
      effectPercent: m.effect === null ? null : Number((m.effect * 100).toPrecision(2)),
      suggestion: m.suggestion,
    })),
    rmse: SPECIES.filter((k) => r.rmseBefore[k] !== null).map((k) => ({
      species: k,
      name: SPECIES_NAME[k],
      unit: labels[SPECIES_UNIT[k]],
      before: round(r.rmseBefore[k]! * factor(k)),
      after: round(r.rmseAfter[k]! * factor(k)),
    })),
    weightedRmseBefore: round(r.weightedRmseBefore),
    weightedRmseAfter: round(r.weightedRmseAfter),
    noisePercent: Number((r.noiseLevel * 100).toPrecision(2)),
    residuals: readings.flatMap((reading, i) =>
      SPECIES.flatMap((k) => {
        const measured = reading[k];
        if (measured == null) return [];
        const day = Number(reading.day.toFixed(4));
        return [
          {
            species: k,
            day,
            before: round((measured - r.modelBefore[k][i]) * factor(k)),
            after: round((measured - r.modelAfter[k][i]) * factor(k)),
          },
        ];
      }),
    ),
    evaluations: r.evaluations,
    localFits: r.localFits,
    converged: r.converged,
    fitQuality: {
      good: r.quality.good,
      reason: r.quality.good ? null : r.quality.reason,
      text: r.qualityText,
    },
  };
}
