/**
 * The results chart's stacked panels (TimeSeriesChart): ammonia (TAN and free NH3 with the free
 * NH3 caution and TAN's long-term limit and short-term criterion at each sample's pH, decision
 * 0010), nitrite with its caution,
 * nitrate with the target band, plant dry mass and dissolved oxygen, each on its own scale, with
 * the run's lines, any overlays and the readings on the panel of their species.
 */
import { useMemo } from "react";
import type { FrameLine, FramePanel, FramePoint } from "~/components/charts/chart-frame-types";
import { formatDay, formatNumber } from "~/components/charts/format";
import { guideMarks } from "~/components/charts/guide-marks";
import { criterionLine, TAN_CRITERIA, TAN_CRITERION_KINDS } from "~/components/charts/tan-criteria";
import {
  PLANT_DASHES,
  PLANT_UNIT,
  SERIES_COLORS,
  SERIES_DASH,
  SERIES_NAMES,
  unitOf,
} from "~/components/charts/palette";
import {
  OVERLAY_WIDTH,
  READING_SHAPE,
  shortName,
  SPECIES,
  type Visibility,
} from "~/components/charts/time-series-parts";
import type { ChartGuides, ChartOverlay, ChartReading, ChartSeries, ChartUnits, SeriesKey } from "~/utils/chart-data";

type PanelKey = "ammonia" | "nitrite" | "nitrate" | "plants" | "oxygen";
/** The panel each species (and its readings) is drawn on. */
const SPECIES_PANEL: Record<string, PanelKey> = { tan: "ammonia", nh3: "ammonia", no2: "nitrite", no3: "nitrate" };
const OXYGEN_COLOR = "#0e7490";

/** "TAN · free NH3, mg/L NH3" when the species share a unit, else each with its own. */
function sharedUnitTitle(keys: readonly SeriesKey[], units: ChartUnits): string {
  const names = keys.map((k) => SERIES_NAMES[k].short);
  const unitList = [...new Set(keys.map((k) => unitOf(k, units)))];
  if (unitList.length <= 1) return `${names.join(" · ")}${unitList.length ? `, ${unitList[0]}` : ""}`;
  return keys.map((k, i) => `${names[i]}, ${unitOf(k, units)}`).join(" · ");
}

const LINE_WIDTH: Record<SeriesKey, number> = { tan: 2, nh3: 1.75, no2: 2, no3: 2.25, plants: 1.75 };
const OVERLAY_OPACITY = 0.5;

export function useSeriesPanels({
  series,
  overlays,
  hiddenOverlays,
  visible,
  guides,
  readings,
  units,
  height,
}: {
  series: ChartSeries;
  overlays: readonly ChartOverlay[];
  hiddenOverlays: ReadonlySet<number>;
  visible: Visibility;
  guides: ChartGuides | undefined;
  readings: readonly ChartReading[];
  units: ChartUnits;
  height: number;
}): FramePanel[] {
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
    // Both criteria at each sample's pH: the long-term limit, and the short-term criterion the
    // warning checks (it may leave the scale when TAN stays far below it).
    if (vis("tan")) {
      for (const kind of TAN_CRITERION_KINDS) {
        const line = criterionLine(`main-tan-${kind}`, series, kind, SERIES_COLORS.tan, TAN_CRITERIA[kind].name);
        if (line) out.push({ ...line, panel: "ammonia" });
      }
    }
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

  const { bands, guideLines } = useMemo(
    () => guideMarks(guides, (of) => (of === "o2" ? !!series.o2?.length : visible[of])),
    [guides, visible, series.o2],
  );

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
  return panels;
}
