import type { Route } from "./+types/export";
import { requireUser } from "~/permissions.server";
import { csvAttachment } from "~/http/downloads.server";
import { downloadTurn } from "~/http/listing-turns.server";
import { journalCsvOffThread } from "~/features/jobs/chores-pool.server";
import { journalOf } from "~/features/journal/journal.server";
import { requireOwnedTank } from "~/features/tanks/tanks.server";
import { fileSlugFor } from "~/utils/file-name";

/** GET /tanks/:tankId/journal/export — the tank's journal as CSV (it uploads again unchanged). */
export async function loader({ request, params }: Route.LoaderArgs) {
  const user = await requireUser(request);
  const tank = requireOwnedTank(user.id, params.tankId);
  const refused = await downloadTurn(user.id);
  if (refused) return refused;
  return csvAttachment(await journalCsvOffThread(journalOf(tank)), `${fileSlugFor(tank.name)}-journal.csv`);
}
