/**
 * The journal replay's chart, from the replay's own series: thinned and packed for the page, or
 * whole as CSV. Pure (no database), so it runs on the chores thread (chores-pool.server.ts): for
 * a full journal, some 33,000 samples, converting, thinning and writing them took the request
 * thread 60–150 ms.
 */
import type { EventRecord, Scenario, Series } from "~models";
import type { Replay } from "~/features/journal/journal-replay.server";
import { runChart, type PackedRunChart } from "~/features/runs/run-chart";
import { packSeries } from "~/features/runs/series-packing";
import { thinEvents, thinSeries } from "~/features/runs/thin-series";
import { seriesCsv } from "~/utils/csv";
import type { DisplayUnits } from "~/utils/display-units";

/** A replay's run and what its chart needs of the settings, in the viewer's units. */
export type ReplayChartInput = {
  series: Series;
  events: readonly EventRecord[];
  scenario: Pick<Scenario, "water" | "targets">;
  units: DisplayUnits;
};

export type ReplayChartData = PackedRunChart & { eventsTotal: number; samplesTotal: number };

/** What the chart of replay `r`, run on `settings`, needs: only the settings' water and targets go to the worker. */
export function replayChartInput(r: Replay, settings: Scenario, units: DisplayUnits): ReplayChartInput {
  return {
    series: r.result.series,
    events: r.result.events,
    scenario: { water: settings.water, targets: settings.targets },
    units,
  };
}

function loggedChart({ series, events, scenario, units }: ReplayChartInput) {
  // The scenario's own meals are not something the keeper logged: only the journal's events are marked.
  return runChart({ series, events: events.filter((e) => e.kind !== "feeding") }, scenario, units);
}

/** The chart the page draws: a long replay thinned to each stretch's extremes (thin-series.ts). */
export function replayChartData(input: ReplayChartInput): ReplayChartData {
  const { series, events: marked, ...rest } = loggedChart(input);
  const sent = thinSeries(series);
  const thinned = thinEvents(marked, sent.t[0] ?? 0, sent.t.at(-1) ?? 0);
  return {
    ...rest,
    events: thinned.events,
    eventsTotal: thinned.total,
    samplesTotal: series.t.length,
    packedSeries: packSeries(sent),
  };
}

/** Every sample as CSV, in the same columns as the chart's own CSV. */
export function replayChartCsv(input: ReplayChartInput): string {
  const chart = loggedChart(input);
  return seriesCsv(chart.series, chart.labels, chart.events);
}
