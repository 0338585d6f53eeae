import type { Route } from "./+types/export";
import { requireUser } from "~/permissions.server";
import { fileSlugFor } from "~/utils/file-name";
import { scenarioFile } from "~/features/scenarios/scenario-file.server";
import { readStoredSettings } from "~/features/runs/simulation.server";
import { requireOwnedScenario } from "~/features/tanks/tanks.server";

/** GET …/scenarios/:scenarioId/export — the scenario as a JSON file to keep or share. */
export async function loader({ request, params }: Route.LoaderArgs) {
  const user = await requireUser(request);
  const { scenario } = requireOwnedScenario(user.id, params.tankId, params.scenarioId);
  const settings = readStoredSettings(scenario.settings);
  if (!settings) throw new Response("The saved settings can no longer be read.", { status: 409 });
  const body = JSON.stringify(scenarioFile(scenario.name, settings, new Date()), null, 2);
  return new Response(body, {
    headers: {
      "Content-Type": "application/json; charset=utf-8",
      "Content-Disposition": `attachment; filename="${fileSlugFor(scenario.name)}.fernwater.json"`,
      "Cache-Control": "no-store",
    },
  });
}
