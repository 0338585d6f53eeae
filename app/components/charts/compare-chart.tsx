/**
 * Two to four runs of one species on one chart ("baseline" against "with floating plants"):
 * one line per scenario, told apart by colour, dash and a direct label, with the same day
 * cursor, readout, table and downloads as the results chart (drawing shared through ChartFrame).
 */
import { memo, useCallback, useId, useMemo, useRef, useState } from "react";
import { ChartBeforeScript, compareChartHeight } from "~/components/charts/chart-before-script";
import { useHydrated } from "~/utils/use-hydrated";
import { ChartDataTable, compareTableColumns } from "~/components/charts/chart-data-table";
import { ChartDownloads } from "~/components/charts/chart-downloads";
import { ChartFrame, type FrameLine, type FramePanel } from "~/components/charts/chart-frame";
import { compareCsv, fileSlug, speciesValues } from "~/utils/csv";
import type { LegendItem } from "~/components/charts/downloads";
import { formatDay, formatNumber } from "~/components/charts/format";
import { guideMarks } from "~/components/charts/guide-marks";
import { useControllable, useDayCursor } from "~/components/charts/hooks";
import { EventKey, LineSwatch, ToggleButton } from "~/components/charts/legend";
import { compareStyle, CompareReadout } from "~/components/charts/compare-readout";
import { compareCriterionLines, criteriaAt } from "~/components/charts/compare-criteria";
import { tanCriterionOf } from "~/components/charts/tan-criteria";
import { TanCriteriaNote } from "~/components/charts/tan-criteria-note";
import { sampleSide, valueAt } from "~/utils/series-lookup";
import { DEFAULT_EVENT_KINDS, SERIES_KEYS, SERIES_NAMES, unitOf, type EventKind } from "~/components/charts/palette";
import type { ChartEvent, ChartGuides, ChartSeries, ChartUnits, SeriesKey } from "~/utils/chart-data";

type CompareRun = { label: string; series: ChartSeries };

export type CompareChartProps = {
  title: string;
  description?: string;
  /** 2–4 runs; the first is the reference ("baseline") for differences. */
  runs: readonly CompareRun[];
  units: ChartUnits;
  /** Controlled species; or `defaultSpecies` (default nitrate) and the chart's own picker. */
  species?: SeriesKey;
  defaultSpecies?: SeriesKey;
  onSpeciesChange?: (k: SeriesKey) => void;
  /** Hide the species picker (when the page has its own). */
  hidePicker?: boolean;
  /** Events to mark on the time axis (usually the first run's). */
  events?: readonly ChartEvent[];
  eventKinds?: readonly EventKind[];
  guides?: ChartGuides;
  height?: number;
  onCursorChange?: (day: number) => void;
  table?: boolean;
  /** File name stem for downloads, made file-safe (default from the title); false hides the buttons. */
  downloadName?: string | false;
};

const EMPTY: readonly never[] = [];

/** Two to four runs on one chart; like TimeSeriesChart, drawn in the browser after a stand-in (decision 0012). */
export const CompareChart = memo(function CompareChart(props: CompareChartProps) {
  const hydrated = useHydrated();
  if (!hydrated) return <ChartBeforeScript title={props.title} reserved={compareChartHeight(props.height ?? 340)} />;
  return <DrawnCompareChart {...props} />;
});

