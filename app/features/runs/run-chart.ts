/**
 * What a time-series chart draws for one model run, in the viewer's units: the series with the
 * TAN caution lines at each sample's pH (decision 0010), the flat caution lines and the nitrate
 * band, and the events on the time axis. The results views (results.server.ts) and the
 * journal's "as it happened" replay both build their charts with it, so they draw alike.
 */
import { OXYGEN, type EventRecord, type Scenario, type Series } from "~models";
import { tanCriterionLines } from "~/features/runs/criterion-line";
import { displayGuides, displaySeries } from "~/features/runs/display-figures";
import { chartEventKind, type ChartEvent, type ChartGuides, type ChartSeries } from "~/utils/chart-data";
import { unitLabels, type DisplayUnits, type UnitLabels } from "~/utils/display-units";
import type { PackedSeries } from "~/features/runs/series-packing";

export type RunChart = { labels: UnitLabels; series: ChartSeries; events: ChartEvent[]; guides: ChartGuides };

/**
 * @param run the engine's series (mg N/L, pH per sample) and event records
 * @param scenario the run's settings: its pH (for a series without pH per sample), temperature and nitrate band
 */
export function runChart(
  run: { series: Series; events: readonly EventRecord[] },
  scenario: Pick<Scenario, "water" | "targets">,
  units: DisplayUnits,
): RunChart {
  return {
    labels: unitLabels(units),
    series: displaySeries(
      run.series,
      units,
      tanCriterionLines(run.series, scenario.water.pH, scenario.water.temperatureC),
    ),
    events: run.events.map((e): ChartEvent => ({ day: e.day, kind: chartEventKind(e.kind), detail: e.detail })),
    guides: { ...displayGuides(scenario.targets, units), oxygenCaution: OXYGEN.cautionMgPerL.value },
  };
}

/** The chart with its series packed into strings (series-packing.ts), as pages send it. */
export type PackedRunChart = Omit<RunChart, "series"> & { packedSeries: PackedSeries };
