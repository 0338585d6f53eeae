import type { Route } from "./+types/scenario-run";
import { apiError, apiRoute, json } from "~/http/api.server";
import { requireApiUser } from "~/permissions.server";
import { runSummaryJson, write } from "~/features/scenarios/scenario-api.server";
import {
  findRun,
  getRun,
  insertRun,
  readStoredSettings,
  runEngineForStorage,
  settingsHash,
  withTankTargets,
} from "~/features/runs/simulation.server";
import { requireOwnedScenarioById } from "~/features/tanks/tanks.server";

async function currentRun(request: Request, scenarioIdParam: string | undefined, runIfMissing: boolean) {
  const user = await requireApiUser(request);
  const { tank, scenario } = requireOwnedScenarioById(user.id, scenarioIdParam);
  const settings = readStoredSettings(scenario.settings);
  if (!settings) throw apiError(409, "The saved settings can no longer be read; update the scenario first.");
  const withTargets = withTankTargets(settings, tank);
  const hash = settingsHash(withTargets);
  const existing = findRun(scenario.id, hash);
  if (existing) return { run: existing, reused: true };
  if (!runIfMissing) throw apiError(404, "This scenario has no run for its current settings yet: POST to run it.");
  const fresh = await runEngineForStorage(withTargets, { userId: user.id, purpose: "save" });
  const id = write((tx) => insertRun(tx, scenario.id, hash, fresh));
  return { run: getRun(id)!, reused: false };
}

/** GET /api/scenarios/:scenarioId/run: the run of the current settings (404 if not run yet). */
export const loader = apiRoute(async ({ request, params }: Route.LoaderArgs) => {
  const { run } = await currentRun(request, params.scenarioId, false);
  return json({ run: runSummaryJson(run), reused: true });
});

/** POST /api/scenarios/:scenarioId/run: run it (or reuse the stored run of unchanged settings). */
export const action = apiRoute(async ({ request, params }: Route.ActionArgs) => {
  if (request.method !== "POST") return apiError(405, "Use POST to run a scenario.");
  const { run, reused } = await currentRun(request, params.scenarioId, true);
  return json({ run: runSummaryJson(run), reused }, { status: reused ? 200 : 201 });
});
