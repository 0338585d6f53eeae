import type { Route } from "./+types/scenario-calibrations";
import { apiError, apiFind, json, readJson, zodIssues } from "~/api.server";
import { CalibrateInputSchema, startCalibration } from "~/calibration.server";
import { jobJson, JobRefused } from "~/jobs.server";
import { requireApiUser } from "~/permissions.server";
import { modelStartMs } from "~/readings.server";
import { readStoredSettings, withTankTargets } from "~/simulation.server";
import { requireOwnedScenarioById } from "~/tanks.server";
import { displayUnitsFor } from "~/utils/display-units";

/**
 * POST /api/scenarios/:scenarioId/calibrations `{ fit: ["feedLoad", "plantUptake", "nitrifierCapacity"] }`:
 * fits those multipliers to the tank's readings within the scenario's run; 202 with the job to
 * poll at /api/jobs/:id.
 */
export async function action({ request, params }: Route.ActionArgs) {
  if (request.method !== "POST") return apiError(405, "Use POST to start a calibration.");
  const user = await requireApiUser(request);
  const { tank, scenario: row } = apiFind(
    () => requireOwnedScenarioById(user.id, params.scenarioId),
    "There is no such scenario among yours.",
  );
  const settings = readStoredSettings(row.settings);
  if (!settings) return apiError(409, "The saved settings can no longer be read; update the scenario first.");
  const input = CalibrateInputSchema.safeParse(await readJson(request, 4 * 1024));
  if (!input.success) return apiError(400, "The calibration is not valid.", zodIssues(input.error));
  try {
    const job = startCalibration(
      user,
      row,
      tank.id,
      withTankTargets(settings, tank),
      modelStartMs(row),
      input.data.fit,
      displayUnitsFor(user),
    );
    return json({ job: jobJson(job), links: { progress: `/api/jobs/${job.id}` } }, { status: 202 });
  } catch (error) {
    if (error instanceof JobRefused) return apiError(error.status, error.message);
    throw error;
  }
}
