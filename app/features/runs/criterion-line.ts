/**
 * The two caution lines the charts draw over TAN, both US EPA 2013 ammonia criteria
 * (docs/sources.md §2) at each sample's pH and the run's temperature: the long-term (chronic)
 * limit, the lower and more protective line, and the short-term (acute) criterion the warning
 * checks every solver step against (models/nitrogen/warnings.ts). One `ammoniaCriteria` call per
 * sample gives both, so where pH follows KH the lines move with it.
 */
import { ammoniaCriteria, type Series } from "~models";

/** Both criteria per sample, mg TAN-N/L. */
export type TanCriterionLines = { longTerm: number[]; shortTerm: number[] };

/**
 * @param series the run's sample days and pH; a series stored without pH per sample uses `startPh`
 * @param startPh the scenario's pH, used for every sample when the series has none
 * @param temperatureC the run's temperature (°C; constant over a run)
 */
export function tanCriterionLines(
  series: Pick<Series, "t"> & { ph?: readonly number[] },
  startPh: number,
  temperatureC: number,
): TanCriterionLines {
  const ph = series.ph?.length === series.t.length ? series.ph : series.t.map(() => startPh);
  const criteria = ph.map((p) => ammoniaCriteria(p, temperatureC));
  return {
    longTerm: criteria.map((c) => c.chronicTanMgNPerL),
    shortTerm: criteria.map((c) => c.acuteTanMgNPerL),
  };
}
