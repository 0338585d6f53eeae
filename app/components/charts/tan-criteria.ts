/**
 * The two TAN caution lines (ChartSeries.tanLongTerm and tanShortTerm, decision 0010): their
 * names, dashes and how they are drawn, for the results chart, its readout, legend and table,
 * and the compare chart alike. Both follow the run's pH sample by sample; the long-term limit is
 * the lower, more protective one, so it always stays in the panel's scale, while the short-term
 * criterion may go off the top when TAN stays far below it.
 */
import type { FrameLine } from "~/components/charts/chart-frame-types";
import type { ChartSeries } from "~/utils/chart-data";

export type TanCriterionKind = "longTerm" | "shortTerm";
export const TAN_CRITERION_KINDS: readonly TanCriterionKind[] = ["longTerm", "shortTerm"];

export const TAN_CRITERIA: Record<
  TanCriterionKind,
  { name: string; short: string; averaged: string; dash: string; width: number }
> = {
  // US EPA 2013 (docs/sources.md §2): the chronic criterion is a 30-day average, the acute one a 1-hour average.
  longTerm: {
    name: "TAN long-term limit at the pH of the day",
    short: "long-term limit",
    averaged: "for 30-day averages",
    dash: "4 3",
    width: 1.5,
  },
  shortTerm: {
    name: "TAN short-term criterion at the pH of the day",
    short: "short-term criterion",
    averaged: "for 1-hour averages",
    dash: "10 3 2 3",
    width: 1.25,
  },
};

/** A run's values of one criterion, in its units, or undefined when it has none. */
export function tanCriterionOf(series: ChartSeries, kind: TanCriterionKind): number[] | undefined {
  const v = kind === "longTerm" ? series.tanLongTerm : series.tanShortTerm;
  return v && v.length === series.t.length ? v : undefined;
}

/** The criteria a run carries, in drawing order, each with its values. */
export function tanCriteriaOf(series: ChartSeries): { kind: TanCriterionKind; values: number[] }[] {
  return TAN_CRITERION_KINDS.flatMap((kind) => {
    const values = tanCriterionOf(series, kind);
    return values ? [{ kind, values }] : [];
  });
}

/** One criterion drawn as a line in `color`; the short-term one may leave the panel's scale. */
export function criterionLine(
  key: string,
  series: ChartSeries,
  kind: TanCriterionKind,
  color: string,
  label: string | undefined,
): FrameLine | null {
  const values = tanCriterionOf(series, kind);
  if (!values) return null;
  const { dash, width } = TAN_CRITERIA[kind];
  return {
    key,
    t: series.t,
    y: values,
    color,
    dash,
    width,
    label,
    cursorDot: false,
    ...(kind === "shortTerm" ? { mayLeaveScale: true } : {}),
  };
}
