import type { Route } from "./+types/scenario-calibrations";
import { startJob } from "~/features/jobs/jobs.server";
import { apiError, apiRoute, methodNotAllowed, readJson, zodIssues } from "~/http/api.server";
import { calibrationJob } from "~/features/calibration/calibration.server";
import { CalibrateInputSchema } from "~/features/calibration/calibration-input.server";
import { scenarioBases } from "~/features/calibration/calibration-basis.server";
import { modelStartMs } from "~/features/readings/readings.server";
import { jobAccepted, requireApiScenario } from "~/features/scenarios/scenario-api.server";
import { displayUnitsFor } from "~/utils/display-units";

/**
 * POST /api/scenarios/:scenarioId/calibrations `{ fit: ["feedLoad", "plantUptake", "nitrifierCapacity"], kits?, schedule? }`
 * (`kits`: per species `{ kind: "exact" }`, `{ kind: "steps", unit, step }` or `{ kind: "card", unit, values }`;
 * a species left out is read with the kit its values suggest):
 * fits those multipliers to the tank's readings — against the tank's journal as it happened
 * (`schedule: "journal"`, the default when the journal has entries, as on the page) or the
 * scenario's periodic schedule (`"periodic"`); 202 with the job to poll at /api/jobs/:id.
 */
export const action = apiRoute(async ({ request, params }: Route.ActionArgs) => {
  if (request.method !== "POST") return apiError(405, "Use POST to start a calibration.");
  const { user, tank, row, scenario } = await requireApiScenario(request, params.scenarioId);
  const input = CalibrateInputSchema.safeParse(await readJson(request, 4 * 1024));
  if (!input.success) return apiError(400, "The calibration is not valid.", zodIssues(input.error));
  const { replay, basisFor } = scenarioBases(tank, scenario, modelStartMs(row));
  if (input.data.schedule === "journal" && !replay)
    return apiError(400, "The calibration is not valid.", [
      { path: "schedule", message: "This tank's journal is empty: log what you did first." },
    ]);
  return jobAccepted(
    startJob(
      calibrationJob(
        user,
        row,
        tank.id,
        basisFor(input.data.schedule),
        input.data.fit,
        displayUnitsFor(user),
        input.data.kits,
      ),
    ),
  );
});

/** Calibrations are started with POST; poll /api/jobs/:id for them. Any other method: 405 in the API's JSON shape. */
export function loader() {
  return methodNotAllowed(["POST"]);
}
