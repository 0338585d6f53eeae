import type { Route } from "./+types/template";
import { keeperNow } from "~/features/accounts/time-zone.server";
import { requireUser } from "~/permissions.server";
import { templateCsv } from "~/features/readings/readings-csv-export.server";
import { measureUnitsFor } from "~/features/readings/readings.server";
import { requireOwnedTank } from "~/features/tanks/tanks.server";
import { displayUnitsFor } from "~/utils/display-units";
import { csvAttachment } from "~/http/downloads.server";

/** GET /tanks/:tankId/readings/template — a CSV template in the person's units, with three example rows to overwrite. */
export async function loader({ request, params }: Route.LoaderArgs) {
  const user = await requireUser(request);
  requireOwnedTank(user.id, params.tankId);
  return csvAttachment(
    templateCsv(measureUnitsFor(displayUnitsFor(user)), keeperNow(request, user)),
    "fernwater-readings-template.csv",
  );
}
