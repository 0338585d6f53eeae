/**
 * Total ammonia against the US EPA (2013) chronic criterion, which holds for averages: the
 * 30-day average should stay below it and the highest 4-day average below 2.5 times it. The
 * criterion depends on pH, and pH moves in a run (KH used up by nitrification lowers it), so
 * each window's average is compared with the criterion at that window's own average pH, not
 * at the run's: a spike in the high-pH weeks counts against the stricter line of those weeks.
 */
import { ammoniaCriteria } from "./criteria";
import type { Trace } from "./recorder";

export type ChronicExposure = {
  /** The window's average total ammonia, mg N/L. */
  value: number;
  /** The line it is compared with: the criterion at the window's pH, times `factor`, mg N/L. */
  limit: number;
  /** Its last day. */
  day: number;
};

/**
 * The window of `days` (the whole run when it is shorter) whose average TAN is highest against
 * `factor` times the chronic criterion at its own average pH and `temperatureC`. Values are
 * linear between the trace's points; a repeated time is a jump (an event); each window ends at a
 * point and its start is interpolated, so irregular solver steps average as even samples would.
 */
export function worstChronicWindow(trace: Trace, temperatureC: number, days: number, factor = 1): ChronicExposure {
  const { t, tan, ph } = trace;
  const n = t.length;
  const lineAt = (pH: number) => factor * ammoniaCriteria(pH, temperatureC).chronicTanMgNPerL;
  if (n === 0) return { value: 0, limit: lineAt(7), day: 0 };
  if (n < 2 || !(t[n - 1] > t[0])) return { value: tan[n - 1], limit: lineAt(ph[n - 1]), day: t[n - 1] };
  const w = Math.min(days, t[n - 1] - t[0]);
  const areaTan = cumulativeArea(t, tan);
  const areaPh = cumulativeArea(t, ph);
  // The criterion falls as pH rises, so no window's line is below the one at the run's highest
  // pH: a window whose TAN is not above the worst ratio times that line cannot be worse (this
  // skips the criterion's powers for most windows of a long replay).
  let highestPh = ph[0];
  for (const v of ph) if (v > highestPh) highestPh = v;
  const lowestLine = lineAt(highestPh);
  let worst: ChronicExposure | null = null;
  let worstRatio = -1;
  let j = 0;
  for (let k = 1; k < n; k++) {
    const a = t[k] - w;
    if (a < t[0] - 1e-12) continue;
    while (j + 1 < n && t[j + 1] <= a) j++;
    const mean = (values: readonly number[], area: readonly number[]) => {
      const dt = j + 1 < n ? t[j + 1] - t[j] : 0;
      const va = dt > 0 ? values[j] + ((values[j + 1] - values[j]) * (a - t[j])) / dt : values[j];
      return (area[k] - (area[j] + ((values[j] + va) / 2) * (a - t[j]))) / w;
    };
    const value = mean(tan, areaTan);
    if (worst && value <= worstRatio * lowestLine) continue;
    const window = { value, limit: lineAt(mean(ph, areaPh)), day: t[k] };
    if (!worst || window.value / window.limit > worstRatio) {
      worst = window;
      worstRatio = window.value / window.limit;
    }
  }
  return worst!;
}

/** The trapezoid area of `values` over `t` up to each point. */
function cumulativeArea(t: readonly number[], values: readonly number[]): number[] {
  const area: number[] = [0];
  for (let k = 1; k < t.length; k++) area.push(area[k - 1] + ((values[k] + values[k - 1]) / 2) * (t[k] - t[k - 1]));
  return area;
}
