/**
 * The results chart: TAN, free NH3, nitrite and nitrate on the left axis, plant dry mass per
 * group on the right, with series toggles, the nitrate target band, caution lines, events on the
 * time axis, test-kit readings, overlays of another run, a day cursor with a readout, the data
 * table and downloads. Drawing is shared with CompareChart through ChartFrame.
 */
import { memo, useCallback, useEffect, useMemo, useRef, useState } from "react";
import { ChartDataTable, seriesTableColumns } from "~/components/charts/chart-data-table";
import { ChartDownloads } from "~/components/charts/chart-downloads";
import {
  ChartFrame,
  type FrameBand,
  type FrameGuide,
  type FrameLine,
  type FramePanel,
  type FramePoint,
} from "~/components/charts/chart-frame";
import { seriesCsv, fileSlug } from "~/utils/csv";
import type { LegendItem } from "~/components/charts/downloads";
import { formatDay, formatNumber } from "~/components/charts/format";
import { useControllable, useDayCursor } from "~/components/charts/hooks";
import { EventKey, LineSwatch, ToggleButton } from "~/components/charts/legend";
import { nearestIndex, sampleSide, valueAt } from "~/utils/series-lookup";
import {
  BAND_COLOR,
  DEFAULT_EVENT_KINDS,
  EVENT_META,
  INK,
  PLANT_DASHES,
  PLANT_UNIT,
  SERIES_COLORS,
  SERIES_DASH,
  SERIES_KEYS,
  SERIES_NAMES,
  unitOf,
  type EventKind,
} from "~/components/charts/palette";
import type {
  ChartEvent,
  ChartGuides,
  ChartOverlay,
  ChartReading,
  ChartSeries,
  ChartUnits,
  SeriesKey,
} from "~/utils/chart-data";
import {
  fromVisibilityKey,
  fullVisibility,
  legendItems,
  OVERLAY_WIDTH,
  PlantSwatches,
  Readout,
  READING_SHAPE,
  shortName,
  SPECIES,
  visibilityKey,
  type Visibility,
} from "~/components/charts/time-series-parts";

export type { Visibility } from "~/components/charts/time-series-parts";

export type TimeSeriesChartProps = {
  title: string;
  /** For the SVG's <desc>; a summary is written when absent. */
  description?: string;
  series: ChartSeries;
  units: ChartUnits;
  /** Name of the main run beside overlays, e.g. "Saved" (default "This run"). */
  seriesLabel?: string;
  events?: readonly ChartEvent[];
  /** Which event kinds to mark on the time axis (default: all but meals). */
  eventKinds?: readonly EventKind[];
  guides?: ChartGuides;
  /** Other runs drawn thinner and lighter (a what-if preview). */
  overlays?: readonly ChartOverlay[];
  readings?: readonly ChartReading[];
  /** Controlled visibility (missing keys count as shown); or leave it to the chart. */
  visible?: Partial<Visibility>;
  defaultVisible?: Partial<Visibility>;
  onVisibleChange?: (v: Visibility) => void;
  /** Chart height in px (default 340); the panels share it. */
  height?: number;
  /** The presentation view: text at least 18 px. */
  presentation?: boolean;
  onCursorChange?: (day: number) => void;
  /**
   * Moves the day cursor to this day (nearest sample; at an event, the sample before it)
   * whenever it changes, e.g. from a slider or a play button. The person can still move the
   * cursor on the chart; leave it out and the chart keeps its own cursor.
   */
  cursorDay?: number;
  /** Show the data table under the chart (default true). */
  table?: boolean;
  /** File name stem for downloads, made file-safe (default from the title); false hides the buttons. */
  downloadName?: string | false;
};

type PanelKey = "ammonia" | "nitrite" | "nitrate" | "plants" | "oxygen";
/** The panel each species (and its readings) is drawn on. */
const SPECIES_PANEL: Record<string, PanelKey> = { tan: "ammonia", nh3: "ammonia", no2: "nitrite", no3: "nitrate" };
const OXYGEN_COLOR = "#0e7490";
const CAUTION_RED = "#b91c1c";

/** "TAN · free NH3, mg/L NH3" when the species share a unit, else each with its own. */
function sharedUnitTitle(keys: readonly SeriesKey[], units: ChartUnits): string {
  const names = keys.map((k) => SERIES_NAMES[k].short);
  const unitList = [...new Set(keys.map((k) => unitOf(k, units)))];
  if (unitList.length <= 1) return `${names.join(" · ")}${unitList.length ? `, ${unitList[0]}` : ""}`;
  return keys.map((k, i) => `${names[i]}, ${unitOf(k, units)}`).join(" · ");
}

