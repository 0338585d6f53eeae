/**
 * The compare chart's TAN caution lines (decision 0010): each scenario's own long-term limit at
 * the pH of its day (runs with different KH drift apart), in the scenario's colour and labelled
 * with its name. The short-term criterion is not drawn here (two lines per scenario would bury
 * the curves); the readout gives both values of each scenario at the cursor.
 */
import type { FrameLine } from "~/components/charts/chart-frame-types";
import { compareStyle } from "~/components/charts/compare-readout";
import {
  criterionLine,
  TAN_CRITERIA,
  TAN_CRITERION_KINDS,
  tanCriterionOf,
  type TanCriterionKind,
} from "~/components/charts/tan-criteria";
import { valueAt, type Side } from "~/utils/series-lookup";
import type { ChartSeries } from "~/utils/chart-data";

type Run = { label: string; series: ChartSeries };

export function compareCriterionLines(runs: readonly Run[], hidden: ReadonlySet<number>): FrameLine[] {
  const out: FrameLine[] = [];
  const { name } = TAN_CRITERIA.longTerm;
  runs.forEach((run, k) => {
    if (hidden.has(k)) return;
    const short = run.label.length > 22 ? `${run.label.slice(0, 21)}…` : run.label;
    const label = runs.length === 1 ? name : `${name}: ${short}`;
    const line = criterionLine(`run-${k}-tan-longTerm`, run.series, "longTerm", compareStyle(k, "tan").color, label);
    if (line) out.push(line);
  });
  return out;
}

/** Each run's criteria at the cursor's day (NaN where a run has none); null when no run has any. */
export function criteriaAt(
  runs: readonly Run[],
  i: number,
  day: number,
  side: Side,
): Record<TanCriterionKind, number[]> | null {
  if (!runs.some((r) => TAN_CRITERION_KINDS.some((kind) => tanCriterionOf(r.series, kind)))) return null;
  const at = (kind: TanCriterionKind) =>
    runs.map((r, k) => {
      const c = tanCriterionOf(r.series, kind);
      if (!c) return NaN;
      return k === 0 ? c[i] : valueAt(r.series.t, c, day, side);
    });
  return { longTerm: at("longTerm"), shortTerm: at("shortTerm") };
}
