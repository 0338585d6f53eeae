/**
 * "Today" is the keeper's day, in their time zone: the tank page's and the journal's upcoming
 * lists, the account page's time-zone field, and the reminder hour. Offsets: IANA tz database.
 * The weekly water change is our own worked example.
 */
import { eq } from "drizzle-orm";
import { afterEach, describe, expect, it, vi } from "vitest";
import { getDb } from "~/db/client.server";
import { users } from "~/db/schema";
import { reminderSubscriptions } from "~/db/schema-care";
import { reminderMail } from "~/features/reminders/reminder-mail.server";
import { claim, markSent, setReminder } from "~/features/reminders/reminder-schedule.server";
import { action as accountAction, loader as accountLoader } from "~/routes/auth/account";
import { loader as journalLoader } from "~/routes/journal/journal";
import { loader as tankLoader } from "~/routes/tanks/detail";
import { addThroughPage } from "../support/journal";
import { call, get, post } from "../support/routes";
import { createScenario, createTank } from "../support/tanks";
import { userWithCookie } from "../support/users";

afterEach(() => {
  vi.useRealTimers();
});

/** A keeper whose weekly water change was last logged on `lastDone`: next due a week later. */
async function keeperWithChange(lastDone: string, timeZone: string | null) {
  const keeper = await userWithCookie();
  getDb().update(users).set({ timeZone }).where(eq(users.id, keeper.id)).run();
  const tankId = createTank(keeper.id);
  await createScenario(keeper.id, tankId, { maintenance: { waterChangeIntervalDays: 7, waterChangeFraction: 0.3 } });
  const r = await addThroughPage(String(tankId), keeper.cookie, {
    date: lastDone,
    kind: "water_change",
    water_changed_percent: "30",
  });
  expect(r.data.errors).toBeUndefined();
  return { keeper, tankId };
}

/** The tank page's and the journal's first planned water change, at the instant `iso`. */
async function waterChangeAt(iso: string, tankId: number, cookie: string) {
  vi.useFakeTimers({ toFake: ["Date"] });
  vi.setSystemTime(new Date(iso));
  const page = await call(tankLoader, get(`/tanks/${tankId}`, cookie), { tankId: String(tankId) });
  const journal = await call(journalLoader, get(`/tanks/${tankId}/journal`, cookie), { tankId: String(tankId) });
  vi.useRealTimers();
  expect(page.status).toBe(200);
  expect(journal.status).toBe(200);
  const onPage = page.data.upcoming.find((t: { title: string }) => t.title.startsWith("Water change"));
  const inJournal = journal.data.upcoming.find((t: { title: string }) => t.title.startsWith("Water change"));
  return { onPage, inJournal, journalToday: journal.data.today as string };
}

describe("today in the keeper's time zone", () => {
  it("an Auckland keeper at 09:00 local has the water change due today while UTC is still the day before", async () => {
    const { keeper, tankId } = await keeperWithChange("2026-11-28", "Pacific/Auckland");
    // IANA tz database: Pacific/Auckland is UTC+13 in December (NZDT): 20:00 UTC on the 4th is 09:00 on the 5th.
    const { onPage, inJournal, journalToday } = await waterChangeAt("2026-12-04T20:00:00Z", tankId, keeper.cookie);
    expect(onPage.when).toBe("Sat 5 December");
    expect(onPage.overdue).toBe(false);
    // Marked done from the list, it is dated the keeper's today at their hour.
    expect(onPage.values.date).toBe("2026-12-05T09:00");
    expect(inJournal.overdue).toBe(false);
    expect(journalToday).toBe("2026-12-05");

    // A change due on the 4th is overdue on the keeper's 5th, though the server's day is still the 4th.
    const late = await keeperWithChange("2026-11-27", "Pacific/Auckland");
    const then = await waterChangeAt("2026-12-04T20:00:00Z", late.tankId, late.keeper.cookie);
    expect(then.onPage.overdue).toBe(true);
    expect(then.onPage.title).toContain("overdue since 4 December");
    expect(then.onPage.when).toBe("Sat 5 December");
  });

  it("a Los Angeles keeper in the evening sees no Overdue badge a day early", async () => {
    const la = await keeperWithChange("2026-11-27", "America/Los_Angeles");
    // IANA tz database: America/Los_Angeles is UTC-8 in December (PST): 03:00 UTC on the 5th is 19:00 on the 4th.
    const seen = await waterChangeAt("2026-12-05T03:00:00Z", la.tankId, la.keeper.cookie);
    expect(seen.onPage.overdue).toBe(false);
    expect(seen.onPage.when).toBe("Fri 4 December");
    expect(seen.inJournal.overdue).toBe(false);
    expect(seen.inJournal.when).toBe("4 December");

    // The same instant in UTC is already the 5th: there it is overdue (the check can fail).
    const utc = await keeperWithChange("2026-11-27", "UTC");
    const utcSeen = await waterChangeAt("2026-12-05T03:00:00Z", utc.tankId, utc.keeper.cookie);
    expect(utcSeen.onPage.overdue).toBe(true);
  });

  it("until a zone is chosen the browser's is used, and a bad one falls back to UTC", async () => {
    const { keeper, tankId } = await keeperWithChange("2026-11-27", null);
    const withZone = `${keeper.cookie}; fw_tz=America%2FLos_Angeles`;
    // IANA tz database: America/Los_Angeles is UTC-8 in December (PST).
    expect((await waterChangeAt("2026-12-05T03:00:00Z", tankId, withZone)).onPage.overdue).toBe(false);
    const bogus = `${keeper.cookie}; fw_tz=Nowhere%2FLand`;
    expect((await waterChangeAt("2026-12-05T03:00:00Z", tankId, bogus)).onPage.overdue).toBe(true);
    // A value that is not valid percent-encoding (RFC 3986, §2.1) is no zone, not an error.
    const garbled = `${keeper.cookie}; fw_tz=%E0%A4%A`;
    expect((await waterChangeAt("2026-12-05T03:00:00Z", tankId, garbled)).onPage.overdue).toBe(true);
    const page = await call(accountLoader, get("/account", withZone));
    expect(page.data.zone).toEqual({ zone: "America/Los_Angeles", from: "browser" });
  });
});

