/**
 * A task kind the journal has never had comes due on a fixed day and then follows the overdue
 * rule. A model choice: its first one is due an interval after the later of the journal's first
 * entry and the day the tank's edited plan was saved (with neither, the scenario's start); before
 * that, counted from today, it receded a day every day and never came due. The tank page, the
 * journal page, the calendar feed and the reminder mail all show the same day and say what it
 * counts from. The tanks are our own worked examples.
 */
import { eq } from "drizzle-orm";
import ICAL from "ical.js";
import { describe, expect, it } from "vitest";
import { getDb } from "~/db/client.server";
import { scenarios } from "~/db/schema";
import { calendarFor, makeCalendarFeed } from "~/features/journal/calendar-feed.server";
import { reminderMail } from "~/features/reminders/reminder-mail.server";
import type { ReminderRow } from "~/features/reminders/reminder-schedule.server";
import { resetPlan, savePlan } from "~/features/tanks/maintenance-plan.server";
import { loader as journalLoader } from "~/routes/journal/journal";
import { upcomingView } from "~/routes/tanks/upcoming-view.server";
import { addThroughPage, DAY, day } from "../support/journal";
import { dayAheadInWords, dayInWords, today } from "../support/journal-days";
import { call, get } from "../support/routes";
import { createScenario, createTank } from "../support/tanks";
import { userWithCookie } from "../support/users";

const dayWords = dayInWords;
const when = dayAheadInWords;

/** A tank with weekly 30 % changes and a 30-day filter cleaning, its journal holding only water changes. */
async function tankWithChanges(daysAgo: number[]) {
  const keeper = await userWithCookie();
  const tankId = createTank(keeper.id);
  const scenarioId = await createScenario(keeper.id, tankId, {
    maintenance: { waterChangeIntervalDays: 7, waterChangeFraction: 0.3 },
    filter: { cleaningIntervalDays: 30 },
  });
  for (const ago of daysAgo) {
    const r = await addThroughPage(String(tankId), keeper.cookie, {
      date: day(ago),
      kind: "water_change",
      water_changed_percent: "30",
    });
    expect(r.data.errors).toBeUndefined();
  }
  return { keeper, tankId, scenarioId };
}

/** The feed's filter cleanings at `now`: uid and start day (days from today). */
function feedCleanings(token: string, now: number) {
  const cal = new ICAL.Component(ICAL.parse(calendarFor(token, now)!));
  return cal
    .getAllSubcomponents("vevent")
    .map((v) => new ICAL.Event(v))
    .filter((e) => e.summary.startsWith("Clean the filter"))
    .map((e) => {
      const d = e.startDate;
      return { uid: e.uid, day: (Date.UTC(d.year, d.month - 1, d.day) - today()) / DAY, summary: e.summary };
    });
}

const mail = (tankId: number, userId: number, mode: "due" | "weekly", now: number) =>
  reminderMail({ id: 1, tankId, userId, mode } as ReminderRow, now);

