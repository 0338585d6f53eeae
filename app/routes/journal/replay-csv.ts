import type { Route } from "./+types/replay-csv";
import { replayCsv } from "~/features/journal/replay-csv.server";
import { requireOwnedTank } from "~/features/tanks/tanks.server";
import { csvAttachment, plainText } from "~/http/downloads.server";
import { downloadTurn } from "~/http/listing-turns.server";
import { refusalOf } from "~/http/refusals.server";
import { keeperNow } from "~/features/accounts/time-zone.server";
import { requireUser } from "~/permissions.server";
import { displayUnitsFor } from "~/utils/display-units";
import { fileSlugFor } from "~/utils/file-name";

/** GET /tanks/:tankId/journal/replay.csv[?scenario=] — the "as it happened" chart's every sample as CSV. */
export async function loader({ request, params }: Route.LoaderArgs) {
  const user = await requireUser(request);
  const tank = requireOwnedTank(user.id, params.tankId);
  // A whole replay is a listing: counted before the work, as the journal's own CSV.
  const turnRefused = await downloadTurn(user.id);
  if (turnRefused) return turnRefused;
  let csv: string | null;
  try {
    csv = await replayCsv(
      tank,
      new URL(request.url).searchParams.get("scenario"),
      displayUnitsFor(user),
      keeperNow(request, user),
    );
  } catch (error) {
    // A limit on runs (429), the model refusing the settings (422): said in words, as the page says it.
    const refused = refusalOf(error);
    if (refused) return plainText(refused.message, refused.status);
    throw error;
  }
  if (csv === null)
    return plainText("The journal has nothing to replay: it needs a scenario and at least one entry.", 404);
  return csvAttachment(csv, `${fileSlugFor(tank.name)}-as-it-happened.csv`);
}
