/**
 * Calibration as a job: the tank's readings within a scenario's run, the engine runs of the
 * least-squares fit (models/nitrogen/calibrate.ts) on the worker pool, and the result in the
 * person's units. Saving the fitted multipliers makes a new scenario (same start date).
 */
import { z } from "zod";
import type { CalibrationJson } from "~/features/calibration/calibration-json";
export type { CalibrationJson } from "~/features/calibration/calibration-json";
import type { Scenario } from "~models";
import {
  calibrateMultipliers,
  MULTIPLIER_BOUNDS,
  MULTIPLIER_KEYS,
  SPECIES,
  type CalibrationResult,
  type MultiplierKey,
  type Species,
} from "~models/nitrogen/calibrate";
import { speciesFactor } from "~models/units";
import { KeeperError, startJob, type JobContext } from "~/features/jobs/jobs.server";
import { readingsForCalibration } from "~/features/readings/readings.server";
import { JOB_RUN_LIMITS } from "~/features/jobs/jobs.server";
import { unitLabels, type DisplayUnits } from "~/utils/display-units";

export const MULTIPLIER_LABELS: Record<MultiplierKey, { label: string; hint: string }> = {
  feedLoad: { label: "Feed load", hint: "How much ammonia the food brings in, compared with the model's estimate." },
  plantUptake: { label: "Plant uptake", hint: "How fast the plants grow and take nitrogen up." },
  nitrifierCapacity: {
    label: "Filter capacity",
    hint: "How much ammonia and nitrite the filter bacteria can process.",
  },
};

/** Iterations of the fit at most: with three multipliers about 150 engine runs. */
const MAX_ITERATIONS = 25;

export const CalibrateInputSchema = z.object({
  fit: z
    .array(z.enum(MULTIPLIER_KEYS, { error: "Choose among the listed multipliers." }))
    .min(1, "Choose at least one multiplier to fit.")
    .max(3),
});

const SPECIES_UNIT: Record<Species, "ammonia" | "nitrite" | "nitrate"> = {
  tan: "ammonia",
  no2: "nitrite",
  no3: "nitrate",
};
const SPECIES_NAME: Record<Species, string> = { tan: "TAN", no2: "Nitrite", no3: "Nitrate" };


function toJson(
  scenario: { id: number; name: string },
  readings: { day: number; tan?: number | null; no2?: number | null; no3?: number | null }[],
  r: CalibrationResult,
  units: DisplayUnits,
): CalibrationJson {
  const labels = unitLabels(units);
  const factor = (k: Species) => speciesFactor(SPECIES_UNIT[k], units);
  const round = (v: number) => Number(v.toPrecision(4));
  return {
    scenario,
    readingsUsed: readings.length,
    residualCount: r.residualCount,
    multipliers: r.multipliers.map((m) => ({
      key: m.key,
      label: MULTIPLIER_LABELS[m.key].label,
      fitted: m.fitted,
      start: round(m.start),
      value: round(m.value),
      standardError: m.standardError === null ? null : Number(m.standardError.toPrecision(2)),
      low95: m.low95 === null ? null : round(m.low95),
      high95: m.high95 === null ? null : round(m.high95),
      atBound: m.atBound,
    })),
    rmse: SPECIES.filter((k) => r.rmseBefore[k] !== null).map((k) => ({
      species: k,
      name: SPECIES_NAME[k],
      unit: labels[SPECIES_UNIT[k]],
      before: r.rmseBefore[k] === null ? null : round(r.rmseBefore[k]! * factor(k)),
      after: r.rmseAfter[k] === null ? null : round(r.rmseAfter[k]! * factor(k)),
    })),
    weightedRmseBefore: round(r.weightedRmseBefore),
    weightedRmseAfter: round(r.weightedRmseAfter),
    residuals: readings.flatMap((reading, i) =>
      SPECIES.flatMap((k) => {
        const measured = reading[k];
        if (measured == null) return [];
        return [
          {
            species: k,
            day: Number(reading.day.toFixed(4)),
            before: round((measured - r.modelBefore[k][i]) * factor(k)),
            after: round((measured - r.modelAfter[k][i]) * factor(k)),
          },
        ];
      }),
    ),
    iterations: r.iterations,
    evaluations: r.evaluations,
    converged: r.converged,
  };
}

/**
 * Starts a calibration job: `scenario` is the stored settings with the tank's targets,
 * `startMs` the scenario's day 0. Throws JobRefused at the person's or the server's limit.
 */
export function startCalibration(
  user: { id: number },
  row: { id: number; name: string },
  tankId: number,
  scenario: Scenario,
  startMs: number,
  fit: MultiplierKey[],
  units: DisplayUnits,
) {
  const readings = readingsForCalibration(tankId, startMs, scenario.run.lengthDays);
  const days = readings.map((r) => r.day);
  // Each iteration: one run per fitted multiplier (the Jacobian) and one or two trial steps.
  const estimate = 2 * (fit.length + 1) + 8 * (fit.length + 2);
  return startJob<CalibrationJson>(
    {
      user,
      kind: "calibration",
      label: `fit ${fit.map((k) => MULTIPLIER_LABELS[k].label.toLowerCase()).join(", ")} to ${readings.length} readings`,
      total: estimate,
      params: { scenarioId: row.id, fit },
    },
    async (ctx: JobContext<unknown>) => {
      if (readings.length === 0) {
        throw new KeeperError(
          "No readings of TAN, nitrite or nitrate fall within this scenario's run. Check its start date, or add readings.",
        );
      }
      let runs = 0;
      const result = await calibrateMultipliers({
        scenario,
        readings,
        fit,
        maxIterations: MAX_ITERATIONS,
        predict: (list) =>
          ctx.map(list, async (s) => {
            const r = await ctx.run({ kind: "sample", scenario: s, days, limits: JOB_RUN_LIMITS });
            runs++;
            ctx.progress(runs, Math.max(estimate, runs + fit.length + 1));
            return r.kind === "sample" ? r.samples : null;
          }),
      }).catch((error: unknown) => {
        if (error instanceof RangeError || (error instanceof Error && /could not be run/.test(error.message))) {
          throw new KeeperError(error.message);
        }
        throw error;
      });
      ctx.progress(runs, runs);
      return toJson(row, readings, result, units);
    },
  );
}

export const SaveFittedSchema = z.object({
  name: z
    .string({ error: "Give the new scenario a name." })
    .trim()
    .min(1, "Give the new scenario a name.")
    .max(120, "Keep the name under 120 characters."),
  ...(Object.fromEntries(
    MULTIPLIER_KEYS.map((k) => [
      k,
      z.coerce
        .number({ error: "The multipliers must be numbers." })
        .min(MULTIPLIER_BOUNDS.min, `Multipliers lie between ${MULTIPLIER_BOUNDS.min} and ${MULTIPLIER_BOUNDS.max}.`)
        .max(MULTIPLIER_BOUNDS.max, `Multipliers lie between ${MULTIPLIER_BOUNDS.min} and ${MULTIPLIER_BOUNDS.max}.`),
    ]),
  ) as Record<MultiplierKey, z.ZodCoercedNumber>),
});