describe("a task never logged", () => {
  it("with the journal begun 40 days ago, a 30-day filter cleaning is overdue since day 30, on every surface", async () => {
    // Changes 40 and 3 days ago: the water is not due; the filter fell due 10 days ago.
    const { keeper, tankId, scenarioId } = await tankWithChanges([40, 3]);
    const title = `Clean the filter — overdue since ${dayWords(10)}, counted from the journal's first entry (${dayWords(40)})`;
    // Tank page: once, today, within its three weeks (next one 30 days after today).
    const list = upcomingView(tankId).filter((t) => t.title.startsWith("Clean the filter"));
    expect(list.map((t) => [t.when, t.title])).toEqual([[when(0), title]]);
    // Journal page: the same line, and the forecast assumes it done today.
    const id = String(tankId);
    const page = await call(journalLoader, get(`/tanks/${id}/journal`, keeper.cookie), { tankId: id });
    expect(page.data.upcoming[0]).toEqual({ title, when: dayWords(0), overdue: true });
    expect(page.data.forecast).toContain(
      `It assumes the overdue filter cleaning (due since ${dayWords(10)}) is done today.`,
    );
    // The digest lists it and a due-days reminder is sent for it.
    const now = Date.now();
    expect((await mail(tankId, keeper.id, "weekly", now))!.text).toContain(`- ${when(0)}: ${title}\n`);
    expect((await mail(tankId, keeper.id, "due", now))!.text).toContain(`Due today:\n- ${title}\n`);
    // Calendar feed: today, then 30 and 60 days on.
    const token = makeCalendarFeed(tankId, scenarioId);
    expect(feedCleanings(token, now).map((e) => [e.day, e.summary])).toEqual([
      [0, `${title} · Test tank`],
      [30, "Clean the filter · Test tank"],
      [60, "Clean the filter · Test tank"],
    ]);
  });

  it("with the journal begun 10 days ago, is due in 20 days and stays on that day as days pass", async () => {
    const { keeper, tankId, scenarioId } = await tankWithChanges([10]);
    const title = `Clean the filter — first one, counted from the journal's first entry (${dayWords(10)})`;
    const now = Date.now();
    const cleanings = (at: number) =>
      upcomingView(tankId, at)
        .filter((t) => t.title.startsWith("Clean the filter"))
        .map((t) => [t.when, t.title]);
    expect(cleanings(now)).toEqual([[when(20), title]]);
    // A day later, and a week later, the same day: it does not recede.
    expect(cleanings(now + DAY)).toEqual([[when(20), title]]);
    expect(cleanings(now + 7 * DAY)).toEqual([[when(20), title]]);
    // The feed keeps one event for it, on the same day with the same uid, from one day to the next.
    const token = makeCalendarFeed(tankId, scenarioId);
    const first = feedCleanings(token, now)[0];
    expect(first.day).toBe(20);
    expect(feedCleanings(token, now + DAY)[0]).toEqual(first);
    // The two-week digest takes it up once it is within two weeks; a due-days mail goes out on its day.
    expect((await mail(tankId, keeper.id, "weekly", now))!.text).not.toContain("Clean the filter");
    expect((await mail(tankId, keeper.id, "weekly", now + 7 * DAY))!.text).toContain(`- ${when(20)}: ${title}\n`);
    expect((await mail(tankId, keeper.id, "due", now + 20 * DAY))!.text).toContain(`- ${title}\n`);
  });

  it("counts from the day an edited plan was first saved, later edits aside, when that is later than the journal's first entry", async () => {
    const { keeper, tankId, scenarioId } = await tankWithChanges([40, 3]);
    const plan = {
      waterChangeFraction: 0.3,
      waterChangeIntervalDays: 7,
      gravelCleaningFraction: 0,
      filterCleaningIntervalDays: 30,
      trims: {},
    };
    // Saved 5 days ago: the plan's timetable is the keeper's from then on, so due in 25 days.
    savePlan(tankId, scenarioId, plan, today() - 5 * DAY + 3_600_000);
    const title = `Clean the filter — first one, counted from when the plan was first saved (${dayWords(5)})`;
    const list = upcomingView(tankId).filter((t) => t.title.startsWith("Clean the filter"));
    expect(list.map((t) => [t.when, t.title])).toEqual([]);
    const token = makeCalendarFeed(tankId, scenarioId);
    expect(feedCleanings(token, Date.now())[0]).toMatchObject({ day: 25, summary: `${title} · Test tank` });
    // The forecast on the journal page plans it there too: nothing overdue to assume done.
    const id = String(tankId);
    const page = await call(journalLoader, get(`/tanks/${id}/journal`, keeper.cookie), { tankId: id });
    expect(page.data.forecast).toBeTruthy();
    expect(page.data.forecast).not.toContain("overdue");
    // Saved again today with another water-change share: the count keeps the first save's day.
    savePlan(tankId, scenarioId, { ...plan, waterChangeFraction: 0.4 });
    expect(feedCleanings(token, Date.now())[0]).toMatchObject({ day: 25, summary: `${title} · Test tank` });
    // A plan first saved 60 days ago, before the journal began: the journal's first entry counts
    // (overdue since day 30).
    resetPlan(tankId);
    savePlan(tankId, scenarioId, plan, today() - 60 * DAY);
    expect(upcomingView(tankId).find((t) => t.title.startsWith("Clean the filter"))?.title).toBe(
      `Clean the filter — overdue since ${dayWords(10)}, counted from the journal's first entry (${dayWords(40)})`,
    );
  });

  it("with no journal and no edited plan, counts from the scenario's start", async () => {
    const { tankId, scenarioId } = await tankWithChanges([]);
    getDb()
      .update(scenarios)
      .set({ startDate: new Date(today() - 40 * DAY) })
      .where(eq(scenarios.id, scenarioId))
      .run();
    // Weekly changes from day 0, 40 days ago: first due 33 days ago; the cleaning 10 days ago.
    const list = upcomingView(tankId).filter((t) => t.when === when(0));
    expect(list.map((t) => t.title)).toEqual([
      `Water change (30 %) — overdue since ${dayWords(33)}, counted from the scenario's start (${dayWords(40)})`,
      `Clean the filter — overdue since ${dayWords(10)}, counted from the scenario's start (${dayWords(40)})`,
    ]);
  });
});
