/**
 * Pages that list what a person stores stay bounded however much they store (issue 10: nobody can
 * freeze the server). A journal may hold 20,000 entries a tank; the journal page once sent every
 * one of them, 11 MB of page data rendered on the request thread, so a few reloads of a full
 * journal stalled everyone else's pages.
 */
import { describe, expect, it } from "vitest";
import { getDb } from "~/db/client.server";
import { journalEntries } from "~/db/schema-care";
import { loader as journalLoader } from "~/routes/journal/journal";
import { call, get } from "../support/routes";
import { createTank } from "../support/tanks";
import { userWithCookie } from "../support/users";

const DAY = 86_400_000;
// A page's data beyond a few hundred kB is slow to render and to send (common practice, no source).
const PAGE_DATA_BYTES = 300_000;

describe("the journal page of a full journal", () => {
  it("sends a bounded page of entries, and every entry is on exactly one page", async () => {
    const keeper = await userWithCookie();
    const tankId = createTank(keeper.id);
    const start = Date.now() - 600 * DAY;
    const count = 2_500;
    const rows = Array.from({ length: count }, (_, i) => ({
      tankId,
      doneAt: new Date(start + i * 3 * 3_600_000),
      kind: "note" as const,
      details: {},
      note: `entry ${i} ${"x".repeat(480)}`,
    }));
    for (let i = 0; i < rows.length; i += 1000)
      getDb()
        .insert(journalEntries)
        .values(rows.slice(i, i + 1000))
        .run();

    const open = async (query = "") => {
      const r = await call(journalLoader, get(`/tanks/${tankId}/journal${query}`, keeper.cookie), {
        tankId: String(tankId),
      });
      expect(r.status).toBe(200);
      expect(JSON.stringify(r.data).length).toBeLessThan(PAGE_DATA_BYTES);
      return r.data as { entries: { note: string }[]; entryPages: number; entryCount: number };
    };
    const first = await open();
    expect(first.entryCount).toBe(count);
    // Newest first: the last entry written leads the first page.
    expect(first.entries[0].note).toMatch(new RegExp(`^entry ${count - 1} `));

    const seen: string[] = [];
    for (let page = 1; page <= first.entryPages; page++) {
      const data = page === 1 ? first : await open(`?page=${page}`);
      seen.push(...data.entries.map((e) => e.note.split(" ")[1]));
    }
    expect(seen).toHaveLength(count);
    expect(new Set(seen).size).toBe(count);
    expect(seen.at(-1)).toBe("0");
    // A page past the end, or not a number, still answers a bounded page.
    await open("?page=999999");
    await open("?page=-3");
    await open("?page=abc");
  });
});
