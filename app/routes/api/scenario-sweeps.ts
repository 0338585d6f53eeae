import type { Route } from "./+types/scenario-sweeps";
import { startJob } from "~/features/jobs/jobs.server";
import { apiError, apiRoute, json, readJson, zodIssues } from "~/http/api.server";
import { JOB_LIMITS } from "~/features/jobs/job-limits.server";
import { jobAccepted, requireApiScenario } from "~/features/scenarios/scenario-api.server";
import { leverJson, sweepJob, SWEEP_OUTCOMES, sweepInputSchema, sweepLevers } from "~/features/sweeps/sweeps.server";
import { displayUnitsFor } from "~/utils/display-units";

async function sweepable(request: Request, scenarioIdParam: string | undefined) {
  const { user, row, scenario } = await requireApiScenario(request, scenarioIdParam);
  const units = displayUnitsFor(user);
  return { user, row, scenario, units, levers: sweepLevers(scenario) };
}

/** GET /api/scenarios/:scenarioId/sweeps: the settings (with bounds, in your units) and outcomes a sweep can use. */
export const loader = apiRoute(async ({ request, params }: Route.LoaderArgs) => {
  const { user, levers, units } = await sweepable(request, params.scenarioId);
  return json({
    settings: levers.map((l) => leverJson(l, units)),
    outcomes: SWEEP_OUTCOMES,
    maxPoints: JOB_LIMITS.sweepPoints[user.role],
  });
});

/**
 * POST /api/scenarios/:scenarioId/sweeps `{ setting, from, to, points, outcome }` (your units):
 * starts a sweep; 202 with the job to poll at /api/jobs/:id.
 */
export const action = apiRoute(async ({ request, params }: Route.ActionArgs) => {
  if (request.method !== "POST") return apiError(405, "Use POST to start a sweep.");
  const { user, row, scenario, units, levers } = await sweepable(request, params.scenarioId);
  const input = sweepInputSchema(levers, units, user.role).safeParse(await readJson(request, 16 * 1024));
  if (!input.success) return apiError(400, "The sweep is not valid.", zodIssues(input.error));
  return jobAccepted(startJob(sweepJob(user, row.id, scenario, input.data, units)));
});
