/** Key figures of a quiet run (nothing near a caution line), with `over` changed: for warning tests. */
import type { KeyFigures } from "../../models";

export function quietFigures(over: Partial<KeyFigures> = {}): KeyFigures {
  const zero = { value: 0, day: 0 };
  return {
    peakFreeNh3: zero,
    peakTan: zero,
    peakNitrite: zero,
    nitrateEnd: 2,
    peakNitrate: zero,
    nitrateBeforeLastWaterChange: null,
    daysAboveNitrateTarget: 0,
    daysBelowNitrateTarget: 0,
    cycleSeen: false,
    cyclingFinishedDay: null,
    plantsTrimmedG: 0,
    lowestOxygen: { value: 8, day: 0 },
    lowestKh: { value: 5, day: 0 },
    ...over,
  };
}
