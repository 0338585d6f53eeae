import { z } from "zod";
import type { Route } from "./+types/preview";
import { parseScenario } from "~models";
import { apiError, apiRoute, json, methodNotAllowed, readJson, zodIssues } from "~/http/api.server";
import { displayKeyFigures, displaySeries } from "~/features/runs/display-figures";
import { resultWarnings } from "~/features/runs/run-warnings";
import { requireApiUser } from "~/permissions.server";
import { unknownSettingKeys } from "~/features/scenarios/settings-patch.server";
import { readStoredSettings, runEngine, withTankTargets } from "~/features/runs/simulation.server";
import { requireOwnedScenarioById } from "~/features/tanks/tanks.server";
import { displayUnitsFor } from "~/utils/display-units";
import { applyWhatIf, WhatIfSchema } from "~/features/runs/what-if.server";

/** Previews are for trying things: at most a year of model time, at most ~1,500 chart points. */
export const PREVIEW_MAX_DAYS = 365;
const MAX_POINTS = 1500;

const BodySchema = z.union([
  z.object({ settings: z.unknown() }).strict(),
  z.object({ scenarioId: z.number().int().positive(), whatIf: WhatIfSchema }).strict(),
]);

/**
 * POST /api/preview — run settings without saving. Body either `{ settings }` (a whole
 * scenario, canonical units) or `{ scenarioId, whatIf }` (changes on top of a saved scenario).
 * `?units=display` answers in the signed-in person's units (what the results page overlays).
 */
export const action = apiRoute(async ({ request }: Route.ActionArgs) => {
  const user = await requireApiUser(request);
  if (request.method !== "POST") return apiError(405, "Use POST to preview.");
  const body = BodySchema.safeParse(await readJson(request));
  if (!body.success) {
    return apiError(400, "Send { settings } or { scenarioId, whatIf }.", zodIssues(body.error));
  }
  let scenario;
  if ("settings" in body.data) {
    const unknown = unknownSettingKeys(body.data.settings);
    if (unknown.length) {
      return apiError(
        400,
        `The settings have names Fernwater does not know: ${unknown.join(", ")}.`,
        unknown.map((path) => ({ path: `settings.${path}`, message: "Unknown setting." })),
      );
    }
    const parsed = parseScenario(body.data.settings ?? {});
    if (!parsed.success) {
      return apiError(
        400,
        "The settings are not valid.",
        zodIssues(parsed.error).map((i) => ({ ...i, path: `settings.${i.path}` })),
      );
    }
    if (parsed.data.run.lengthDays > PREVIEW_MAX_DAYS) {
      return apiError(400, `Previews run at most ${PREVIEW_MAX_DAYS} days; save the scenario to run longer.`, [
        { path: "settings.run.lengthDays", message: `At most ${PREVIEW_MAX_DAYS} days in a preview.` },
      ]);
    }
    scenario = parsed.data;
  } else {
    const { scenarioId, whatIf } = body.data;
    const { tank, scenario: row } = requireOwnedScenarioById(user.id, String(scenarioId));
    const saved = readStoredSettings(row.settings);
    if (!saved) return apiError(409, "The saved settings can no longer be read.");
    const changed = withTankTargets(applyWhatIf(saved, whatIf), tank);
    const parsed = parseScenario(changed);
    if (!parsed.success) return apiError(400, "Those changes make the settings invalid.", zodIssues(parsed.error));
    scenario = {
      ...parsed.data,
      run: { ...parsed.data.run, lengthDays: Math.min(parsed.data.run.lengthDays, PREVIEW_MAX_DAYS) },
    };
  }
  const interval = Math.max(scenario.run.outputIntervalDays, scenario.run.lengthDays / MAX_POINTS);
  // Counted against the person's previews a minute and runs in flight (app/features/runs/run-gate.server.ts).
  const result = await runEngine(
    { ...scenario, run: { ...scenario.run, outputIntervalDays: Math.min(7, interval) } },
    { userId: user.id, purpose: "preview" },
  );
  const display = new URL(request.url).searchParams.get("units") === "display";
  if (display) {
    const units = displayUnitsFor(user);
    return json({
      units: "display",
      keyFigures: displayKeyFigures(result.keyFigures, units),
      series: displaySeries(result.series, units),
      lengthDays: scenario.run.lengthDays,
      warnings: resultWarnings(
        {
          keyFigures: result.keyFigures,
          warnings: result.warnings,
          tapWater: scenario.tapWater,
          volumeL: scenario.water.volumeL,
        },
        units,
      ),
    });
  }
  return json({
    units: "canonical",
    keyFigures: result.keyFigures,
    warnings: result.warnings,
    budget: result.budget,
    events: result.events,
    series: result.series,
    stats: result.stats,
  });
});

/** POST /api/preview only. Any other method: 405 in the API's JSON shape. */
export function loader() {
  return methodNotAllowed(["POST"]);
}
