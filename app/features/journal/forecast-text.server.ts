/**
 * The forecast in plain words, in the person's units: one sentence for the journal page and
 * the reminder e-mails alike.
 */
import type { Forecast } from "~/features/journal/journal-replay.server";
import { resultWarnings } from "~/features/runs/run-warnings";
import { DAY_MS } from "~/utils/dates";
import { nitrateText, type DisplayUnits } from "~/utils/display-units";

/** "14 December" (UTC). */
export const dayText = (ms: number) =>
  new Date(ms).toLocaleDateString("en-GB", { day: "numeric", month: "long", timeZone: "UTC" });

/**
 * "Nitrate passes your upper target of 25 mg/L NO3 around 14 December (40 mg/L NO3 before the
 * next planned change); a 40 % change by 12 December keeps it below 25 mg/L NO3 until then."
 * When nitrate is over the target already, it says so rather than naming tomorrow as the day it passes.
 */
export function forecastSentence(f: Forecast | null, units: DisplayUnits): string | null {
  if (!f) return null;
  if (f.kind === "below")
    return `Under your planned schedule nitrate stays below your upper target for the next ${f.horizonDays} days.`;
  const when = f.alreadyAbove ? "is already above" : "passes";
  const around = f.alreadyAbove ? "" : ` around ${dayText(f.crossMs)}`;
  const cross = `Nitrate ${when} your upper target of ${nitrateText(f.high, units)}${around} (${nitrateText(f.peak, units)} before the next planned change)`;
  if (!f.fix)
    return `${cross}; even a 90 % change by ${dayText(f.changeByMs)} does not keep it below: look at feeding and the plan.`;
  return `${cross}; a ${Math.round(f.fix.share * 100)} % change by ${dayText(f.fix.byMs)} keeps it below ${nitrateText(f.high, units)} until ${dayText(f.fix.untilMs)}.`;
}

/**
 * What the forecast crosses in the days ahead, in words, the person's units and dates ("Free
 * ammonia reaches 0.4 mg/L NH3 on 14 December, twenty times the caution line."): the page and
 * the mails say it beside the nitrate sentence. Empty when nothing ahead crosses a caution.
 */
export function forecastCautions(f: Forecast | null, units: DisplayUnits): string[] {
  if (!f) return [];
  const { startMs, peaks, warnings } = f.ahead;
  return resultWarnings({ keyFigures: peaks, warnings, dayWords: (d) => dayText(startMs + d * DAY_MS) }, units).map(
    (w) => w.text,
  );
}
