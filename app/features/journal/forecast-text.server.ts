/**
 * The forecast in plain words, in the person's units: one sentence for the journal page and
 * the reminder e-mails alike.
 */
import type { Forecast, OverdueTask } from "~/features/journal/journal-replay.server";
import { resultWarnings } from "~/features/runs/run-warnings";
import { DAY_MS } from "~/utils/dates";
import { nitrateText, type DisplayUnits } from "~/utils/display-units";

/** "14 December": a planned day, a wall-clock date read as UTC (app/utils/time-zones.ts). */
export const dayText = (ms: number) =>
  new Date(ms).toLocaleDateString("en-GB", { day: "numeric", month: "long", timeZone: "UTC" });

const TASK_WORDS: Record<OverdueTask["kind"], string> = {
  waterChange: "water change",
  filterCleaning: "filter cleaning",
  trim: "trim",
  dose: "ammonia dose",
  gravelCleaning: "gravel cleaning",
  plants: "planting",
  feeding: "feeding change",
};

/**
 * "It assumes the overdue water change (due since 1 December) and trim of Stem plants (due since
 * 28 November) are done today.": an overdue task is in the forecast as done today, never skipped
 * quietly. Null when nothing is overdue.
 */
function overdueSentence(overdue: readonly OverdueTask[]): string | null {
  if (overdue.length === 0) return null;
  const parts = overdue.map(
    (t) => `${TASK_WORDS[t.kind]}${t.group ? ` of ${t.group}` : ""} (due since ${dayText(t.sinceMs)})`,
  );
  const list = parts.length === 1 ? parts[0] : `${parts.slice(0, -1).join(", ")} and ${parts.at(-1)}`;
  return `It assumes the overdue ${list} ${parts.length === 1 ? "is" : "are"} done today.`;
}

/**
 * "Nitrate passes your upper target of 25 mg/L NO3 around 14 December (40 mg/L NO3 before the
 * next planned change); a 40 % change by 12 December keeps it below 25 mg/L NO3 until then."
 * When nitrate is over the target already, it says so rather than naming tomorrow as the day it
 * passes. Followed by what it assumes of overdue tasks.
 */
export function forecastSentence(f: Forecast | null, units: DisplayUnits): string | null {
  if (!f) return null;
  const assumed = overdueSentence(f.overdue);
  return assumed ? `${nitrateSentence(f, units)} ${assumed}` : nitrateSentence(f, units);
}

function nitrateSentence(f: Forecast, units: DisplayUnits): string {
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
