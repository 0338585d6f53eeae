/**
 * A planned task whose day has passed with no journal entry is overdue: it stays on the tank
 * page's upcoming list, the calendar feed and the reminder mail as due today, once however many
 * intervals were missed, saying since when; the timetable resumes an interval after today, as if
 * done today (a model choice: what marking it done today would plan). The tanks are our own
 * worked examples.
 */
import { describe, expect, it } from "vitest";
import { reminderMail } from "~/features/reminders/reminder-mail.server";
import type { ReminderRow } from "~/features/reminders/reminder-schedule.server";
import { loader as journalLoader } from "~/routes/journal/journal";
import { action as planAction } from "~/routes/tanks/plan";
import { upcomingView } from "~/routes/tanks/upcoming-view.server";
import { plantGroupFromForm, type ScenarioInput } from "../../models/index";
import { calendarEvents } from "../support/calendar";
import { addThroughPage, DAY, day } from "../support/journal";
import { dayAheadInWords, dayInWords, today } from "../support/journal-days";
import { call, get, post } from "../support/routes";
import { createScenario, createTank } from "../support/tanks";
import { userWithCookie } from "../support/users";

const since = dayInWords;
const when = dayAheadInWords;

const stems = (everyDays: number) =>
  plantGroupFromForm("stem", {
    id: "stems",
    name: "Stem plants",
    startMassG: 10,
    maxMassG: 40,
    trim: { rule: "everyDays", everyDays, trimToFraction: 0.5, fullAtFraction: 0.9 },
  });

async function tankWith(input: ScenarioInput, journal: Record<string, string>[]) {
  const keeper = await userWithCookie();
  const tankId = createTank(keeper.id);
  await createScenario(keeper.id, tankId, input);
  for (const fields of journal) {
    const r = await addThroughPage(String(tankId), keeper.cookie, fields);
    expect(r.status).toBe(200);
    expect(r.data.errors).toBeUndefined();
  }
  return { keeper, tankId };
}

const waterChange = (daysAgo: number) => ({ date: day(daysAgo), kind: "water_change", water_changed_percent: "30" });

