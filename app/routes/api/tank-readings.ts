import type { Route } from "./+types/tank-readings";
import { apiRoute, json, methodNotAllowed } from "~/http/api.server";
import { requireApiUser } from "~/permissions.server";
import { takeListingTurn } from "~/http/listing-turns.server";
import { allReadings } from "~/features/readings/readings.server";
import { requireOwnedTank } from "~/features/tanks/tanks.server";

/** GET /api/tanks/:tankId/readings: the tank's test readings, oldest first, canonical units (mg N/L, dKH, °C). */
export const loader = apiRoute(async ({ request, params }: Route.LoaderArgs) => {
  const user = await requireApiUser(request);
  const tank = requireOwnedTank(user.id, params.tankId);
  await takeListingTurn(user.id);
  return json({
    tankId: tank.id,
    readings: allReadings(tank.id).map((r) => ({
      id: r.id,
      takenAt: r.takenAt.toISOString(),
      tanMgNPerL: r.tan,
      nitriteMgNPerL: r.nitrite,
      nitrateMgNPerL: r.nitrate,
      ph: r.ph,
      khDkh: r.kh,
      temperatureC: r.temperatureC,
      note: r.note,
    })),
  });
});

/** Readings are added on the readings page (form or CSV). Any other method: 405 in the API's JSON shape. */
export function action() {
  return methodNotAllowed(["GET"]);
}
