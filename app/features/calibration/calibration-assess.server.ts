/**
 * Before a fit: which multipliers the readings can tell (a few short runs on the pool's
 * interactive lane, counted as one of the person's runs in flight, so a burst of page loads
 * cannot queue unbounded work: issue 10), and the kits their values suggest — on the same basis the fit will run on
 * (the journal's replay or the periodic schedule, calibration-basis.server.ts).
 */
import { assessReadings, kitsFor, type MultiplierKey } from "~models/nitrogen/calibrate";
import { getEnginePool } from "~/features/jobs/engine-pool.server";
import { takeRunSlot } from "~/features/runs/run-gate.server";
import { readingsForCalibration } from "~/features/readings/readings.server";
import type { DisplayUnits } from "~/utils/display-units";
import type { CalibrationAssessment, KitView } from "~/features/calibration/calibration-json";
import { observedOf, observeTask, type FitBasis } from "~/features/calibration/calibration-basis.server";
import { kitView, preferredUnits } from "~/features/calibration/calibration-report.server";

const readingsIn = (tankId: number, basis: FitBasis) =>
  readingsForCalibration(tankId, basis.startMs, basis.scenario.run.lengthDays);

/** Which multipliers the readings on `basis` can tell; null when there are no readings or the model cannot run. */
export async function assessCalibration(
  user: { id: number },
  tankId: number,
  basis: FitBasis,
  units: DisplayUnits,
  candidates: MultiplierKey[],
): Promise<CalibrationAssessment | null> {
  const readings = readingsIn(tankId, basis);
  if (readings.length === 0 || candidates.length === 0) return null;
  const days = readings.map((r) => r.day);
  const pool = getEnginePool();
  // Refused (RunRefused: the person has runs enough going) is like a failed check: the page
  // shows without it, ticking nothing for them.
  let release: (() => void) | null = null;
  try {
    release = await takeRunSlot(user.id);
    const a = await assessReadings({
      scenario: basis.scenario,
      readings,
      candidates,
      preferredUnits: preferredUnits(units),
      predict: (list) =>
        Promise.all(
          list.map(async (req) =>
            observedOf(
              await pool.run(observeTask(days, req, basis.schedule), { lane: "interactive", owner: `user:${user.id}` }),
            ),
          ),
        ),
    });
    return {
      kits: a.kits.map((k) => kitView(k, units)),
      multipliers: a.multipliers.map((m) => ({
        key: m.key,
        determinable: m.determinable,
        expectedPercent: m.expectedFactor === null ? null : Math.round((m.expectedFactor - 1) * 100),
        reason: m.reason,
        suggestion: m.suggestion,
      })),
    };
  } catch {
    return null;
  } finally {
    release?.();
  }
}

/** The kits the readings on `basis` suggest (no model runs), for the form when there is no assessment. */
export function inferredKits(tankId: number, basis: FitBasis, units: DisplayUnits): KitView[] {
  return kitsFor(readingsIn(tankId, basis), {}, preferredUnits(units)).map((k) => kitView(k, units));
}
