/**
 * The results chart: stacked panels on one time axis (ammonia, nitrite, nitrate, plant dry mass,
 * oxygen; built in time-series-panels.ts), with series toggles, the nitrate target band, caution lines, events on the
 * time axis, test-kit readings, overlays of another run, a day cursor with a readout, the data
 * table and downloads. Drawing is shared with CompareChart through ChartFrame.
 */
import { memo, useCallback, useEffect, useMemo, useRef, useState } from "react";
import { ChartBeforeScript, seriesChartHeight } from "~/components/charts/chart-before-script";
import { ChartDataTable, seriesTableColumns } from "~/components/charts/chart-data-table";
import { ChartDownloads } from "~/components/charts/chart-downloads";
import { ChartFrame } from "~/components/charts/chart-frame";
import { TAN_CRITERIA, tanCriteriaOf } from "~/components/charts/tan-criteria";
import { TanCriteriaNote } from "~/components/charts/tan-criteria-note";
import { useSeriesPanels } from "~/components/charts/time-series-panels";
import { seriesCsv, fileSlug } from "~/utils/csv";
import type { LegendItem } from "~/components/charts/downloads";
import { formatDay, formatNumber } from "~/components/charts/format";
import { useControllable, useDayCursor } from "~/components/charts/hooks";
import { EventKey, LineSwatch, ToggleButton } from "~/components/charts/legend";
import { useHydrated } from "~/utils/use-hydrated";
import { nearestIndex, sampleSide, valueAt } from "~/utils/series-lookup";
import {
  DEFAULT_EVENT_KINDS,
  EVENT_META,
  INK,
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
  SPECIES,
  visibilityKey,
  type Visibility,
} from "~/components/charts/time-series-parts";

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
  /** The run's CSV, offered in the chart's stand-in when scripts are off (decision 0012). */
  csvHref?: string;
  /** Where the CSV button downloads from, when the chart holds only a share of the samples (else it is made in the browser). */
  csvDownloadHref?: string;
  /** File name stem for downloads, made file-safe (default from the title); false hides the buttons. */
  downloadName?: string | false;
};

const EMPTY: readonly never[] = [];

/**
 * The results chart. The server (and the render that hydrates its HTML) sends a stand-in of the
 * chart's size; the browser draws the chart right after, since only its script can draw the
 * curves and work the controls (decision 0012).
 */
export const TimeSeriesChart = memo(function TimeSeriesChart(props: TimeSeriesChartProps) {
  const hydrated = useHydrated();
  if (!hydrated)
    return (
      <ChartBeforeScript
        title={props.title}
        reserved={seriesChartHeight(props.height ?? 340)}
        csvHref={props.csvHref}
      />
    );
  return <DrawnTimeSeriesChart {...props} />;
});

function DrawnTimeSeriesChart({
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
  csvDownloadHref,
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

  const panels = useSeriesPanels({
    series,
    overlays,
    hiddenOverlays,
    visible,
    guides,
    readings,
    units,
    height,
  });

  const describe = useCallback(
    (i: number) => {
      const day = series.t[i];
      const side = sampleSide(series.t, i);
      const parts = SPECIES.filter((k) => visible[k]).map(
        (k) => `${SERIES_NAMES[k].short} ${formatNumber(series[k][i])} ${unitOf(k, units)}`,
      );
      for (const { kind, values } of visible.tan ? tanCriteriaOf(series) : [])
        parts.push(`${TAN_CRITERIA[kind].name} ${formatNumber(values[i])} ${unitOf("tan", units)}`);
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

  const criteria = tanCriteriaOf(series);
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
          {visible.tan && criteria.length ? (
            <TanCriteriaNote shortTerm={criteria.some((c) => c.kind === "shortTerm")} />
          ) : null}
          {fileName ? (
            <ChartDownloads
              fileName={fileName}
              title={title}
              getSvg={() => svgRef.current}
              getCsv={() => seriesCsv(series, units, events)}
              csvHref={csvDownloadHref}
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
}
