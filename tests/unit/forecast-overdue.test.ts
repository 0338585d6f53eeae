/**
 * The forecast treats an overdue task as the calendar does: done today, once, however many
 * intervals were missed, and the timetable resumed an interval after today (a model choice);
 * never skipped quietly until its next period. Its sentence says what it assumed. The tank is
 * our own worked example.
 */
import { describe, expect, it, vi } from "vitest";
import { plantGroupFromForm, simulate, type Scenario, type TankEventInput } from "../../models/index";
import { bareTank } from "../models/helpers";
import { entriesBefore } from "../support/journal-days";

const asked: TankEventInput[][] = [];
vi.mock("~/features/journal/journal-runs.server", () => ({
  // The engine in-process, keeping what each forecast run was given.
  simulateOnPool: async (scenario: Scenario, events: TankEventInput[]) => {
    asked.push(events);
    return simulate(scenario, { events });
  },
}));
const { forecastJournal } = await import("~/features/journal/journal-replay.server");
const { forecastSentence } = await import("~/features/journal/forecast-text.server");
const { DEFAULT_PREFERENCES, displayUnitsFor } = await import("~/utils/display-units");
type JournalEntry = import("~/features/journal/journal.server").JournalEntry;

const DAY = 86_400_000;
const NOW = Date.UTC(2026, 11, 4, 12);
const TODAY = Math.floor(NOW / DAY) * DAY;

const TANK: Scenario = bareTank({
  water: { volumeL: 100, startNitrate: 2 },
  fish: { feedGPerDay: 0.3 },
  plants: [
    plantGroupFromForm("stem", {
      id: "stems",
      name: "Stem plants",
      startMassG: 20,
      maxMassG: 60,
      trim: { rule: "everyDays", everyDays: 3, trimToFraction: 0.5, fullAtFraction: 0.9 },
    }),
  ],
  filter: { cleaningIntervalDays: 30 },
  maintenance: { waterChangeIntervalDays: 7, waterChangeFraction: 0.3 },
  targets: { nitrateHigh: 50 },
});

const entry = entriesBefore(TODAY);
// Water due 3 days ago (1 December); the stems' trim due 8 days ago and missed three times since;
// the filter cleaned 5 days ago, not due.
const JOURNAL: JournalEntry[] = [
  entry(1, 11, "plants_trimmed", { plantGroup: "Stem plants", plantDryG: 5 }),
  entry(2, 10, "water_change", { share: 0.3 }),
  entry(3, 5, "filter_cleaned", { thoroughness: "thorough" }),
];

