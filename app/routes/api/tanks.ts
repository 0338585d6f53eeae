import { asc, eq } from "drizzle-orm";
import type { Route } from "./+types/tanks";
import { apiRoute, json, methodNotAllowed } from "~/http/api.server";
import { getDb } from "~/db/client.server";
import { tanks } from "~/db/schema";
import { requireApiUser } from "~/permissions.server";

/** GET /api/tanks: the signed-in keeper's tanks. */
export const loader = apiRoute(async ({ request }: Route.LoaderArgs) => {
  const user = await requireApiUser(request);
  const list = getDb()
    .select({
      id: tanks.id,
      name: tanks.name,
      notes: tanks.notes,
      nitrateTargetLowMgN: tanks.nitrateTargetLow,
      nitrateTargetHighMgN: tanks.nitrateTargetHigh,
      createdAt: tanks.createdAt,
      updatedAt: tanks.updatedAt,
    })
    .from(tanks)
    .where(eq(tanks.ownerId, user.id))
    .orderBy(asc(tanks.id))
    .all();
  return json({ tanks: list });
});

/** Tanks are made on the tanks page. Any other method: 405 in the API's JSON shape. */
export function action() {
  return methodNotAllowed(["GET"]);
}
