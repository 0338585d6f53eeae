import type { Route } from "./+types/scenario";
import { apiError, apiRoute, json, readJson, zodIssues } from "~/http/api.server";
import { getDb } from "~/db/client.server";
import { scenarios } from "~/db/schema";
import { eq } from "drizzle-orm";
import { requireApiUser } from "~/permissions.server";
import {
  ScenarioPatchSchema,
  requireValidSettings,
  saveScenarioWithRun,
  scenarioJson,
} from "~/features/scenarios/scenario-api.server";
import { mergeSettings } from "~/features/scenarios/settings-patch.server";
import { readStoredSettings } from "~/features/runs/simulation.server";
import { requireOwnedScenarioById } from "~/features/tanks/tanks.server";
import { lessonCopyPath } from "~/features/classes/classes.server";

/** GET /api/scenarios/:scenarioId */
export const loader = apiRoute(async ({ request, params }: Route.LoaderArgs) => {
  const user = await requireApiUser(request);
  const { scenario } = requireOwnedScenarioById(user.id, params.scenarioId);
  return json({ scenario: scenarioJson(scenario) });
});

/**
 * PUT or PATCH /api/scenarios/:scenarioId { name?, settings? }: update, validate and re-run.
 * PUT replaces the settings (what is left out takes its default); PATCH merges the settings sent
 * into the saved ones (what is left out stays as it was).
 */
export const action = apiRoute(async ({ request, params }: Route.ActionArgs) => {
  const user = await requireApiUser(request);
  const { tank, scenario } = requireOwnedScenarioById(user.id, params.scenarioId);
  if (request.method !== "PUT" && request.method !== "PATCH")
    return apiError(405, "Use PUT or PATCH to update a scenario.");
  const lessonPath = lessonCopyPath(scenario.id);
  if (lessonPath)
    return apiError(
      409,
      `This scenario is a lesson copy: change it on its lesson page, ${lessonPath}, where the lesson's locks apply.`,
    );
  const body = ScenarioPatchSchema.safeParse(await readJson(request));
  if (!body.success) return apiError(400, "The body is not valid.", zodIssues(body.error));
  const saved = readStoredSettings(scenario.settings);
  let settings;
  if (body.data.settings === undefined) settings = saved;
  else if (request.method === "PATCH") {
    if (!saved) return apiError(409, "The saved settings can no longer be read; send the whole settings with PUT.");
    if (body.data.settings === null || typeof body.data.settings !== "object" || Array.isArray(body.data.settings)) {
      return apiError(400, "settings must be an object of the settings to change.", [
        { path: "settings", message: "Send an object." },
      ]);
    }
    // Laid over the saved ones; a name the scenario does not have is refused by name.
    settings = requireValidSettings(mergeSettings(saved, body.data.settings));
  } else settings = requireValidSettings(body.data.settings);
  if (!settings) return apiError(409, "The saved settings can no longer be read; send new settings.");
  await saveScenarioWithRun(tank, scenario.id, body.data.name ?? scenario.name, settings);
  const row = getDb().select().from(scenarios).where(eq(scenarios.id, scenario.id)).get()!;
  return json({ scenario: scenarioJson(row) });
});
