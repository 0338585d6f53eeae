/**
 * The journal's entries are kept per journal version (journal.server.ts `journalOf`): every
 * write, by any path, must move the version so a kept list is never served stale (our own check
 * of the trigger in drizzle/0014 together with the cache).
 */
import { eq } from "drizzle-orm";
import { describe, expect, it } from "vitest";
import { getDb } from "~/db/client.server";
import { tanks } from "~/db/schema";
import { journalEntries } from "~/db/schema-care";
import { addEntries, deleteEntry, journalOf, updateEntry } from "~/features/journal/journal.server";
import { createTank } from "../support/tanks";
import { userWithCookie } from "../support/users";
import { DAY } from "../support/journal";

const tankRow = (id: number) => getDb().select().from(tanks).where(eq(tanks.id, id)).get()!;
const shares = (id: number) => journalOf(tankRow(id)).map((e) => e.details.share);

describe("the kept journal follows every write", () => {
  it("adds, edits, deletes and raw SQL writes all show at once", async () => {
    const keeper = await userWithCookie();
    const id = createTank(keeper.id);
    expect(shares(id)).toEqual([]);
    const [first] = addEntries(id, [
      { kind: "water_change", doneAt: Date.now() - 5 * DAY, details: { share: 0.3 }, note: "" },
    ]);
    expect(shares(id)).toEqual([0.3]);
    // Read twice at one version: the same kept list.
    expect(journalOf(tankRow(id))).toBe(journalOf(tankRow(id)));
    updateEntry(id, first, { kind: "water_change", doneAt: Date.now() - 5 * DAY, details: { share: 0.4 }, note: "" });
    expect(shares(id)).toEqual([0.4]);
    addEntries(id, [{ kind: "water_change", doneAt: Date.now() - 2 * DAY, details: { share: 0.2 }, note: "" }]);
    expect(shares(id)).toEqual([0.4, 0.2]);
    // A write outside the app's functions (e.g. a migration or an admin's SQL) moves it too.
    getDb()
      .update(journalEntries)
      .set({ details: { share: 0.1 } })
      .where(eq(journalEntries.id, first))
      .run();
    expect(shares(id)).toEqual([0.1, 0.2]);
    deleteEntry(id, first);
    expect(shares(id)).toEqual([0.2]);
    // The kept list cannot be changed by a caller.
    expect(Object.isFrozen(journalOf(tankRow(id)))).toBe(true);
  });
});
