/**
 * Pieces of the results chart (time-series-chart.tsx): which series show, the legend and its
 * plant swatches, and the readout at the day cursor.
 */
import type { LegendItem } from "~/components/charts/downloads";
import { formatDay, formatNumber, formatSigned } from "~/components/charts/format";
import { TAN_CRITERIA, TAN_CRITERION_KINDS, tanCriteriaOf, tanCriterionOf } from "~/components/charts/tan-criteria";
import { LineSwatch } from "~/components/charts/legend";
import { residualsNear, sampleSide, valueAt, type Side } from "~/utils/series-lookup";
import {
  EVENT_META,
  INK,
  PLANT_DASHES,
  PLANT_UNIT,
  SERIES_COLORS,
  SERIES_DASH,
  SERIES_KEYS,
  SERIES_NAMES,
  unitOf,
} from "~/components/charts/palette";
import type {
  ChartEvent,
  ChartOverlay,
  ChartReading,
  ChartSeries,
  ChartUnits,
  SeriesKey,
  SpeciesKey,
} from "~/utils/chart-data";

/** Which series show, by key. */
export type Visibility = Record<SeriesKey, boolean>;

export const SPECIES: readonly SpeciesKey[] = ["tan", "nh3", "no2", "no3"];
export const OVERLAY_WIDTH = 1.25;
/** Reading markers: TAN filled, nitrite a ring, nitrate a ring with a dot. */
export const READING_SHAPE = { tan: "filled", no2: "ring", no3: "dot" } as const;

export function fullVisibility(v: Partial<Visibility> | undefined): Visibility {
  return { tan: true, nh3: true, no2: true, no3: true, plants: true, ...v };
}

export function visibilityKey(v: Visibility): string {
  return SERIES_KEYS.map((k) => (v[k] ? "1" : "0")).join("");
}

export function fromVisibilityKey(key: string): Visibility {
  const v = fullVisibility(undefined);
  SERIES_KEYS.forEach((k, n) => (v[k] = key[n] === "1"));
  return v;
}

export function shortName(name: string): string {
  return name.length > 18 ? `${name.slice(0, 17)}…` : name;
}

export function PlantSwatches({ count }: { count: number }) {
  return (
    <span className="inline-flex flex-col gap-0.5">
      {Array.from({ length: Math.min(count, 3) }, (_x, g) => (
        <svg key={g} width="28" height="4" aria-hidden="true">
          <line
            x1="1"
            x2="27"
            y1="2"
            y2="2"
            stroke={SERIES_COLORS.plants}
            strokeWidth={2}
            strokeDasharray={PLANT_DASHES[g]}
          />
        </svg>
      ))}
    </span>
  );
}

