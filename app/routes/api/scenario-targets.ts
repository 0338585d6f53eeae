import type { Route } from "./+types/scenario-targets";
import { startJob } from "~/features/jobs/jobs.server";
import { apiError, apiRoute, methodNotAllowed, readJson, zodIssues } from "~/http/api.server";
import { jobAccepted, requireApiScenario } from "~/features/scenarios/scenario-api.server";
import { targetSearchJob, TargetInputSchema } from "~/features/sweeps/target-finder.server";
import { displayUnitsFor } from "~/utils/display-units";

/**
 * POST /api/scenarios/:scenarioId/targets `{ nitrateMax, nh3Max, lever, intervalDays?, fractionPercent? }`
 * (goals in your units, either may be null): searches for the least change of `lever` that meets
 * the goal; 202 with the job to poll at /api/jobs/:id.
 */
export const action = apiRoute(async ({ request, params }: Route.ActionArgs) => {
  if (request.method !== "POST") return apiError(405, "Use POST to start a target search.");
  const { user, row, scenario } = await requireApiScenario(request, params.scenarioId);
  const input = TargetInputSchema.safeParse(await readJson(request, 4 * 1024));
  if (!input.success) return apiError(400, "The target search is not valid.", zodIssues(input.error));
  return jobAccepted(startJob(targetSearchJob(user, row.id, scenario, input.data, displayUnitsFor(user))));
});

/** Target searches are started with POST; poll /api/jobs/:id for them. Any other method: 405 in the API's JSON shape. */
export function loader() {
  return methodNotAllowed(["POST"]);
}
