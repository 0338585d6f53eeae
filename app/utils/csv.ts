/**
 * CSV text from chart data (pure; RFC 4180: comma, CRLF, quotes doubled).
 *
 * Spreadsheets run a cell that begins with = + - @ (or a tab or carriage return) as a formula,
 * and some read the full-width ＝ ＋ － ＠ the same way (OWASP CSV Injection), so a plant group
 * named "=HYPERLINK(…)" could do harm when a keeper opens the file. Text cells that begin so get
 * a leading single quote — and so do cells that already begin with quotes before such a
 * character, so reading a file back (unneutraliseCell) gives every text exactly as it was.
 * Numbers are written as numbers, never quoted or prefixed: -0.5 is a value, not a formula.
 */
import { EVENT_META, PLANT_UNIT, SERIES_NAMES, unitOf } from "~/components/charts/palette";
import { TAN_CRITERIA, tanCriteriaOf } from "~/components/charts/tan-criteria";
import { upperBound, lowerBound } from "~/utils/series-lookup";
import type { ChartEvent, ChartSeries, ChartUnits, SeriesKey } from "~/utils/chart-data";
import { fileSlugFor } from "~/utils/file-name";

export type CsvCell = string | number | null | undefined;

const FORMULA_START = /^'*[=+\-@\t\r\uff1d\uff0b\uff0d\uff20]/;

export function csvCell(v: CsvCell): string {
  if (v == null) return "";
  if (typeof v === "number") return Number.isFinite(v) ? String(v) : "";
  const text = FORMULA_START.test(v) ? `'${v}` : v;
  return /[",\r\n]/.test(text) || text !== text.trim() ? `"${text.replace(/"/g, '""')}"` : text;
}

/** A text cell read back from a file we wrote: the neutralising quote taken off again. */
export function unneutraliseCell(text: string): string {
  return text.startsWith("'") && FORMULA_START.test(text) ? text.slice(1) : text;
}

export function toCsv(rows: readonly (readonly CsvCell[])[]): string {
  return rows.map((r) => r.map(csvCell).join(",")).join("\r\n") + "\r\n";
}

/**
 * Which sample each event belongs to: the "after" sample of the event's pair when there is one
 * (the row shows the state the event left), otherwise the first sample at or after the event.
 */
export function eventRows(t: ArrayLike<number>, events: readonly ChartEvent[]): Map<number, ChartEvent[]> {
  const out = new Map<number, ChartEvent[]>();
  if (t.length === 0) return out;
  for (const e of events) {
    let i = upperBound(t, e.day) - 1;
    if (i < 0 || t[i] !== e.day) i = Math.min(lowerBound(t, e.day), t.length - 1);
    const list = out.get(i);
    if (list) list.push(e);
    else out.set(i, [e]);
  }
  return out;
}

export function describeEvent(e: ChartEvent): string {
  return e.detail ? `${EVENT_META[e.kind].label}: ${e.detail}` : EVENT_META[e.kind].label;
}

/** One run: a row per sample (both samples of an event pair), all species, each plant group, events. */
export function seriesCsv(series: ChartSeries, units: ChartUnits, events: readonly ChartEvent[] = []): string {
  const species = ["tan", "nh3", "no2", "no3"] as const;
  // The TAN caution lines at each sample's pH, as the chart and its table show them (decision 0010).
  const criteria = tanCriteriaOf(series).map(({ kind, values }) => ({ name: TAN_CRITERIA[kind].name, values }));
  const header: CsvCell[] = [
    "day",
    ...species.map((k) => `${SERIES_NAMES[k].long} (${unitOf(k, units)})`),
    ...criteria.map((c) => `${c.name} (${unitOf("tan", units)})`),
    ...series.plants.map((p) => `${p.name} (${PLANT_UNIT})`),
    "events",
  ];
  const byRow = eventRows(series.t, events);
  const rows: CsvCell[][] = [header];
  for (let i = 0; i < series.t.length; i++) {
    rows.push([
      series.t[i],
      ...species.map((k) => series[k][i]),
      ...criteria.map((c) => c.values[i]),
      ...series.plants.map((p) => p.massG[i]),
      (byRow.get(i) ?? []).map(describeEvent).join("; "),
    ]);
  }
  return toCsv(rows);
}

/** Values of one species of a run; "plants" is the dry mass of all groups together. */
export function speciesValues(series: ChartSeries, key: SeriesKey): ArrayLike<number> {
  if (key !== "plants") return series[key];
  return totalPlantMass(series);
}

const totals = new WeakMap<object, Float64Array>();

/** Sum of all plant groups per sample (cached per series). */
function totalPlantMass(series: ChartSeries): Float64Array {
  const hit = totals.get(series);
  if (hit) return hit;
  const sum = new Float64Array(series.t.length);
  for (const p of series.plants) for (let i = 0; i < sum.length; i++) sum[i] += p.massG[i];
  totals.set(series, sum);
  return sum;
}

/**
 * A comparison in long form (scenario, day, value): runs may have different sample days, and
 * long form keeps every value exact instead of interpolating onto shared days.
 */
export function compareCsv(
  runs: readonly { label: string; series: ChartSeries }[],
  key: SeriesKey,
  units: ChartUnits,
): string {
  const rows: CsvCell[][] = [["scenario", "day", `${SERIES_NAMES[key].long} (${unitOf(key, units)})`]];
  for (const run of runs) {
    const y = speciesValues(run.series, key);
    for (let i = 0; i < run.series.t.length; i++) rows.push([run.label, run.series.t[i], y[i]]);
  }
  return toCsv(rows);
}

/** A chart's download name from its title (see app/utils/file-name.ts). */
export function fileSlug(title: string, fallback = "fernwater-chart"): string {
  return fileSlugFor(title, fallback);
}
