import type { Route } from "./+types/scenario-targets";
import { apiError, apiFind, json, readJson, zodIssues } from "~/api.server";
import { jobJson, JobRefused } from "~/jobs.server";
import { requireApiUser } from "~/permissions.server";
import { readStoredSettings, withTankTargets } from "~/simulation.server";
import { startTargetSearch, TargetInputSchema } from "~/target-finder.server";
import { requireOwnedScenarioById } from "~/tanks.server";
import { displayUnitsFor } from "~/utils/display-units";

/**
 * POST /api/scenarios/:scenarioId/targets `{ nitrateMax, nh3Max, lever, intervalDays?, fractionPercent? }`
 * (goals in your units, either may be null): searches for the least change of `lever` that meets
 * the goal; 202 with the job to poll at /api/jobs/:id.
 */
export async function action({ request, params }: Route.ActionArgs) {
  if (request.method !== "POST") return apiError(405, "Use POST to start a target search.");
  const user = await requireApiUser(request);
  const { tank, scenario: row } = apiFind(
    () => requireOwnedScenarioById(user.id, params.scenarioId),
    "There is no such scenario among yours.",
  );
  const settings = readStoredSettings(row.settings);
  if (!settings) return apiError(409, "The saved settings can no longer be read; update the scenario first.");
  const input = TargetInputSchema.safeParse(await readJson(request, 4 * 1024));
  if (!input.success) return apiError(400, "The target search is not valid.", zodIssues(input.error));
  try {
    const job = startTargetSearch(user, row.id, withTankTargets(settings, tank), input.data, displayUnitsFor(user));
    return json({ job: jobJson(job), links: { progress: `/api/jobs/${job.id}` } }, { status: 202 });
  } catch (error) {
    if (error instanceof JobRefused) return apiError(error.status, error.message);
    throw error;
  }
}
