import type { Route } from "./+types/tank-scenarios";
import { apiError, apiRoute, json, readJson, zodIssues } from "~/http/api.server";
import { requireApiUser } from "~/permissions.server";
import {
  ScenarioBodySchema,
  requireValidSettings,
  saveScenarioWithRun,
  scenarioJson,
} from "~/features/scenarios/scenario-api.server";
import { listScenarios, requireOwnedTank } from "~/features/tanks/tanks.server";
import { getDb } from "~/db/client.server";
import { scenarios } from "~/db/schema";
import { eq } from "drizzle-orm";

/** GET /api/tanks/:tankId/scenarios: the tank's scenarios (settings included). */
export const loader = apiRoute(async ({ request, params }: Route.LoaderArgs) => {
  const user = await requireApiUser(request);
  const tank = requireOwnedTankForApi(user.id, params.tankId);
  return json({ scenarios: listScenarios(tank.id).map(scenarioJson) });
});

/** POST /api/tanks/:tankId/scenarios: create a scenario { name, settings } and run it. */
export const action = apiRoute(async ({ request, params }: Route.ActionArgs) => {
  const user = await requireApiUser(request);
  const tank = requireOwnedTankForApi(user.id, params.tankId);
  if (request.method !== "POST") return apiError(405, "Use POST to create a scenario.");
  const body = ScenarioBodySchema.safeParse(await readJson(request));
  if (!body.success) return apiError(400, "The body is not valid.", zodIssues(body.error));
  const settings = requireValidSettings(body.data.settings);
  const id = await saveScenarioWithRun(tank, "new", body.data.name, settings);
  const row = getDb().select().from(scenarios).where(eq(scenarios.id, id)).get()!;
  return json({ scenario: scenarioJson(row), links: { run: `/api/scenarios/${id}/run` } }, { status: 201 });
});

function requireOwnedTankForApi(userId: number, tankId: string | undefined) {
  return requireOwnedTank(userId, tankId);
}
