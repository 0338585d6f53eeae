/**
 * The caution line the charts draw over TAN: the short-term (acute) US EPA 2013 ammonia
 * criterion (docs/sources.md §2) at each sample's pH and the run's temperature. The same function
 * and the same pH the engine's warning checks (models/nitrogen/warnings.ts), so where pH follows
 * KH the line moves with it, and a sample above the line is one the warning counts.
 */
import { ammoniaCriteria, type Series } from "~models";

/**
 * Acute criterion per sample, mg TAN-N/L.
 * @param series the run's sample days and pH; a series stored without pH per sample uses `startPh`
 * @param startPh the scenario's pH, used for every sample when the series has none
 * @param temperatureC the run's temperature (°C; constant over a run)
 */
export function acuteCriterionLine(
  series: Pick<Series, "t"> & { ph?: readonly number[] },
  startPh: number,
  temperatureC: number,
): number[] {
  const ph = series.ph?.length === series.t.length ? series.ph : series.t.map(() => startPh);
  return ph.map((p) => ammoniaCriteria(p, temperatureC).acuteTanMgNPerL);
}