describe("the forecast with overdue tasks", () => {
  it("plans each overdue task today, once, resumes from today, and says so", async () => {
    asked.length = 0;
    const f = await forecastJournal(TANK, JOURNAL, NOW);
    expect(f).not.toBeNull();
    const startMs = TODAY - 11 * DAY; // the journal's first day
    const days = (kind: string, groupId?: string) =>
      asked[0]
        .filter((e) => e.kind === kind && (groupId === undefined || (e.kind === "trim" && e.groupId === groupId)))
        .map((e) => (startMs + Math.round(e.day) * DAY - TODAY) / DAY)
        .filter((d) => d >= 0 && d < 22);
    // Not skipped to day 4 of the old grid: today, then a week on from today.
    expect(days("waterChange")).toEqual([0, 7, 14, 21]);
    expect(days("trim", "stems")).toEqual([0, 3, 6, 9, 12, 15, 18, 21]);
    expect(days("filterCleaning")).toEqual([]);
    expect(f!.overdue.map((t) => ({ ...t, sinceMs: (t.sinceMs - TODAY) / DAY }))).toEqual([
      { kind: "waterChange", group: null, sinceMs: -3 },
      { kind: "trim", group: "Stem plants", sinceMs: -8 },
    ]);
    expect(forecastSentence(f, displayUnitsFor(DEFAULT_PREFERENCES))).toMatch(
      / It assumes the overdue water change \(due since 1 December\) and trim of Stem plants \(due since 26 November\) are done today\.$/,
    );
  });

  // Times are wall-clock times (app/utils/dates.ts): a keeper east of UTC logs today's change at
  // an hour still ahead of the server's clock. It is done today: in the run at its hour, and the
  // next planned a week on, not planned again today nor left out.
  it("counts an entry dated later today as done today, and runs it", async () => {
    asked.length = 0;
    const journal = [
      entry(1, 7, "water_change", { share: 0.3 }),
      { ...entry(2, 0, "water_change", { share: 0.4 }), doneAt: TODAY + 23 * 3_600_000 },
    ];
    const f = await forecastJournal(TANK, journal, NOW);
    // The water change is not overdue (the stems' trim, never logged, is: due 4 days ago, 3 days
    // after the journal's first day).
    expect(f!.overdue.map((t) => t.kind)).toEqual(["trim"]);
    const startMs = TODAY - 7 * DAY;
    const changes = asked[0]
      .filter((e) => e.kind === "waterChange" && startMs + e.day * DAY >= TODAY)
      .map((e) => ({
        hoursFromToday: Math.round((startMs + e.day * DAY - TODAY) / 3_600_000),
        fraction: e.kind === "waterChange" ? e.fraction : null,
      }))
      .filter((e) => e.hoursFromToday < 15 * 24);
    expect(changes).toEqual([
      { hoursFromToday: 23, fraction: 0.4 },
      { hoursFromToday: 7 * 24, fraction: 0.3 },
      { hoursFromToday: 14 * 24, fraction: 0.3 },
    ]);
  });

  it("plans an overdue ammonia dose (fishless cycling) today, once, with a half-day interval too", async () => {
    const cycling = (doseIntervalDays: number) =>
      bareTank({
        water: { volumeL: 100 },
        fishlessCycling: { enabled: true, doseMgNPerL: 1, doseIntervalDays, stopRule: "never" },
        targets: { nitrateHigh: 50 },
      });
    const journal = [entry(1, 5, "ammonia_dosed", { ammoniaMgN: 1 })];
    const startMs = TODAY - 5 * DAY;
    const doses = () =>
      asked[0]
        .filter((e) => e.kind === "dose")
        .map((e) => (startMs + e.day * DAY - TODAY) / DAY)
        .filter((d) => d >= -5 && d < 5);
    // Every 2 days: due 3 days ago (1 December), missed twice; today, then every 2 days from today.
    asked.length = 0;
    const f = await forecastJournal(cycling(2), journal, NOW);
    // The logged dose (5 days ago, 09:00), then today and every 2 days from today.
    expect(doses()).toEqual([-5 + 9 / 24, 0, 2, 4]);
    expect(forecastSentence(f, displayUnitsFor(DEFAULT_PREFERENCES))).toMatch(
      / It assumes the overdue ammonia dose \(due since 1 December\) is done today\.$/,
    );
    // Every half day: first due at noon 5 days ago, the day it fell due (29 November).
    asked.length = 0;
    const half = await forecastJournal(cycling(0.5), journal, NOW);
    expect(doses().filter((d) => d >= 0 && d < 1.5)).toEqual([0, 0.5, 1]);
    expect(half!.overdue.map((t) => (t.sinceMs - TODAY) / DAY)).toEqual([-5]);
  });

  // A model choice: a kind never logged counts from the plan's start (here the journal's first
  // entry, 5 days ago), where a timetable's doses begin; counted from today it was never overdue.
  it("plans a dose never logged as overdue since the journal's first day, and says so", async () => {
    asked.length = 0;
    const tank = bareTank({
      water: { volumeL: 100 },
      fishlessCycling: { enabled: true, doseMgNPerL: 1, doseIntervalDays: 2, stopRule: "never" },
      targets: { nitrateHigh: 50 },
    });
    const f = await forecastJournal(tank, [entry(1, 5, "water_change", { share: 0.3 })], NOW);
    const startMs = TODAY - 5 * DAY;
    const doses = asked[0].filter((e) => e.kind === "dose").map((e) => (startMs + e.day * DAY - TODAY) / DAY);
    expect(doses.filter((d) => d < 5)).toEqual([0, 2, 4]);
    expect(f!.overdue.map((t) => ({ kind: t.kind, sinceMs: (t.sinceMs - TODAY) / DAY }))).toEqual([
      { kind: "dose", sinceMs: -5 },
    ]);
    expect(forecastSentence(f, displayUnitsFor(DEFAULT_PREFERENCES))).toMatch(
      / It assumes the overdue ammonia dose \(due since 29 November\) is done today\.$/,
    );
  });
});
