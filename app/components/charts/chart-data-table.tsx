/**
 * The numbers behind a chart as a table, for screen readers and for copying: one row per day
 * (or per sample when output is daily or coarser), folded under "Show the numbers as a table".
 */
import { memo, useId, useMemo, useState } from "react";
import { eventRows, describeEvent, speciesValues } from "~/utils/csv";
import { formatDay, formatNumber } from "~/components/charts/format";
import { lowerBound, sampleSide, valueAt } from "~/utils/series-lookup";
import { TAN_CRITERIA, tanCriteriaOf } from "~/components/charts/tan-criteria";
import { PLANT_UNIT, SERIES_NAMES, unitOf } from "~/components/charts/palette";
import { tableRowIndices } from "~/components/charts/table-rows";
import type { ChartEvent, ChartSeries, ChartUnits, SeriesKey } from "~/utils/chart-data";

export type TableColumn = {
  key: string;
  label: string;
  unit: string;
  /** Value for row sample `i` of the table's `t` (at `day` = t[i]). */
  at: (i: number, day: number) => number;
};

export type ChartDataTableProps = {
  caption: string;
  /** Sample days of the rows' run. */
  t: ArrayLike<number>;
  columns: readonly TableColumn[];
  events?: readonly ChartEvent[];
  /** Rows shown before "Show all rows" (default 60). */
  initialRows?: number;
  summary?: string;
};

/** Columns for one run: the four species and each plant group. */
export function seriesTableColumns(series: ChartSeries, units: ChartUnits): TableColumn[] {
  const species: TableColumn[] = (["tan", "nh3", "no2", "no3"] as const).map((k) => ({
    key: k,
    label: SERIES_NAMES[k].long,
    unit: unitOf(k, units),
    at: (i: number) => series[k][i],
  }));
  // The caution lines drawn over TAN, beside TAN: the table says what the chart draws.
  const criteria = tanCriteriaOf(series).map(({ kind, values }): TableColumn => ({
    key: `tan-${kind}`,
    label: TAN_CRITERIA[kind].name,
    unit: unitOf("tan", units),
    at: (i) => values[i],
  }));
  species.splice(1, 0, ...criteria);
  const plants = series.plants.map((p) => ({
    key: `plant-${p.id}`,
    label: p.name,
    unit: PLANT_UNIT,
    at: (i: number) => p.massG[i],
  }));
  return [...species, ...plants];
}

/**
 * Columns for a comparison: one per run, for one species. Rows follow the first run's days;
 * another run's value is taken at the same day (linear between its samples if they differ).
 */
export function compareTableColumns(
  runs: readonly { label: string; series: ChartSeries }[],
  key: SeriesKey,
  units: ChartUnits,
): TableColumn[] {
  const first = runs[0]?.series.t ?? [];
  return runs.map((run, k) => {
    const y = speciesValues(run.series, key);
    const same = run.series.t === first || sameDays(run.series.t, first);
    return {
      key: `run-${k}`,
      label: run.label,
      unit: unitOf(key, units),
      at: same
        ? (i: number) => y[i]
        : (i: number, day: number) => valueAt(run.series.t, y, day, sampleSide(first, i) ?? "before"),
    };
  });
}

function sameDays(a: ArrayLike<number>, b: ArrayLike<number>): boolean {
  if (a.length !== b.length) return false;
  for (let i = 0; i < a.length; i++) if (a[i] !== b[i]) return false;
  return true;
}

export const ChartDataTable = memo(function ChartDataTable({
  caption,
  t,
  columns,
  events = [],
  initialRows = 60,
  summary = "Show the numbers as a table",
}: ChartDataTableProps) {
  const captionId = useId();
  const [showAll, setShowAll] = useState(false);
  // The rows are drawn when the table is opened: a closed table costs the server nothing
  // (rendering hundreds of cells into every page was most of a results page's render time).
  const [open, setOpen] = useState(false);
  const { indices, daily } = useMemo(() => tableRowIndices(t), [t]);

  // Events per row: on daily rows every event of that day; on sample rows the sample it belongs to.
  const rowEvents = useMemo(() => {
    const out = new Map<number, ChartEvent[]>();
    if (!events.length) return out;
    if (!daily) return eventRows(t, events);
    const rows = new Set(indices);
    for (const e of events) {
      const d = Math.floor(e.day + 1e-9);
      // The first sample of the event's day is that day's row (see tableRowIndices).
      const idx = lowerBound(t, d - 1e-6);
      if (!rows.has(idx)) continue;
      const list = out.get(idx);
      if (list) list.push(e);
      else out.set(idx, [e]);
    }
    return out;
  }, [t, events, daily, indices]);

  const long = indices.length > initialRows;
  const shown = long && !showAll ? indices.slice(0, initialRows) : indices;
  const hasEvents = events.length > 0;

  return (
    <details className="rounded-md border border-stone-200 bg-white" onToggle={(e) => setOpen(e.currentTarget.open)}>
      <summary className="cursor-pointer px-3 py-2 text-sm font-semibold text-fern-800">{summary}</summary>
      {open ? (
        <div className="space-y-2 px-3 pb-3">
          <div className="max-h-[32rem] overflow-auto" tabIndex={0} role="region" aria-labelledby={captionId}>
            <table className="w-full border-collapse text-sm">
              <caption id={captionId} className="py-2 text-left text-sm text-stone-700">
                {caption}
                {daily ? " — one row per day, at the start of the day (before that day's maintenance)." : "."}
                {long && !showAll ? ` First ${initialRows} of ${indices.length} rows.` : ""}
              </caption>
              <thead className="sticky top-0 bg-white">
                <tr className="border-b border-stone-300 text-left align-bottom">
                  <th scope="col" className="px-2 py-1">
                    Day
                  </th>
                  {columns.map((c) => (
                    <th key={c.key} scope="col" className="num px-2 py-1 text-right">
                      <span className="font-serif">{c.label}</span>
                      <br />
                      <span className="text-xs font-normal text-stone-600">{c.unit}</span>
                    </th>
                  ))}
                  {hasEvents ? (
                    <th scope="col" className="px-2 py-1">
                      Events
                    </th>
                  ) : null}
                </tr>
              </thead>
              <tbody>
                {shown.map((i) => {
                  const day = t[i];
                  const side = daily ? null : sampleSide(t, i);
                  const evs = rowEvents.get(i);
                  return (
                    <tr key={i} className="border-b border-stone-100 align-top">
                      <th scope="row" className="num whitespace-nowrap px-2 py-1 text-left font-normal">
                        {formatDay(day).replace(/^day /, "")}
                        {side ? <span className="text-xs text-stone-600"> ({side})</span> : null}
                      </th>
                      {columns.map((c) => (
                        <td key={c.key} className="num px-2 py-1 text-right">
                          {formatNumber(c.at(i, day), 4)}
                        </td>
                      ))}
                      {hasEvents ? (
                        <td className="px-2 py-1 text-xs text-stone-700">
                          {evs ? evs.map(describeEvent).join("; ") : ""}
                        </td>
                      ) : null}
                    </tr>
                  );
                })}
              </tbody>
            </table>
          </div>
          {long ? (
            <button
              type="button"
              className="btn-secondary"
              aria-pressed={showAll}
              onClick={() => setShowAll((v) => !v)}
            >
              {showAll ? `Show the first ${initialRows} rows` : `Show all ${indices.length} rows`}
            </button>
          ) : null}
        </div>
      ) : null}
    </details>
  );
});
