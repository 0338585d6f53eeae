import type { Route } from "./+types/replay-csv";
import { replayCsv } from "~/features/journal/replay-csv.server";
import { requireOwnedTank } from "~/features/tanks/tanks.server";
import { ListingRefused, listingRefusedResponse, takeListingTurn } from "~/http/listing-turns.server";
import { refusalOf } from "~/http/refusals.server";
import { keeperNow } from "~/features/accounts/time-zone.server";
import { requireUser } from "~/permissions.server";
import { displayUnitsFor } from "~/utils/display-units";
import { fileSlugFor } from "~/utils/file-name";

/** GET /tanks/:tankId/journal/replay.csv[?scenario=] — the "as it happened" chart's every sample as CSV. */
export async function loader({ request, params }: Route.LoaderArgs) {
  const user = await requireUser(request);
  const tank = requireOwnedTank(user.id, params.tankId);
  let csv: string | null;
  try {
    // A whole replay is a listing: counted before the work, as the journal's own CSV.
    await takeListingTurn(user.id);
    csv = await replayCsv(
      tank,
      new URL(request.url).searchParams.get("scenario"),
      displayUnitsFor(user),
      keeperNow(request, user),
    );
  } catch (error) {
    if (error instanceof ListingRefused) return listingRefusedResponse(error);
    // A limit on runs (429), the model refusing the settings (422): said in words, as the page says it.
    const refused = refusalOf(error);
    if (refused) return plain(refused.message, refused.status);
    throw error;
  }
  if (csv === null) {
    return plain("The journal has nothing to replay: it needs a scenario and at least one entry.", 404);
  }
  return new Response("\uFEFF" + csv, {
    headers: {
      "Content-Type": "text/csv; charset=utf-8",
      "Content-Disposition": `attachment; filename="${fileSlugFor(tank.name)}-as-it-happened.csv"`,
      "Cache-Control": "no-store",
    },
  });
}

function plain(message: string, status: number): Response {
  return new Response(message, {
    status,
    headers: { "Content-Type": "text/plain; charset=utf-8", "Cache-Control": "no-store" },
  });
}
