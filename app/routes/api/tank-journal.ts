import type { Route } from "./+types/tank-journal";
import { apiError, apiRoute, json, readJson } from "~/http/api.server";
import { keeperNow } from "~/features/accounts/time-zone.server";
import { requireApiUser } from "~/permissions.server";
import { takeListingTurn } from "~/http/listing-turns.server";
import { addEntries, entryJson, journalEntry, listJournal, readEntry } from "~/features/journal/journal.server";
import { requireOwnedTank } from "~/features/tanks/tanks.server";

/** GET /api/tanks/:tankId/journal: the tank's journal, oldest first, canonical units. */
export const loader = apiRoute(async ({ request, params }: Route.LoaderArgs) => {
  const user = await requireApiUser(request);
  const tank = requireOwnedTank(user.id, params.tankId);
  await takeListingTurn(user.id);
  return json({ tankId: tank.id, entries: listJournal(tank.id).map(entryJson) });
});

/** POST /api/tanks/:tankId/journal: add an entry { date, kind, …the kind's fields, note }. */
export const action = apiRoute(async ({ request, params }: Route.ActionArgs) => {
  const user = await requireApiUser(request);
  const tank = requireOwnedTank(user.id, params.tankId);
  if (request.method !== "POST") return apiError(405, "Use POST to add a journal entry.");
  const body = await readJson(request);
  if (typeof body !== "object" || body === null || Array.isArray(body))
    return apiError(400, "The body must be a JSON object.");
  const read = readEntry(body as Record<string, unknown>, keeperNow(request, user));
  if (!read.ok)
    return apiError(
      400,
      "The entry is not valid.",
      Object.entries(read.errors).map(([path, message]) => ({ path, message })),
    );
  const [id] = addEntries(tank.id, [read.entry]);
  const entry = journalEntry(tank.id, id)!;
  return json({ entry: entryJson(entry) }, { status: 201 });
});
