import type { Route } from "./+types/scenario-sweeps";
import { apiError, apiFind, json, readJson, zodIssues } from "~/api.server";
import { JOB_LIMITS, jobJson, JobRefused } from "~/jobs.server";
import { requireApiUser } from "~/permissions.server";
import { readStoredSettings, withTankTargets } from "~/simulation.server";
import { leverJson, startSweep, SWEEP_OUTCOMES, sweepInputSchema, sweepLevers } from "~/sweeps.server";
import { requireOwnedScenarioById } from "~/tanks.server";
import { displayUnitsFor } from "~/utils/display-units";

async function sweepable(request: Request, scenarioIdParam: string | undefined) {
  const user = await requireApiUser(request);
  const { tank, scenario: row } = apiFind(
    () => requireOwnedScenarioById(user.id, scenarioIdParam),
    "There is no such scenario among yours.",
  );
  const settings = readStoredSettings(row.settings);
  if (!settings) throw apiError(409, "The saved settings can no longer be read; update the scenario first.");
  const units = displayUnitsFor(user);
  const scenario = withTankTargets(settings, tank);
  return { user, row, scenario, units, levers: sweepLevers(scenario, units) };
}

/** GET /api/scenarios/:scenarioId/sweeps: the settings (with bounds, in your units) and outcomes a sweep can use. */
export async function loader({ request, params }: Route.LoaderArgs) {
  const { user, levers, units } = await sweepable(request, params.scenarioId);
  return json({
    settings: levers.map((l) => leverJson(l, units)),
    outcomes: SWEEP_OUTCOMES,
    maxPoints: JOB_LIMITS.sweepPoints[user.role],
  });
}

/**
 * POST /api/scenarios/:scenarioId/sweeps `{ setting, from, to, points, outcome }` (your units):
 * starts a sweep; 202 with the job to poll at /api/jobs/:id.
 */
export async function action({ request, params }: Route.ActionArgs) {
  if (request.method !== "POST") return apiError(405, "Use POST to start a sweep.");
  const { user, row, scenario, units, levers } = await sweepable(request, params.scenarioId);
  const input = sweepInputSchema(levers, units, user.role).safeParse(await readJson(request, 16 * 1024));
  if (!input.success) return apiError(400, "The sweep is not valid.", zodIssues(input.error));
  try {
    const job = startSweep(user, row.id, scenario, input.data, units);
    return json({ job: jobJson(job), links: { progress: `/api/jobs/${job.id}` } }, { status: 202 });
  } catch (error) {
    if (error instanceof JobRefused) return apiError(error.status, error.message);
    throw error;
  }
}
