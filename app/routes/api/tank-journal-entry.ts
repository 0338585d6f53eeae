import type { Route } from "./+types/tank-journal-entry";
import { apiError, apiRoute, json, methodNotAllowed, readJson } from "~/http/api.server";
import { keeperNow } from "~/features/accounts/time-zone.server";
import { notFound, requireApiUser } from "~/permissions.server";
import { deleteEntry, entryJson, journalEntry, readEntry, updateEntry } from "~/features/journal/journal.server";
import { entryFields } from "~/features/journal/journal-entries";
import { parseId, requireOwnedTank } from "~/features/tanks/tanks.server";

/** GET is not offered on one entry (the list has them all): 405 in the API's JSON shape. */
export function loader() {
  return methodNotAllowed(["PATCH", "DELETE"]);
}

/**
 * PATCH /api/tanks/:tankId/journal/:entryId: change an entry (fields not sent keep their value);
 * DELETE: remove it. Someone else's tank or entry: 404.
 */
export const action = apiRoute(async ({ request, params }: Route.ActionArgs) => {
  const user = await requireApiUser(request);
  const tank = requireOwnedTank(user.id, params.tankId);
  const id = parseId(params.entryId);
  const entry = journalEntry(tank.id, id) ?? notFound("No such journal entry.");
  if (request.method === "DELETE") {
    deleteEntry(tank.id, entry.id);
    return new Response(null, { status: 204 });
  }
  if (request.method !== "PATCH") return methodNotAllowed(["PATCH", "DELETE"]);
  const body = await readJson(request);
  if (typeof body !== "object" || body === null || Array.isArray(body))
    return apiError(400, "The body must be a JSON object.");
  const patch = body as Record<string, unknown>;
  const kindChanged = typeof patch.kind === "string" && patch.kind !== entry.kind;
  // Keep the entry's own fields unless the kind changes (a new kind brings its own fields).
  const base = {
    date: new Date(entry.doneAt).toISOString(),
    kind: entry.kind,
    note: entry.note,
    ...(kindChanged ? {} : entryFields(entry.kind, entry.details)),
  };
  const read = readEntry({ ...base, ...patch }, keeperNow(request, user));
  if (!read.ok)
    return apiError(
      400,
      "The entry is not valid.",
      Object.entries(read.errors).map(([path, message]) => ({ path, message })),
    );
  updateEntry(tank.id, entry.id, read.entry);
  return json({ entry: entryJson(journalEntry(tank.id, id)!) });
});
