/**
 * Fernwater's own chart palette and line styles (see the product brief). Colour is never the
 * only cue: every series also has a name on its toggle and a direct label at the end of its line,
 * and the series that share a colour differ by dash.
 */
import type { ChartEvent, ChartUnits, SeriesKey } from "~/utils/chart-data";

export const SERIES_COLORS: Record<SeriesKey, string> = {
  tan: "#4338ca",
  nh3: "#4338ca",
  no2: "#0f766e",
  no3: "#9d174d",
  plants: "#4d7c0f",
};

export const BAND_COLOR = "#fef3c7";
/** Axis lines, ticks and event glyphs: a warm neutral that reads on the page's off-white. */
export const INK = "#44403c";
export const GRID = "#e7e5e4";

/** SVG stroke-dasharray per series; undefined = solid. */
export const SERIES_DASH: Record<SeriesKey, string | undefined> = {
  tan: undefined,
  nh3: "6 4",
  no2: undefined,
  no3: undefined,
  plants: undefined,
};

/** Plant groups share the moss colour and differ by dash, in this order. */
export const PLANT_DASHES: readonly (string | undefined)[] = [undefined, "8 4", "2 3", "12 3 3 3", "4 4", "1 5"];

/**
 * Lines of a comparison: the first scenario takes the species' own colour; the others take
 * these (chosen to stand apart from the four species colours and from each other), each with
 * its own dash as well.
 */
export const COMPARE_COLORS: readonly string[] = ["#334155", "#b45309", "#0369a1"];
export const COMPARE_DASHES: readonly (string | undefined)[] = [undefined, "8 4", "2 3", "12 3 3 3"];

export const SERIES_KEYS: readonly SeriesKey[] = ["tan", "nh3", "no2", "no3", "plants"];

/** Short name (toggles, direct labels) and long name (table captions, descriptions). */
export const SERIES_NAMES: Record<SeriesKey, { short: string; long: string }> = {
  tan: { short: "TAN", long: "Total ammonia (TAN)" },
  nh3: { short: "Free NH3", long: "Free ammonia (NH3)" },
  no2: { short: "NO2", long: "Nitrite (NO2)" },
  no3: { short: "NO3", long: "Nitrate (NO3)" },
  plants: { short: "Plants", long: "Plant dry mass" },
};

export const PLANT_UNIT = "g dry";

export function unitOf(key: SeriesKey, units: ChartUnits): string {
  switch (key) {
    case "tan":
    case "nh3":
      return units.ammonia;
    case "no2":
      return units.nitrite;
    case "no3":
      return units.nitrate;
    case "plants":
      return PLANT_UNIT;
  }
}

export type EventKind = ChartEvent["kind"];

/** How each kind of event is named and drawn on the time axis (glyph paths centred on 0,0). */
export const EVENT_META: Record<EventKind, { label: string; glyph: string }> = {
  // A drop of water.
  waterChange: { label: "Water change", glyph: "M0,-5 C3,-1 4,1 4,2.5 A4,4 0 0 1 -4,2.5 C-4,1 -3,-1 0,-5 Z" },
  // A square: the filter box.
  filterCleaning: { label: "Filter cleaning", glyph: "M-3.5,-3.5 H3.5 V3.5 H-3.5 Z" },
  // A diamond: cut.
  trim: { label: "Plant trim", glyph: "M0,-4.5 L4.5,0 L0,4.5 L-4.5,0 Z" },
  // An upward triangle: something added.
  dose: { label: "Ammonia dose", glyph: "M0,-4.5 L4.5,4 H-4.5 Z" },
  // A cross: dosing stopped.
  dosingStopped: { label: "Dosing stopped", glyph: "M-4,-4 L4,4 M4,-4 L-4,4" },
  // A small dot: meals are many and minor.
  feeding: { label: "Feeding", glyph: "M-1.5,0 A1.5,1.5 0 1 0 1.5,0 A1.5,1.5 0 1 0 -1.5,0 Z" },
};

/** Event kinds marked on the axis unless a chart asks for others (meals would crowd it). */
export const DEFAULT_EVENT_KINDS: readonly EventKind[] = [
  "waterChange",
  "filterCleaning",
  "trim",
  "dose",
  "dosingStopped",
];

/** Font stacks written into the SVG as attributes so an exported file keeps them. */
export const SERIF_STACK = "Lora, ui-serif, Georgia, serif";
export const MONO_STACK = 'ui-monospace, SFMono-Regular, Menlo, Consolas, "Liberation Mono", monospace';
