/**
 * What the chores thread sends back is checked with zod before it is used
 * (app/features/jobs/chores-pool.server.ts), and a check that dropped a field would lose it
 * silently: each chore's answer through the pool is exactly the pure function's. From the
 * sources the pool runs in-process, through the same check; the e2e tests run the built worker.
 * Our own worked tank (a planted tank with oxygen and a journal's events), no outside source.
 */
import { describe, expect, it } from "vitest";
import { simulate } from "../../models/index";
import {
  journalCsvOffThread,
  readingsCsvOffThread,
  replayChartOffThread,
  replayCsvOffThread,
} from "~/features/jobs/chores-pool.server";
import { journalCsv } from "~/features/journal/journal-csv.server";
import { replayChartCsv, replayChartData } from "~/features/journal/replay-chart.server";
import { readingsCsv } from "~/features/readings/readings-csv-export.server";
import { measureUnitsFor, type ReadingRow } from "~/features/readings/readings.server";
import { DEFAULT_PREFERENCES, displayUnitsFor } from "~/utils/display-units";
import { bareTank } from "../models/helpers";

const units = displayUnitsFor({ ...DEFAULT_PREFERENCES, nitrateUnit: "NO3" });
const scenario = bareTank({ run: { lengthDays: 60, outputIntervalDays: 0.25 } });
const run = simulate(scenario, {
  events: [
    { day: 10, kind: "waterChange", fraction: 0.5 },
    { day: 20, kind: "feeding", feedGPerDay: 0.4 },
    { day: 30, kind: "filterCleaning", sludgeFraction: 0.5, bacteriaShare: 0.1 },
  ],
});
const input = {
  series: run.series,
  events: run.events,
  scenario: { water: scenario.water, targets: scenario.targets },
  units,
};

describe("answers from the chores thread", () => {
  it("a journal replay's chart keeps every field", async () => {
    const direct = replayChartData(input);
    expect(direct.events.length).toBeGreaterThan(0);
    expect(await replayChartOffThread(input)).toEqual(direct);
  });

  it("the CSV files are the very text the writers give", async () => {
    expect(await replayCsvOffThread(input)).toBe(replayChartCsv(input));
    const entries = [
      { id: 1, doneAt: Date.UTC(2026, 2, 1, 9), kind: "water_change" as const, details: { share: 0.3 }, note: "a, b" },
    ];
    expect(await journalCsvOffThread(entries as never)).toBe(journalCsv(entries as never));
    const rows = [
      {
        id: 1,
        tankId: 1,
        takenAt: new Date(Date.UTC(2026, 2, 1, 9)),
        tan: 0.1,
        nitrite: null,
        nitrate: 5,
        ph: 7.1,
        kh: null,
        temperatureC: 24,
        note: "=1+1",
      },
    ] as unknown as ReadingRow[];
    const measureUnits = measureUnitsFor(units);
    expect(await readingsCsvOffThread(rows, measureUnits)).toBe(readingsCsv(rows, measureUnits));
  });
});
