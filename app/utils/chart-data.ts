/**
 * What the chart components draw. Loaders convert the engine's canonical series (mg N/L)
 * into the viewer's units before they reach the browser, so these numbers are display
 * values and `units` holds their labels.
 */

import type { EventRecord, NitrogenBudget } from "~models";

/** The species a chart can show; "plants" is drawn on a second axis (g dry mass). */
export type SpeciesKey = "tan" | "nh3" | "no2" | "no3";
export type SeriesKey = SpeciesKey | "plants";

/** One run's time series, columnar, in display units. All arrays have the length of `t`. */
export type ChartSeries = {
  /** Days from the start; an event appears as two samples with the same day (before/after). */
  t: number[];
  /** Total ammonia (TAN) in units.ammonia. */
  tan: number[];
  /** Free ammonia (NH3) in units.ammonia. */
  nh3: number[];
  /** Nitrite in units.nitrite. */
  no2: number[];
  /** Nitrate in units.nitrate. */
  no3: number[];
  /** Dry mass per plant group, g. */
  plants: { id: string; name: string; massG: number[] }[];
  /** Dissolved oxygen, mg O2/L (absent in series made before the engine modelled it). */
  o2?: number[];
  /**
   * The US EPA 2013 TAN criteria at each sample's pH, in units.ammonia: the caution lines over
   * TAN, which move where pH follows KH (decision 0010). Long-term = chronic (a 30-day average
   * limit, the lower line); short-term = acute (a one-hour average). Stored runs only.
   */
  tanLongTerm?: number[];
  tanShortTerm?: number[];
};

/** Unit labels for the axes, legend, table and CSV headers, e.g. "mg/L NO3". */
export type ChartUnits = {
  ammonia: string;
  nitrite: string;
  nitrate: string;
};

/** The kinds of marker on the time axis (a replayed journal's other kinds share the nearest one). */
export const CHART_EVENT_KINDS = ["waterChange", "filterCleaning", "trim", "dose", "dosingStopped", "feeding"] as const;

/** Something that happened on a day, marked on the time axis. */
export type ChartEvent = {
  day: number;
  kind: (typeof CHART_EVENT_KINDS)[number];
  detail: string;
};

/**
 * The chart's marker for an engine event: a replayed journal's extra kinds share the nearest
 * marker (gravel cleaning with water changes, plants put in with trims, a new feeding amount
 * with meals); the detail text still says what happened.
 */
export function chartEventKind(kind: EventRecord["kind"]): ChartEvent["kind"] {
  if (kind === "gravelCleaning") return "waterChange";
  if (kind === "plantsAdded") return "trim";
  if (kind === "feedingChanged") return "feeding";
  return kind;
}

/** A test-kit reading drawn as points over the curves (display units; absent = not measured). */
export type ChartReading = {
  day: number;
  tan?: number | null;
  no2?: number | null;
  no3?: number | null;
};

/** Caution lines and the nitrate target band, in display units. */
export type ChartGuides = {
  /** Nitrate band the keeper aims for (drawn as a band in #fef3c7). */
  nitrateBand?: { low: number; high: number };
  /** Free ammonia caution level (e.g. 0.02 mg/L NH3 expressed in units.ammonia). */
  freeAmmoniaCaution?: number;
  /** Nitrite caution level in units.nitrite. */
  nitriteCaution?: number;
  /** Dissolved oxygen below which fish suffer, mg O2/L. */
  oxygenCaution?: number;
};

/** A second run drawn over the first (what-if preview, or one scenario of a comparison). */
export type ChartOverlay = {
  label: string;
  series: ChartSeries;
};

/**
 * The nitrogen budget of a run, cumulative, mg N: the engine's own type, so a loader passes
 * the engine's object straight through.
 */
export type ChartBudget = NitrogenBudget;

/** Key figures of a run, already in display units, for lists, results and compare. */
export type DisplayKeyFigures = {
  peakFreeNh3: { value: number; day: number };
  peakNitrite: { value: number; day: number };
  nitrateEnd: number;
  nitrateBeforeLastWaterChange: number | null;
  daysAboveNitrateTarget: number;
  cyclingFinishedDay: number | null;
  cycleSeen: boolean;
  plantsTrimmedG: number;
};
