import type { Route } from "./+types/export";
import { requireUser } from "~/permissions.server";
import { csvAttachment } from "~/http/downloads.server";
import { downloadTurn } from "~/http/listing-turns.server";
import { readingsCsvOffThread } from "~/features/jobs/chores-pool.server";
import { allReadings, measureUnitsFor } from "~/features/readings/readings.server";
import { requireOwnedTank } from "~/features/tanks/tanks.server";
import { displayUnitsFor } from "~/utils/display-units";
import { fileSlugFor } from "~/utils/file-name";

/** GET /tanks/:tankId/readings/export — every reading of the tank as CSV, in the person's units (it uploads again unchanged). */
export async function loader({ request, params }: Route.LoaderArgs) {
  const user = await requireUser(request);
  const tank = requireOwnedTank(user.id, params.tankId);
  const refused = await downloadTurn(user.id);
  if (refused) return refused;
  return csvAttachment(
    await readingsCsvOffThread(allReadings(tank.id), measureUnitsFor(displayUnitsFor(user))),
    `${fileSlugFor(tank.name)}-readings.csv`,
  );
}
