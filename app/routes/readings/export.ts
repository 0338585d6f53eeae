import type { Route } from "./+types/export";
import { requireUser } from "~/permissions.server";
import { ListingRefused, listingRefusedResponse, takeListingTurn } from "~/http/listing-turns.server";
import { readingsCsv } from "~/features/readings/readings-csv-export.server";
import { allReadings, measureUnitsFor } from "~/features/readings/readings.server";
import { requireOwnedTank } from "~/features/tanks/tanks.server";
import { displayUnitsFor } from "~/utils/display-units";
import { fileSlugFor } from "~/utils/file-name";

/** GET /tanks/:tankId/readings/export — every reading of the tank as CSV, in the person's units (it uploads again unchanged). */
export async function loader({ request, params }: Route.LoaderArgs) {
  const user = await requireUser(request);
  const tank = requireOwnedTank(user.id, params.tankId);
  try {
    await takeListingTurn(user.id);
  } catch (error) {
    if (error instanceof ListingRefused) return listingRefusedResponse(error);
    throw error;
  }
  const body = "\uFEFF" + readingsCsv(allReadings(tank.id), measureUnitsFor(displayUnitsFor(user)));
  return new Response(body, {
    headers: {
      "Content-Type": "text/csv; charset=utf-8",
      "Content-Disposition": `attachment; filename="${fileSlugFor(tank.name)}-readings.csv"`,
      "Cache-Control": "no-store",
    },
  });
}