function DrawnCompareChart({
  title,
  description,
  runs,
  units,
  species: speciesProp,
  defaultSpecies = "no3",
  onSpeciesChange,
  hidePicker = false,
  events = EMPTY,
  eventKinds = DEFAULT_EVENT_KINDS,
  guides,
  height = 340,
  onCursorChange,
  table = true,
  downloadName,
}: CompareChartProps) {
  const [species, setSpecies] = useControllable<SeriesKey>(speciesProp, () => defaultSpecies, onSpeciesChange);
  const [hidden, setHidden] = useState<ReadonlySet<number>>(() => new Set());
  const svgRef = useRef<SVGSVGElement>(null);
  const pickerName = useId();
  const t = useMemo(() => runs[0]?.series.t ?? [], [runs]);
  const unit = unitOf(species, units);
  const shownEvents = useMemo(() => events.filter((e) => eventKinds.includes(e.kind)), [events, eventKinds]);
  const hasPlants = runs.some((r) => r.series.plants.length > 0);

  const linesOf = useCallback(
    (sp: SeriesKey) => {
      const out: FrameLine[] = [];
      runs.forEach((run, k) => {
        if (hidden.has(k)) return;
        const { color, dash } = compareStyle(k, sp);
        out.push({
          key: `run-${k}-${sp}`,
          t: run.series.t,
          y: speciesValues(run.series, sp),
          color,
          dash,
          width: k === 0 ? 2.25 : 2,
          label: run.label.length > 22 ? `${run.label.slice(0, 21)}…` : run.label,
        });
      });
      return out;
    },
    [runs, hidden],
  );
  const lines = useMemo(() => linesOf(species), [linesOf, species]);

  const guidesOf = useCallback((sp: SeriesKey) => guideMarks(guides, (of) => of === sp), [guides]);

  // The picked species on its own scale; below it, nitrate with its target band and the plants'
  // mass, on the same time axis and cursor, so a toxic peak is never flattened under tens of mg/L
  // of nitrate.
  const panels = useMemo((): FramePanel[] => {
    const scale = height / 340;
    const picked = guidesOf(species);
    const out: FramePanel[] = [
      {
        key: `compare-${species}`,
        label: `${SERIES_NAMES[species].long}, ${unitOf(species, units)}`,
        lines: species === "tan" ? [...lines, ...compareCriterionLines(runs, hidden)] : lines,
        bands: picked.bands,
        guides: picked.guideLines,
        height: Math.round(200 * scale),
      },
    ];
    if (species !== "no3" && species !== "plants") {
      const no3 = guidesOf("no3");
      out.push({
        key: "compare-no3",
        label: `${SERIES_NAMES.no3.long}, ${unitOf("no3", units)}`,
        lines: linesOf("no3"),
        bands: no3.bands,
        guides: no3.guideLines,
        height: Math.round(150 * scale),
      });
    }
    // Plant mass on a third panel, as on the results chart: what the plants took up, same days.
    if (species !== "plants" && hasPlants) {
      out.push({
        key: "compare-plants",
        label: `${SERIES_NAMES.plants.long}, ${unitOf("plants", units)}`,
        lines: linesOf("plants"),
        bands: [],
        guides: [],
        height: Math.round(100 * scale),
      });
    }
    return out;
  }, [species, lines, linesOf, guidesOf, units, height, hasPlants, runs, hidden]);

  const valuesAt = useCallback(
    (i: number) => {
      const day = t[i];
      const side = sampleSide(t, i) ?? "before";
      return runs.map((run, k) =>
        k === 0
          ? speciesValues(run.series, species)[i]
          : valueAt(run.series.t, speciesValues(run.series, species), day, side),
      );
    },
    [runs, species, t],
  );

  const describe = useCallback(
    (i: number) => {
      const vals = valuesAt(i);
      const parts = runs
        .map((run, k) => (hidden.has(k) ? null : `${run.label} ${formatNumber(vals[k])}`))
        .filter(Boolean);
      return `${formatDay(t[i])}, ${SERIES_NAMES[species].short} in ${unit}: ${parts.join(", ")}.`;
    },
    [valuesAt, runs, hidden, species, unit, t],
  );
  const cursor = useDayCursor(t, describe, onCursorChange);
  const vals = valuesAt(cursor.index);

  const columns = useMemo(() => compareTableColumns(runs, species, units), [runs, species, units]);
  const legend: LegendItem[] = useMemo(
    () =>
      runs
        .map((run, k) => ({ run, k }))
        .filter(({ k }) => !hidden.has(k))
        .map(({ run, k }) => ({ label: run.label, ...compareStyle(k, species) })),
    [runs, species, hidden],
  );
  const fileName = downloadName === false ? null : fileSlug(`${downloadName ?? title}-${species}`);
  const choices = SERIES_KEYS.filter((k) => k !== "plants" || hasPlants);

  const toolbar = (
    <div className="space-y-2">
      {hidePicker ? null : (
        <fieldset className="flex flex-wrap items-center gap-2">
          <legend className="sr-only">Species to compare</legend>
          <span className="text-sm text-stone-700" aria-hidden="true">
            Compare:
          </span>
          {choices.map((k) => (
            <label
              key={k}
              className={`inline-flex min-h-9 cursor-pointer items-center gap-2 rounded-md border px-2.5 py-1 text-sm has-[:focus-visible]:outline-3 has-[:focus-visible]:outline-offset-2 has-[:focus-visible]:outline-tan ${
                species === k ? "border-stone-500 bg-white font-semibold shadow-sm" : "border-stone-300 bg-stone-50"
              }`}
            >
              <input
                type="radio"
                name={pickerName}
                value={k}
                checked={species === k}
                onChange={() => setSpecies(k)}
                className="sr-only"
              />
              {SERIES_NAMES[k].short}
              <span className="text-xs font-normal text-stone-600">{unitOf(k, units)}</span>
            </label>
          ))}
        </fieldset>
      )}
      <div className="flex flex-wrap gap-2" role="group" aria-label="Scenarios shown on the chart">
        {runs.map((run, k) => {
          const { color, dash } = compareStyle(k, species);
          return (
            <ToggleButton
              key={k}
              pressed={!hidden.has(k)}
              disabled={!hidden.has(k) && hidden.size === runs.length - 1}
              onToggle={() =>
                setHidden((old) => {
                  const next = new Set(old);
                  if (next.has(k)) next.delete(k);
                  else next.add(k);
                  return next;
                })
              }
              swatch={<LineSwatch color={color} dash={dash} />}
            >
              {run.label}
            </ToggleButton>
          );
        })}
      </div>
      <EventKey events={shownEvents} />
    </div>
  );

  const day = t[cursor.index];
  const readout =
    t.length === 0 ? null : (
      <CompareReadout
        day={day}
        species={species}
        unit={unit}
        runs={runs}
        hidden={hidden}
        values={vals}
        criteria={
          species === "tan" ? criteriaAt(runs, cursor.index, day, sampleSide(t, cursor.index) ?? "before") : null
        }
      />
    );

  const summary =
    description ??
    `${SERIES_NAMES[species].long} in ${unit} over ${formatNumber(t[t.length - 1] ?? 0)} days for ${runs
      .map((r) => r.label)
      .join(", ")}, one line each. The same numbers are in the table below the chart.`;

  return (
    <ChartFrame
      title={title}
      description={summary}
      t={t}
      panels={panels}
      events={shownEvents}
      cursor={cursor}
      readout={readout}
      announcement={cursor.announcement}
      toolbar={toolbar}
      svgRef={svgRef}
      footer={
        <>
          {species === "tan" && runs.some((r) => tanCriterionOf(r.series, "longTerm")) ? (
            <TanCriteriaNote shortTerm={false} />
          ) : null}
          {fileName ? (
            <ChartDownloads
              fileName={fileName}
              title={`${title}: ${SERIES_NAMES[species].long}`}
              getSvg={() => svgRef.current}
              getCsv={() => compareCsv(runs, species, units)}
              legend={legend}
            />
          ) : null}
          {table ? (
            <ChartDataTable
              caption={`${title}: ${SERIES_NAMES[species].long} (${unit}) per scenario`}
              t={t}
              columns={columns}
              events={events}
            />
          ) : null}
        </>
      }
    />
  );
}