describe("an overdue task", () => {
  it("stays on the upcoming list as due today, once, for every kind of task", async () => {
    const { tankId } = await tankWith(
      {
        plants: [stems(1)],
        maintenance: { waterChangeIntervalDays: 7, waterChangeFraction: 0.3 },
        filter: { cleaningIntervalDays: 30 },
      },
      [
        // Weekly change last done 10 days ago: due 3 days ago.
        waterChange(10),
        // Monthly cleaning 45 days ago: due 15 days ago.
        { date: day(45), kind: "filter_cleaned", filter_thoroughness: "thorough" },
        // Daily trim 5 days ago: due 4 days ago, and missed four times since.
        { date: day(5), kind: "plants_trimmed", plant_group: "Stem plants", plant_dry_g: "2" },
      ],
    );
    const tasks = upcomingView(tankId);
    const dated = (prefix: string) => tasks.filter((t) => t.title.startsWith(prefix)).map((t) => t.when);
    expect(
      tasks
        .filter((t) => t.when === when(0))
        .map((t) => t.title)
        .sort(),
    ).toEqual([
      `Clean the filter — overdue since ${since(15)}`,
      `Trim plants (Stem plants) — overdue since ${since(4)}`,
      `Water change (30 %) — overdue since ${since(3)}`,
    ]);
    // Then each resumes an interval after today: water on days 7 and 14, no cleaning within the
    // three weeks, a trim every day from tomorrow.
    expect(dated("Water change")).toEqual([when(0), when(7), when(14)]);
    expect(dated("Clean the filter")).toEqual([when(0)]);
    expect(dated("Trim plants")).toEqual(Array.from({ length: 21 }, (_, d) => when(d)));
    expect(tasks.filter((t) => t.title.includes("overdue"))).toHaveLength(3);
    // The list marks them, not only their words: exactly the three overdue ones.
    expect(tasks.filter((t) => t.overdue).map((t) => t.title)).toEqual(
      tasks.filter((t) => t.title.includes("overdue")).map((t) => t.title),
    );
  });

  // Periods of 1, 7 and 30 days; the 30-day one missed twice (due 45 and 15 days ago).
  it.each([
    { every: 1, lastAgo: 3, dueAgo: 2 },
    { every: 7, lastAgo: 10, dueAgo: 3 },
    { every: 30, lastAgo: 75, dueAgo: 45 },
  ])(
    "every $every days, last done $lastAgo days ago: one event today in the calendar feed",
    async ({ every, lastAgo, dueAgo }) => {
      const { keeper, tankId } = await tankWith(
        { maintenance: { waterChangeIntervalDays: every, waterChangeFraction: 0.3 } },
        [waterChange(lastAgo)],
      );
      const events = (await calendarEvents(keeper.cookie, String(tankId))).filter((e) =>
        e.summary.startsWith("Water change"),
      );
      const overdue = events.filter((e) => e.summary.includes("overdue"));
      expect(overdue.map((e) => e.summary)).toEqual([
        `Water change (30 %) — overdue since ${since(dueAgo)} · Test tank`,
      ]);
      expect(overdue[0].startMs).toBe(today());
      // Today, then every `every` days from today within the feed's 90 days.
      const days = events.map((e) => (e.startMs - today()) / DAY).sort((a, b) => a - b);
      expect(days).toEqual(Array.from({ length: Math.ceil(90 / every) }, (_, k) => k * every));
    },
  );

  it("is in a due-days reminder mail, and the forecast says it assumes it done today", async () => {
    const { keeper, tankId } = await tankWith(
      { maintenance: { waterChangeIntervalDays: 7, waterChangeFraction: 0.3 } },
      [waterChange(10)],
    );
    const mail = await reminderMail({ id: 1, tankId, userId: keeper.id, mode: "due" } as ReminderRow, Date.now());
    expect(mail).not.toBeNull();
    expect(mail!.text).toContain(`Due today:\n- Water change (30 %) — overdue since ${since(3)}\n`);
    const assumed = `It assumes the overdue water change (due since ${since(3)}) is done today.`;
    expect(mail!.text).toContain(assumed);
    const id = String(tankId);
    const page = await call(journalLoader, get(`/tanks/${id}/journal`, keeper.cookie), { tankId: id });
    expect(page.data.forecast).toContain(assumed);
    expect(page.data.upcoming[0]).toEqual({
      title: `Water change (30 %) — overdue since ${since(3)}`,
      when: since(0),
      overdue: true,
    });
    expect(page.data.upcoming.slice(1).every((t: { overdue: boolean }) => !t.overdue)).toBe(true);
  });

  // A model choice: a kind never logged counts from the journal's first entry (here the change
  // 10 days ago), not from today, where it would recede a day every day.
  it("a task never logged does not vanish: it counts from the journal's first entry, and says so", async () => {
    const { keeper, tankId } = await tankWith(
      {
        plants: [stems(10)],
        maintenance: { waterChangeIntervalDays: 7, waterChangeFraction: 0.3 },
        filter: { cleaningIntervalDays: 30 },
      },
      [waterChange(10)],
    );
    const events = await calendarEvents(keeper.cookie, String(tankId));
    const days = (prefix: string) =>
      events
        .filter((e) => e.summary.startsWith(prefix))
        .map((e) => (e.startMs - today()) / DAY)
        .sort((a, b) => a - b);
    // 30 days after 10 days ago: day 20; a trim every 10 days from 10 days ago: due today, not overdue.
    expect(days("Clean the filter")).toEqual([20, 50, 80]);
    expect(days("Trim plants")).toEqual([0, 10, 20, 30, 40, 50, 60, 70, 80]);
    expect(events.filter((e) => e.summary.includes("overdue")).map((e) => e.summary)).toEqual([
      `Water change (30 %) — overdue since ${since(3)} · Test tank`,
    ]);
    expect(events.filter((e) => e.summary.includes("first one")).map((e) => e.summary)).toEqual([
      `Trim plants (Stem plants) — first one, counted from the journal's first entry (${since(10)}) · Test tank`,
      `Clean the filter — first one, counted from the journal's first entry (${since(10)}) · Test tank`,
    ]);
  });

  it("marked done today, it leaves the list and the next one is an interval after today, as the forecast assumed", async () => {
    const { keeper, tankId } = await tankWith(
      { maintenance: { waterChangeIntervalDays: 7, waterChangeFraction: 0.3 } },
      [waterChange(10)],
    );
    const task = upcomingView(tankId).find((t) => t.title.includes("overdue"))!;
    expect(task.when).toBe(when(0));
    const id = String(tankId);
    const r = await call(
      planAction,
      post(`/tanks/${id}/plan`, { intent: "done", back: "tank", task: task.key, ...task.values }, keeper.cookie),
      { tankId: id },
    );
    expect(r.status).toBe(302);
    const after = upcomingView(tankId).filter((t) => t.title.startsWith("Water change"));
    expect(after.map((t) => [t.when, t.title])).toEqual([
      [when(7), "Water change (30 %)"],
      [when(14), "Water change (30 %)"],
    ]);
  });

  // Times are wall-clock times (app/utils/dates.ts): a keeper east of UTC logs today's change at a
  // time still ahead of the server's clock, and may date one tomorrow (a day of slack is allowed).
  it("the tank page and the calendar feed count the same entries: one dated later today is done, one dated tomorrow not yet", async () => {
    const { keeper, tankId } = await tankWith(
      {
        maintenance: { waterChangeIntervalDays: 7, waterChangeFraction: 0.3 },
        filter: { cleaningIntervalDays: 30 },
      },
      [
        waterChange(10),
        { ...waterChange(0), date: `${day(0)}T23:59` },
        { date: day(45), kind: "filter_cleaned", filter_thoroughness: "thorough" },
        { date: day(-1), kind: "filter_cleaned", filter_thoroughness: "thorough" },
      ],
    );
    // Water: done today, next in a week; filter: due 15 days ago, overdue until tomorrow's entry is.
    const page = upcomingView(tankId).map((t) => `${t.when}: ${t.title}`);
    expect(page).toEqual([
      `${when(0)}: Clean the filter — overdue since ${since(15)}`,
      `${when(7)}: Water change (30 %)`,
      `${when(14)}: Water change (30 %)`,
    ]);
    const feed = (await calendarEvents(keeper.cookie, String(tankId)))
      .filter((e) => e.startMs < today() + 21 * DAY)
      .sort((a, b) => a.startMs - b.startMs)
      .map((e) => `${when((e.startMs - today()) / DAY)}: ${e.summary.replace(" · Test tank", "")}`);
    expect(feed).toEqual(page);
  });
});
