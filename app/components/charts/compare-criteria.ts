/**
 * The compare chart's TAN caution lines: each scenario's own short-term criterion at the pH of
 * its day (runs with different KH drift apart), in the scenario's colour and labelled with its
 * name; the readout gives each value at the cursor.
 */
import type { FrameLine } from "~/components/charts/chart-frame-types";
import { compareStyle } from "~/components/charts/compare-readout";
import { criterionLine, TAN_CRITERION_NAME } from "~/components/charts/guide-marks";
import { valueAt, type Side } from "~/utils/series-lookup";
import type { ChartSeries } from "~/utils/chart-data";

type Run = { label: string; series: ChartSeries };

export function compareCriterionLines(runs: readonly Run[], hidden: ReadonlySet<number>): FrameLine[] {
  const out: FrameLine[] = [];
  runs.forEach((run, k) => {
    const c = run.series.tanCriterion;
    if (hidden.has(k) || !c || c.length !== run.series.t.length) return;
    const name = run.label.length > 22 ? `${run.label.slice(0, 21)}…` : run.label;
    const label = runs.length === 1 ? TAN_CRITERION_NAME : `${TAN_CRITERION_NAME}: ${name}`;
    out.push(criterionLine(`run-${k}-tan-criterion`, run.series.t, c, compareStyle(k, "tan").color, label));
  });
  return out;
}

/** Each run's criterion at the cursor's day (NaN where a run has none); null when no run has one. */
export function criteriaAt(runs: readonly Run[], i: number, day: number, side: Side): number[] | null {
  if (!runs.some((r) => r.series.tanCriterion)) return null;
  return runs.map((r, k) => {
    const c = r.series.tanCriterion;
    if (!c) return NaN;
    return k === 0 ? c[i] : valueAt(r.series.t, c, day, side);
  });
}
