import type { Route } from "./+types/tank-plan";
import { apiError, apiRoute, json, methodNotAllowed, readJson } from "~/http/api.server";
import { requireApiUser } from "~/permissions.server";
import { resetPlan, savePlan, tankPlan } from "~/features/tanks/maintenance-plan.server";
import { planJson, readPlanBody } from "~/features/tanks/plan-api.server";
import { requireOwnedTank } from "~/features/tanks/tanks.server";

/** GET /api/tanks/:tankId/plan: the plan in force (`source`: "plan" when edited, else "scenario"). */
export const loader = apiRoute(async ({ request, params }: Route.LoaderArgs) => {
  const user = await requireApiUser(request);
  const tank = requireOwnedTank(user.id, params.tankId);
  return json(planJson(tank.id, tankPlan(tank.id)));
});

/**
 * PUT /api/tanks/:tankId/plan: replace the plan (the plan page's fields, all of them); DELETE:
 * back to the scenario's timetable. Both answer the plan in force afterwards. Someone else's tank: 404.
 */
export const action = apiRoute(async ({ request, params }: Route.ActionArgs) => {
  if (request.method !== "PUT" && request.method !== "DELETE") return methodNotAllowed(["PUT", "DELETE"]);
  const user = await requireApiUser(request);
  const tank = requireOwnedTank(user.id, params.tankId);
  if (request.method === "DELETE") {
    resetPlan(tank.id);
    return json(planJson(tank.id, tankPlan(tank.id)));
  }
  const body = await readJson(request, 16 * 1024);
  if (typeof body !== "object" || body === null || Array.isArray(body))
    return apiError(400, "The body must be a JSON object.");
  const tp = tankPlan(tank.id);
  if (!tp) return apiError(409, "This tank has no scenario yet: make one first, its timetable is the plan.");
  const read = readPlanBody(body as Record<string, unknown>, tp);
  if (!read.ok)
    return apiError(
      400,
      "The plan is not valid.",
      Object.entries(read.errors).map(([path, message]) => ({ path, message })),
    );
  savePlan(tank.id, tp.scenario.id, read.plan);
  return json(planJson(tank.id, tankPlan(tank.id)));
});
