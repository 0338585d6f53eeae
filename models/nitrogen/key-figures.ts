/** The key figures a results page shows, from a run's series and running extremes. */
import { SCENARIO_DEFAULTS } from "./parameters";
import type { Extremes } from "./recorder";
import type { KeyFigures, Peak, Series } from "./result";
import { nonNeg, round6, roundDay } from "./result";
import type { Scenario } from "./scenario";

/** Key figures of a run from its series, running extremes and event ledger. */
export function keyFiguresFrom(
  series: Series,
  s: Scenario,
  peaks: Extremes,
  beforeLastChange: number | null,
  no3End: number,
  trimmedG: readonly number[],
): KeyFigures {
  const hi = s.targets.nitrateHigh;
  const lo = s.targets.nitrateLow;
  const { t, no3, tan, no2 } = series;
  // Time above/below a level, linear between samples (crossings interpolated).
  const timeBeyond = (level: number, above: boolean): number => {
    let total = 0;
    for (let k = 1; k < t.length; k++) {
      const dt = t[k] - t[k - 1];
      if (dt <= 0) continue;
      const a = above ? no3[k - 1] - level : level - no3[k - 1];
      const b = above ? no3[k] - level : level - no3[k];
      if (a > 0 && b > 0) total += dt;
      else if (a > 0 || b > 0) total += (dt * Math.max(a, b)) / (Math.abs(a) + Math.abs(b));
    }
    return total;
  };
  const seen = SCENARIO_DEFAULTS.cycling.cycleSeenThreshold.value;
  const clear = SCENARIO_DEFAULTS.cycling.clearThreshold.value;
  let cycleSeen = false;
  let finished: number | null = null;
  for (let k = 0; k < t.length; k++) {
    if (tan[k] >= seen || no2[k] >= seen) cycleSeen = true;
    else if (cycleSeen && finished === null && tan[k] < clear && no2[k] < clear) finished = t[k];
  }
  const r = (p: Peak): Peak => ({ value: round6(Math.max(p.value, 0)), day: roundDay(p.day) });
  return {
    peakFreeNh3: r(peaks.nh3),
    peakTan: r(peaks.tan),
    peakNitrite: r(peaks.no2),
    peakNitrate: r(peaks.no3),
    nitrateEnd: nonNeg(no3End),
    nitrateBeforeLastWaterChange: beforeLastChange === null ? null : nonNeg(beforeLastChange),
    daysAboveNitrateTarget: round6(timeBeyond(hi, true)),
    daysBelowNitrateTarget: round6(timeBeyond(lo, false)),
    cycleSeen,
    cyclingFinishedDay: finished,
    plantsTrimmedG: round6(trimmedG.reduce((a, b) => a + b, 0)),
    lowestOxygen: r(peaks.o2Low),
    lowestKh: r(peaks.khLow),
  };
}
