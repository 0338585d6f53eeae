/**
 * Calibration as a job: the tank's readings within the basis's run (the journal's replay or the
 * scenario's periodic schedule, calibration-basis.server.ts), the engine runs of the robust fit
 * (models/nitrogen/calibration/) on the worker pool, and the result in the person's units. The
 * check before a fit is calibration-assess.server.ts; the inputs, calibration-input.server.ts.
 */
import { calibrateMultipliers, kitsFor, type Kits, type MultiplierKey } from "~models/nitrogen/calibrate";
import { KeeperError } from "~/features/jobs/job-limits.server";
import type { JobContext, JobSpec } from "~/features/jobs/jobs.server";
import { contentHash } from "~/features/runs/simulation.server";
import { readingsForCalibration } from "~/features/readings/readings.server";
import type { DisplayUnits } from "~/utils/display-units";
import type { CalibrationJson } from "~/features/calibration/calibration-json";
import { observedOf, observeTask, SCHEDULE_TEXT, type FitBasis } from "~/features/calibration/calibration-basis.server";
import { calibrationJson, MULTIPLIER_LABELS, preferredUnits } from "~/features/calibration/calibration-report.server";

/** Iterations of each local fit at most. */
const MAX_ITERATIONS = 25;

/**
 * A calibration job, ready to start or to run again after a restart: its params name the
 * scenario, the fit, the kits and the schedule, and fingerprint what it ran on (the scenario or
 * the journal's replay, the readings, the person's units).
 */
export function calibrationJob(
  user: { id: number },
  row: { id: number; name: string },
  tankId: number,
  basis: FitBasis,
  fit: MultiplierKey[],
  units: DisplayUnits,
  kits: Kits = {},
): JobSpec<CalibrationJson> {
  const { scenario, startMs, schedule } = basis;
  const events = schedule.kind === "journal" ? schedule.events : undefined;
  const readings = readingsForCalibration(tankId, startMs, scenario.run.lengthDays);
  const days = readings.map((r) => r.day);
  // Engine runs to expect, for the progress bar: the recovery suite's fits take about 110 per
  // multiplier with exact readings and 180–350 with kit readings (their ranges look further).
  const kitReadings = kitsFor(readings, kits, preferredUnits(units)).some((k) => k.kit.kind !== "exact");
  const estimate = (kitReadings ? 250 : 110) * fit.length;
  const fingerprint = contentHash({ scenario, startMs, events: events ?? null, readings, units });
  return {
    start: {
      user,
      kind: "calibration",
      label: `fit ${fit.map((k) => MULTIPLIER_LABELS[k].label.toLowerCase()).join(", ")} to ${readings.length} readings`,
      total: estimate,
      params: { scenarioId: row.id, fit, kits, schedule: schedule.kind, fingerprint },
    },
    work: async (ctx: JobContext<unknown>) => {
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
        kits,
        preferredUnits: preferredUnits(units),
        maxIterations: MAX_ITERATIONS,
        predict: (list) =>
          ctx.map(list, async (req) => {
            const observed = observedOf(await ctx.run(observeTask(days, req, schedule)));
            runs++;
            ctx.progress(runs, Math.max(estimate, runs + fit.length + 1));
            return observed;
          }),
      }).catch((error: unknown) => {
        if (error instanceof RangeError || (error instanceof Error && /could not be run/.test(error.message))) {
          throw new KeeperError(error.message);
        }
        throw error;
      });
      ctx.progress(runs, runs);
      return { ...calibrationJson(row, readings, result, units), schedule: SCHEDULE_TEXT[schedule.kind] };
    },
  };
}