export function Readout({
  index,
  series,
  units,
  seriesLabel,
  visible,
  overlays,
  readings,
  events,
}: {
  index: number;
  series: ChartSeries;
  units: ChartUnits;
  seriesLabel: string;
  visible: Visibility;
  overlays: readonly ChartOverlay[];
  readings: readonly ChartReading[];
  events: readonly ChartEvent[];
}) {
  const t = series.t;
  if (t.length === 0) return null;
  const day = t[index];
  const side: Side | null = sampleSide(t, index);
  const dayEvents = events.filter((e) => e.day === day);
  const rows: {
    key: string;
    name: string;
    color: string;
    dash?: string;
    unit: string;
    main: number;
    others: number[];
  }[] = [];
  for (const k of SPECIES) {
    if (!visible[k]) continue;
    rows.push({
      key: k,
      name: SERIES_NAMES[k].short,
      color: SERIES_COLORS[k],
      dash: SERIES_DASH[k],
      unit: unitOf(k, units),
      main: series[k][index],
      others: overlays.map((o) => valueAt(o.series.t, o.series[k], day, side ?? "before")),
    });
  }
  for (const { kind, values } of visible.tan ? tanCriteriaOf(series) : []) {
    rows.push({
      key: `tan-${kind}`,
      name: TAN_CRITERIA[kind].name,
      color: SERIES_COLORS.tan,
      dash: TAN_CRITERIA[kind].dash,
      unit: unitOf("tan", units),
      main: values[index],
      others: overlays.map((o) => {
        const v = tanCriterionOf(o.series, kind);
        return v ? valueAt(o.series.t, v, day, side ?? "before") : NaN;
      }),
    });
  }
  if (visible.plants) {
    series.plants.forEach((p, g) => {
      rows.push({
        key: `plant-${p.id}`,
        name: p.name,
        color: SERIES_COLORS.plants,
        dash: PLANT_DASHES[g % PLANT_DASHES.length],
        unit: PLANT_UNIT,
        main: p.massG[index],
        others: overlays.map((o) => {
          const q = o.series.plants.find((x) => x.id === p.id);
          return q ? valueAt(o.series.t, q.massG, day, side ?? "before") : NaN;
        }),
      });
    });
  }
  // Readings within half a day of the cursor.
  const residuals = residualsNear(readings, day, 0.5, t, series);

  return (
    <div className="space-y-2 rounded-md border border-stone-200 bg-white p-3">
      <p className="font-semibold">
        {formatDay(day)}
        {side && dayEvents.length ? (
          <span className="font-normal text-stone-600">
            {" "}
            — {side === "before" ? "just before" : "just after"} the event
          </span>
        ) : null}
      </p>
      <table className="w-full text-sm">
        <caption className="sr-only">Values at {formatDay(day)}</caption>
        <thead className={overlays.length ? "" : "sr-only"}>
          <tr className="text-left align-bottom text-xs text-stone-600">
            <th scope="col" className="font-normal">
              Series
            </th>
            <th scope="col" className="text-right font-normal">
              {seriesLabel}
            </th>
            {overlays.map((o) => (
              <th key={o.label} scope="col" className="break-words pl-2 text-right font-normal">
                {o.label}
              </th>
            ))}
          </tr>
        </thead>
        <tbody>
          {rows.map((r) => (
            <tr key={r.key} className="align-top">
              <th scope="row" className="py-0.5 pr-2 text-left font-normal">
                <span className="inline-flex items-start gap-1.5">
                  <span className="pt-1">
                    <LineSwatch color={r.color} dash={r.dash} />
                  </span>
                  <span>
                    {r.name} <span className="block text-xs text-stone-600">{r.unit}</span>
                  </span>
                </span>
              </th>
              <td className="num whitespace-nowrap py-0.5 text-right">{formatNumber(r.main)}</td>
              {r.others.map((v, k) => (
                <td key={k} className="num whitespace-nowrap py-0.5 pl-2 text-right text-stone-700">
                  {formatNumber(v)}
                </td>
              ))}
            </tr>
          ))}
        </tbody>
      </table>
      {residuals.length ? (
        <div>
          <p className="text-xs font-semibold text-stone-700">Test readings</p>
          <ul className="text-xs">
            {residuals.map((r) => (
              <li key={`${r.key}-${r.day}`}>
                {SERIES_NAMES[r.key].short} on {formatDay(r.day)}: measured{" "}
                <span className="figure">{formatNumber(r.measured)}</span>, model{" "}
                <span className="figure">{formatNumber(r.model)}</span>, reading − model{" "}
                <span className="figure">{formatSigned(r.residual)}</span> {unitOf(r.key, units)}
              </li>
            ))}
          </ul>
        </div>
      ) : null}
      {dayEvents.length ? (
        <ul className="space-y-1 text-xs text-stone-700">
          {dayEvents.map((e, k) => (
            <li key={k}>
              <span className="font-semibold">{EVENT_META[e.kind].label}:</span> {e.detail}
            </li>
          ))}
        </ul>
      ) : null}
    </div>
  );
}

export function legendItems(
  series: ChartSeries,
  units: ChartUnits,
  visible: Visibility,
  overlays: readonly ChartOverlay[],
  hidden: ReadonlySet<number>,
  seriesLabel: string,
): LegendItem[] {
  const out: LegendItem[] = [];
  for (const k of SPECIES) {
    if (visible[k])
      out.push({
        label: `${SERIES_NAMES[k].long}, ${unitOf(k, units)}`,
        color: SERIES_COLORS[k],
        dash: SERIES_DASH[k],
      });
  }
  for (const kind of visible.tan ? TAN_CRITERION_KINDS : []) {
    if (!tanCriterionOf(series, kind)) continue;
    const { name, averaged, dash } = TAN_CRITERIA[kind];
    out.push({ label: `${name} (US EPA 2013, ${averaged}), ${unitOf("tan", units)}`, color: SERIES_COLORS.tan, dash });
  }
  if (visible.plants) {
    series.plants.forEach((p, g) =>
      out.push({
        label: `${p.name}, ${PLANT_UNIT}`,
        color: SERIES_COLORS.plants,
        dash: PLANT_DASHES[g % PLANT_DASHES.length],
      }),
    );
  }
  if (overlays.some((_o, k) => !hidden.has(k))) {
    out.push({ label: `thick: ${seriesLabel}`, color: INK, width: 2.5 });
    overlays.forEach((o, k) => {
      if (!hidden.has(k)) out.push({ label: `thin: ${o.label}`, color: INK, width: OVERLAY_WIDTH, opacity: 0.7 });
    });
  }
  return out;
}