describe("the account page's time zone", () => {
  const prefs = { intent: "preferences", volumeUnit: "L", temperatureUnit: "C", nitrateUnit: "NO3", khUnit: "dKH" };

  it("refuses a zone the runtime does not know, next to the field, and saves nothing", async () => {
    const keeper = await userWithCookie();
    const r = await call(
      accountAction,
      post("/account", { ...prefs, name: "Changed Name", timeZone: "Mars/Olympus_Mons" }, keeper.cookie),
    );
    expect(r.status).toBe(400);
    expect(r.data.errors.timeZone).toMatch(/time zone/i);
    expect(r.data.values.timeZone).toBe("Mars/Olympus_Mons");
    const row = getDb().select().from(users).where(eq(users.id, keeper.id)).get()!;
    expect(row.name).not.toBe("Changed Name");
    expect(row.timeZone).toBeNull();
  });

  it("saves a known zone and says it is in use", async () => {
    const keeper = await userWithCookie();
    const r = await call(
      accountAction,
      post("/account", { ...prefs, name: "Kea", timeZone: "Pacific/Auckland" }, keeper.cookie),
    );
    expect(r.status).toBe(302);
    const page = await call(accountLoader, get("/account", keeper.cookie));
    expect(page.data.zone).toEqual({ zone: "Pacific/Auckland", from: "setting" });
  });
});

describe("the reminder hour", () => {
  it("is the keeper's local hour", async () => {
    const keeper = await userWithCookie();
    getDb().update(users).set({ timeZone: "Pacific/Auckland" }).where(eq(users.id, keeper.id)).run();
    const tankId = createTank(keeper.id);
    // At 20:00 UTC on 4 December it is 09:00 on the 5th in Auckland: 08:00 has passed, so tomorrow at 08:00.
    setReminder(keeper.id, tankId, "due", 8, Date.parse("2026-12-04T20:00:00Z"));
    const row = getDb().select().from(reminderSubscriptions).where(eq(reminderSubscriptions.tankId, tankId)).get()!;
    // IANA tz database: Pacific/Auckland is UTC+13 in December: 08:00 on the 6th is 19:00 UTC on the 5th.
    expect(new Date(row.nextDueAt).toISOString()).toBe("2026-12-05T19:00:00.000Z");
    // At 18:00 UTC (07:00 local) it is still today's 08:00, not tomorrow's.
    setReminder(keeper.id, tankId, "weekly", 8, Date.parse("2026-12-04T18:00:00Z"));
    const again = getDb().select().from(reminderSubscriptions).where(eq(reminderSubscriptions.tankId, tankId)).get()!;
    expect(new Date(again.nextDueAt).toISOString()).toBe("2026-12-04T19:00:00.000Z");
  });
});

describe("the weekly reminder across a daylight-saving change", () => {
  it("keeps the keeper's hour, not the UTC one", async () => {
    const keeper = await userWithCookie();
    getDb().update(users).set({ timeZone: "America/New_York" }).where(eq(users.id, keeper.id)).run();
    const tankId = createTank(keeper.id);
    const read = () =>
      getDb().select().from(reminderSubscriptions).where(eq(reminderSubscriptions.tankId, tankId)).get()!;
    // IANA tz database: New York is UTC-5 (EST) until 8 March 2026, UTC-4 (EDT) after.
    setReminder(keeper.id, tankId, "weekly", 8, Date.parse("2026-03-02T12:00:00Z"));
    expect(new Date(read().nextDueAt).toISOString()).toBe("2026-03-02T13:00:00.000Z");
    const sentAt = Date.parse("2026-03-02T13:00:30Z");
    expect(claim(read().id, "test", sentAt)).toBe(true);
    markSent(read(), "test", sentAt, true);
    // A week on, 08:00 EDT: 12:00 UTC, an hour earlier in UTC than the week before.
    expect(new Date(read().nextDueAt).toISOString()).toBe("2026-03-09T12:00:00.000Z");
  });
});

describe("the reminder mail", () => {
  it("counts due today on the keeper's day", async () => {
    const mailAt = async (timeZone: string) => {
      const { keeper, tankId } = await keeperWithChange("2026-11-28", timeZone);
      setReminder(keeper.id, tankId, "due", 8, Date.parse("2026-12-04T18:00:00Z"));
      const row = getDb().select().from(reminderSubscriptions).where(eq(reminderSubscriptions.tankId, tankId)).get()!;
      return reminderMail(row, Date.parse("2026-12-04T20:00:00Z"));
    };
    // IANA tz database: Pacific/Auckland is UTC+13 in December: 20:00 UTC on the 4th is the 5th there.
    const auckland = await mailAt("Pacific/Auckland");
    expect(auckland?.text).toMatch(/Due today:\n- Water change \(30 %\)/);
    // In UTC it is still the 4th: the change due on the 5th is not due today, so no mail.
    expect(await mailAt("UTC")).toBeNull();
  });
});
