/**
 * Journal quotas (issue 10: a limit holds whichever way it is approached). A tank's journal held
 * at most 20,000 entries, but nothing bounded a person's journals together (50 tanks × 20,000),
 * and the JSON API answered a full journal with 500. Our own checks against app/quotas.server.ts:
 * past either quota, every way in (API, form, CSV upload) answers 413 with what to do and writes
 * nothing; the account page shows the usage.
 */
import { count } from "drizzle-orm";
import { describe, expect, it } from "vitest";
import { getDb } from "~/db/client.server";
import { journalEntries } from "~/db/schema-care";
import { QUOTAS } from "~/quotas.server";
import { loader as accountLoader } from "~/routes/auth/account";
import { action as journalApiPost } from "~/routes/api/tank-journal";
import { action as pageAction } from "~/routes/journal/journal";
import { call, get, ORIGIN, post, postJson } from "../support/routes";
import { createTank } from "../support/tanks";
import { userWithCookie } from "../support/users";

const DAY = 86_400_000;
const stored = () => getDb().select({ n: count() }).from(journalEntries).get()!.n;

/** `n` notes in a tank's journal, written straight to the table (fast). */
function fill(tankId: number, n: number) {
  const start = Date.now() - 300 * DAY;
  for (let i = 0; i < n; i += 2000) {
    const rows = Array.from({ length: Math.min(2000, n - i) }, (_, j) => ({
      tankId,
      doneAt: new Date(start + (i + j) * 60_000),
      kind: "note" as const,
      details: {},
    }));
    getDb().insert(journalEntries).values(rows).run();
  }
}

/** Every way one entry goes in; each should answer 413 here. */
async function tryAllWays(cookie: string, tankId: number) {
  const id = String(tankId);
  const today = new Date().toISOString().slice(0, 10);
  const api = await call(
    journalApiPost,
    postJson(`/api/tanks/${id}/journal`, { date: today, kind: "note", note: "one more" }, cookie),
    { tankId: id },
  );
  const form = await call(
    pageAction,
    post(`/tanks/${id}/journal`, { intent: "add", date: today, kind: "note", note: "one more" }, cookie),
    { tankId: id },
  );
  const file = new FormData();
  file.set("file", new File([`date,kind,note\n${today},note,one more\n`], "journal.csv", { type: "text/csv" }));
  const upload = await call(
    pageAction,
    new Request(`${ORIGIN}/tanks/${id}/journal`, {
      method: "POST",
      body: file,
      headers: { Cookie: cookie, Origin: ORIGIN },
    }),
    { tankId: id },
  );
  return { api, form, upload };
}

describe("journal quotas", () => {
  it("refuses a full tank's journal with 413 on every way in, the API included", async () => {
    const keeper = await userWithCookie();
    const tankId = createTank(keeper.id);
    fill(tankId, QUOTAS.journalEntriesPerTank);
    const before = stored();
    const { api, form, upload } = await tryAllWays(keeper.cookie, tankId);
    expect(api.status).toBe(413);
    expect(api.data).toMatchObject({ status: 413, error: expect.stringMatching(/at most 20,000 entries/) });
    expect(form.status).toBe(413);
    expect(upload.status).toBe(413);
    expect(stored()).toBe(before);
  });

  it("counts a person's journals together, so more tanks do not hold more", async () => {
    const keeper = await userWithCookie();
    const tanks = [createTank(keeper.id), createTank(keeper.id), createTank(keeper.id)];
    const perTank = Math.floor(QUOTAS.journalEntriesPerPerson / 3) + 1;
    fill(tanks[0], perTank);
    fill(tanks[1], perTank);
    fill(tanks[2], QUOTAS.journalEntriesPerPerson - 2 * perTank);
    // Every tank is under its own quota, the person is at theirs.
    expect(perTank).toBeLessThan(QUOTAS.journalEntriesPerTank);
    const before = stored();
    const { api, form, upload } = await tryAllWays(keeper.cookie, tanks[2]);
    expect(api.status).toBe(413);
    expect(api.data.error).toMatch(/one account keeps/);
    expect(form.status).toBe(413);
    expect(upload.status).toBe(413);
    expect(stored()).toBe(before);

    const account = await call(accountLoader, get("/account", keeper.cookie));
    expect(account.data.usage.journalEntries).toEqual({
      used: QUOTAS.journalEntriesPerPerson,
      limit: QUOTAS.journalEntriesPerPerson,
    });
  });
});