const LINE_WIDTH: Record<SeriesKey, number> = { tan: 2, nh3: 1.75, no2: 2, no3: 2.25, plants: 1.75 };
const OVERLAY_OPACITY = 0.5;

const EMPTY: readonly never[] = [];

export const TimeSeriesChart = memo(function TimeSeriesChart({
  title,
  description,
  series,
  units,
  seriesLabel = "This run",
  events = EMPTY,
  eventKinds = DEFAULT_EVENT_KINDS,
  guides,
  overlays = EMPTY,
  readings = EMPTY,
  visible: visibleProp,
  defaultVisible,
  onVisibleChange,
  height = 340,
  presentation = false,
  onCursorChange,
  cursorDay,
  table = true,
  downloadName,
}: TimeSeriesChartProps) {
  const [visibleRaw, setVisible] = useControllable<Partial<Visibility>>(
    visibleProp,
    () => fullVisibility(defaultVisible),
    onVisibleChange as ((v: Partial<Visibility>) => void) | undefined,
  );
  // A parent may pass a fresh object each render: key the memos on what it says, not its identity.
  const visKey = visibilityKey(fullVisibility(visibleRaw));
  const visible = useMemo(() => fromVisibilityKey(visKey), [visKey]);
  const hasPlants = series.plants.length > 0;
  const [hiddenOverlays, setHiddenOverlays] = useState<ReadonlySet<number>>(() => new Set());
  const svgRef = useRef<SVGSVGElement>(null);

  const shownEvents = useMemo(() => events.filter((e) => eventKinds.includes(e.kind)), [events, eventKinds]);

  const lines = useMemo(() => {
    const vis = (k: SeriesKey) => visible[k];
    const out: (FrameLine & { panel: PanelKey })[] = [];
    const add = (s: ChartSeries, prefix: string, overlay: boolean) => {
      for (const k of SPECIES) {
        if (!vis(k)) continue;
        out.push({
          key: `${prefix}-${k}`,
          t: s.t,
          y: s[k],
          panel: SPECIES_PANEL[k],
          color: SERIES_COLORS[k],
          dash: SERIES_DASH[k],
          width: overlay ? OVERLAY_WIDTH : LINE_WIDTH[k],
          opacity: overlay ? OVERLAY_OPACITY : undefined,
          label: overlay ? undefined : SERIES_NAMES[k].short,
          cursorDot: !overlay,
        });
      }
      if (vis("plants")) {
        s.plants.forEach((p, g) => {
          out.push({
            key: `${prefix}-plant-${p.id}`,
            t: s.t,
            y: p.massG,
            panel: "plants",
            color: SERIES_COLORS.plants,
            dash: PLANT_DASHES[g % PLANT_DASHES.length],
            width: overlay ? OVERLAY_WIDTH : LINE_WIDTH.plants,
            opacity: overlay ? OVERLAY_OPACITY : undefined,
            label: overlay ? undefined : shortName(p.name),
            cursorDot: !overlay,
          });
        });
      }
    };
    overlays.forEach((o, k) => {
      if (!hiddenOverlays.has(k)) add(o.series, `ov${k}`, true);
    });
    add(series, "main", false);
    if (series.o2 && series.o2.length === series.t.length) {
      out.push({
        key: "main-o2",
        t: series.t,
        y: series.o2,
        panel: "oxygen",
        color: OXYGEN_COLOR,
        width: 2,
        label: "O2",
        cursorDot: true,
      });
    }
    return out;
  }, [series, overlays, visible, hiddenOverlays]);

  const { bands, guideLines } = useMemo(() => {
    const b: FrameBand[] = [];
    const g: FrameGuide[] = [];
    if (guides?.nitrateBand && visible.no3) {
      const { low, high } = guides.nitrateBand;
      b.push({
        key: "no3-band",
        low,
        high,
        color: BAND_COLOR,
        label: `NO3 target ${formatNumber(low)}–${formatNumber(high)}`,
      });
    }
    if (guides?.freeAmmoniaCaution != null && visible.nh3) {
      g.push({
        key: "nh3-caution",
        value: guides.freeAmmoniaCaution,
        color: SERIES_COLORS.nh3,
        label: `free NH3 caution ${formatNumber(guides.freeAmmoniaCaution)}`,
      });
    }
    if (guides?.tanCriterion != null && visible.tan) {
      g.push({
        key: "tan-criterion",
        value: guides.tanCriterion,
        color: SERIES_COLORS.tan,
        label: `TAN criterion at this pH and °C ${formatNumber(guides.tanCriterion)}`,
      });
    }
    if (guides?.nitriteCaution != null && visible.no2) {
      g.push({
        key: "no2-caution",
        value: guides.nitriteCaution,
        color: SERIES_COLORS.no2,
        label: `NO2 caution ${formatNumber(guides.nitriteCaution)}`,
      });
    }
    if (guides?.oxygenCaution != null && series.o2?.length) {
      g.push({
        key: "o2-caution",
        value: guides.oxygenCaution,
        color: CAUTION_RED,
        label: `fish suffer below ${formatNumber(guides.oxygenCaution)}`,
      });
    }
    return { bands: b, guideLines: g };
  }, [guides, visible, series.o2]);

  const points = useMemo(() => {
    const out: FramePoint[] = [];
    readings.forEach((r, n) => {
      for (const k of ["tan", "no2", "no3"] as const) {
        const v = r[k];
        if (v == null || !Number.isFinite(v) || !visible[k]) continue;
        out.push({
          key: `r${n}-${k}`,
          day: r.day,
          value: v,
          color: SERIES_COLORS[k],
          shape: READING_SHAPE[k],
          title: `${SERIES_NAMES[k].short} reading, ${formatDay(r.day)}: ${formatNumber(v)} ${unitOf(k, units)}`,
        });
      }
    });
    return out;
  }, [readings, visible, units]);

  // Stacked panels on one time axis: ammonia and nitrite each on their own scale (tenths of a
  // mg/L, never flattened under nitrate's tens, nor ammonia under a nitrite peak), nitrate with
  // its band, plant mass, oxygen.
  const panels = useMemo((): FramePanel[] => {
    const scale = height / 340;
    const guidePanel: Record<string, PanelKey> = {
      "nh3-caution": "ammonia",
      "tan-criterion": "ammonia",
      "no2-caution": "nitrite",
      "o2-caution": "oxygen",
    };
    const of = (panel: PanelKey) => ({
      lines: lines.filter((l) => l.panel === panel),
      guides: guideLines.filter((g) => guidePanel[g.key] === panel),
      points: points.filter((p) => SPECIES_PANEL[p.key.slice(p.key.lastIndexOf("-") + 1)] === panel),
    });
    const ammonia = (["tan", "nh3"] as const).filter((k) => visible[k]);
    return [
      {
        key: "ammonia",
        label: sharedUnitTitle(ammonia, units),
        height: Math.round(130 * scale),
        ...of("ammonia"),
      },
      {
        key: "nitrite",
        label: `NO2, ${unitOf("no2", units)}`,
        height: Math.round(100 * scale),
        ...of("nitrite"),
      },
      {
        key: "nitrate",
        label: `NO3, ${unitOf("no3", units)}`,
        height: Math.round(120 * scale),
        bands,
        ...of("nitrate"),
      },
      { key: "plants", label: `plants, ${PLANT_UNIT}`, height: Math.round(80 * scale), ...of("plants") },
      { key: "oxygen", label: "oxygen, mg O2/L", height: Math.round(80 * scale), ...of("oxygen") },
    ];
  }, [lines, guideLines, bands, points, visible, units, height]);

  const describe = useCallback(
    (i: number) => {
      const day = series.t[i];
      const side = sampleSide(series.t, i);
      const parts = SPECIES.filter((k) => visible[k]).map(
        (k) => `${SERIES_NAMES[k].short} ${formatNumber(series[k][i])} ${unitOf(k, units)}`,
      );
      if (visible.plants)
        for (const p of series.plants) parts.push(`${p.name} ${formatNumber(p.massG[i])} ${PLANT_UNIT}`);
      for (const [k, o] of overlays.entries()) {
        if (hiddenOverlays.has(k)) continue;
        const vals = SPECIES.filter((s) => visible[s]).map(
          (s) => `${SERIES_NAMES[s].short} ${formatNumber(valueAt(o.series.t, o.series[s], day, side ?? "before"))}`,
        );
        parts.push(`${o.label}: ${vals.join(", ")}`);
      }
      const ev = events.filter((e) => e.day === day).map((e) => EVENT_META[e.kind].label.toLowerCase());
      const when = `${formatDay(day)}${side && ev.length ? ` (${side} ${ev.join(" and ")})` : ""}`;
      return `${when}: ${parts.join(", ")}.`;
    },
    [series, units, visible, overlays, hiddenOverlays, events],
  );

  const cursor = useDayCursor(series.t, describe, onCursorChange);
  const moveCursor = cursor.moveTo;
  useEffect(() => {
    if (cursorDay === undefined || !Number.isFinite(cursorDay)) return;
    const i = nearestIndex(series.t, cursorDay, "before");
    // "pointer": no live-region announcement for every frame of an animation.
    if (i >= 0) moveCursor(i, "pointer");
  }, [cursorDay, series.t, moveCursor]);

  const fileName = downloadName === false ? null : fileSlug(downloadName ?? title);
  const legend: LegendItem[] = useMemo(
    () => legendItems(series, units, visible, overlays, hiddenOverlays, seriesLabel),
    [series, units, visible, overlays, hiddenOverlays, seriesLabel],
  );
  const columns = useMemo(() => seriesTableColumns(series, units), [series, units]);

  const toggle = (k: SeriesKey) => setVisible({ ...visible, [k]: !visible[k] });
  const toolbar = (
    <div className="space-y-2">
      <div className="flex flex-wrap gap-2" role="group" aria-label="Series shown on the chart">
        {SERIES_KEYS.filter((k) => k !== "plants" || hasPlants).map((k) => (
          <ToggleButton
            key={k}
            pressed={visible[k]}
            onToggle={() => toggle(k)}
            swatch={
              k === "plants" ? (
                <PlantSwatches count={series.plants.length} />
              ) : (
                <LineSwatch color={SERIES_COLORS[k]} dash={SERIES_DASH[k]} />
              )
            }
          >
            <span>{SERIES_NAMES[k].short}</span>
            <span className="text-xs text-stone-600">{unitOf(k, units)}</span>
          </ToggleButton>
        ))}
        {overlays.map((o, k) => (
          <ToggleButton
            key={`ov${k}`}
            pressed={!hiddenOverlays.has(k)}
            onToggle={() =>
              setHiddenOverlays((old) => {
                const next = new Set(old);
                if (next.has(k)) next.delete(k);
                else next.add(k);
                return next;
              })
            }
            swatch={<LineSwatch color={INK} width={OVERLAY_WIDTH} opacity={0.7} />}
          >
            <span>{o.label}</span>
            <span className="text-xs text-stone-600">thin lines</span>
          </ToggleButton>
        ))}
      </div>
      <EventKey events={shownEvents} />
    </div>
  );

  const readout = (
    <Readout
      index={cursor.index}
      series={series}
      units={units}
      seriesLabel={seriesLabel}
      visible={visible}
      overlays={overlays.filter((_o, k) => !hiddenOverlays.has(k))}
      readings={readings}
      events={events}
    />
  );

  const summary =
    description ??
    `${SPECIES.filter((k) => visible[k])
      .map((k) => SERIES_NAMES[k].long)
      .join(", ")}${visible.plants && hasPlants ? ", and plant dry mass on a second axis" : ""} over ${formatNumber(
      series.t[series.t.length - 1] ?? 0,
    )} days${overlays.length ? `, with ${overlays.map((o) => o.label).join(" and ")} as thinner lines` : ""}. ${
      shownEvents.length
    } events are marked on the time axis. The same numbers are in the table below the chart.`;

  return (
    <ChartFrame
      title={title}
      description={summary}
      t={series.t}
      panels={panels}
      events={shownEvents}
      minFontSize={presentation ? 18 : 11}
      cursor={cursor}
      readout={readout}
      announcement={cursor.announcement}
      toolbar={toolbar}
      svgRef={svgRef}
      footer={
        <>
          {fileName ? (
            <ChartDownloads
              fileName={fileName}
              title={title}
              getSvg={() => svgRef.current}
              getCsv={() => seriesCsv(series, units, events)}
              legend={legend}
            />
          ) : null}
          {table ? (
            <ChartDataTable caption={`${title}: the numbers`} t={series.t} columns={columns} events={events} />
          ) : null}
        </>
      }
    />
  );
});
