/**
 * The forecast plans the days the calendar, the upcoming list and the reminders show: each kind
 * of task resumed at its own last logged entry. A keeper who cleaned the filter yesterday and
 * changed water six days ago is next due a filter cleaning 30 days after yesterday, not 30 days
 * after the water change (a maintenance interval counts from when the task was last done:
 * common practice, no source); a task due today is in the forecast as on the calendar. The tank
 * is our own worked example.
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
const { upcomingTasks } = await import("~/features/journal/calendar-feed.server");
type JournalEntry = import("~/features/journal/journal.server").JournalEntry;

const DAY = 86_400_000;
const NOW = Date.UTC(2026, 10, 20, 12);
const TODAY = Math.floor(NOW / DAY) * DAY;

const TANK: Scenario = bareTank({
  water: { volumeL: 100, startNitrate: 2 },
  plants: [
    plantGroupFromForm("stem", {
      id: "stems",
      name: "Stem plants",
      startMassG: 20,
      maxMassG: 60,
      trim: { rule: "everyDays", everyDays: 14, trimToFraction: 0.5, fullAtFraction: 0.9 },
    }),
    // Never trimmed yet: its first trim is an interval after the journal's first entry (a model
    // choice, not after today, which would recede), on the calendar and in the forecast alike.
    plantGroupFromForm("floating", {
      id: "floaters",
      name: "Floaters",
      startMassG: 2,
      maxMassG: 10,
      trim: { rule: "everyDays", everyDays: 10, trimToFraction: 0.5, fullAtFraction: 0.9 },
    }),
  ],
  filter: { cleaningIntervalDays: 30 },
  maintenance: { waterChangeIntervalDays: 7, waterChangeFraction: 0.3 },
  targets: { nitrateHigh: 20 },
});

const entry = entriesBefore(TODAY);
const JOURNAL: JournalEntry[] = [
  entry(1, 7, "water_change", { share: 0.3 }),
  entry(2, 3, "plants_trimmed", { plantGroup: "Stem plants", plantDryG: 5 }),
  entry(3, 1, "filter_cleaned", { thoroughness: "thorough" }),
];

describe("the forecast's planned tasks", () => {
  it("resume each kind at its own last entry, on the days the calendar shows", async () => {
    asked.length = 0;
    const f = await forecastJournal(TANK, JOURNAL, NOW);
    expect(f).not.toBeNull();
    const startMs = TODAY - 7 * DAY; // the journal's first day
    // The first run is the forecast itself (later ones are the target finder's trials).
    const planned = asked[0]
      .map((e) => ({ kind: e.kind, atMs: startMs + Math.round(e.day) * DAY }))
      .filter((e) => e.atMs >= TODAY && e.atMs < TODAY + 50 * DAY);
    const dates = (kind: string) => planned.filter((e) => e.kind === kind).map((e) => (e.atMs - TODAY) / DAY);
    // Next cleaning 30 days after yesterday's; the stems' next trim 14 days after the one 3 days
    // ago, the floaters' 10 days from the journal's first day (a week ago); water every 7 days from
    // a week ago, so one is due today.
    const trims = (id: string) =>
      asked[0]
        .filter((e) => e.kind === "trim" && e.groupId === id)
        .map((e) => (startMs + Math.round(e.day) * DAY - TODAY) / DAY)
        .filter((d) => d >= 0 && d < 50);
    expect(dates("filterCleaning")).toEqual([29]);
    expect(trims("stems")).toEqual([11, 25, 39]);
    expect(trims("floaters")).toEqual([3, 13, 23, 33, 43]);
    expect(dates("waterChange")).toEqual([0, 7, 14, 21, 28, 35, 42, 49]);
    // The calendar and the reminders plan the same days.
    const calendar = upcomingTasks(TANK, JOURNAL, { ms: JOURNAL[0].doneAt, from: "journal" }, NOW, 50)
      .filter((t) => t.atMs >= TODAY)
      .map((t) => ({ kind: t.kind, atMs: t.atMs }));
    const key = (e: { kind: string; atMs: number }) => `${e.atMs}-${e.kind}`;
    expect(planned.map(key).sort()).toEqual(calendar.map(key).sort());
  });
});
