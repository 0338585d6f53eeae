import type { Route } from "./+types/export";
import { requireUser } from "~/permissions.server";
import { ListingRefused, listingRefusedResponse, takeListingTurn } from "~/http/listing-turns.server";
import { journalCsv } from "~/features/journal/journal-csv.server";
import { listJournal } from "~/features/journal/journal.server";
import { requireOwnedTank } from "~/features/tanks/tanks.server";
import { fileSlugFor } from "~/utils/file-name";

/** GET /tanks/:tankId/journal/export — the tank's journal as CSV (it uploads again unchanged). */
export async function loader({ request, params }: Route.LoaderArgs) {
  const user = await requireUser(request);
  const tank = requireOwnedTank(user.id, params.tankId);
  try {
    await takeListingTurn(user.id);
  } catch (error) {
    if (error instanceof ListingRefused) return listingRefusedResponse(error);
    throw error;
  }
  return new Response("\uFEFF" + journalCsv(listJournal(tank.id)), {
    headers: {
      "Content-Type": "text/csv; charset=utf-8",
      "Content-Disposition": `attachment; filename="${fileSlugFor(tank.name)}-journal.csv"`,
      "Cache-Control": "no-store",
    },
  });
}
