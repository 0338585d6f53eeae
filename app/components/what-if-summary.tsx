import type { ResultWarning } from "~/features/runs/run-warnings";
import type { DisplayKeyFigures } from "~/utils/chart-data";
import { formatNumber } from "~/utils/display-units";

type Labels = { nitrate: string; nitrite: string; ammonia: string };

/** "+3.2", "−1.5", "no change" (display units, three significant figures). */
function change(next: number | null, saved: number | null): string {
  if (next === null || saved === null) return "";
  const d = next - saved;
  const shown = formatNumber(Math.abs(d));
  if (Math.abs(d) < 1e-9 || shown === "0" || shown.startsWith("<")) return "no change";
  return `${d > 0 ? "+" : "−"}${shown}`;
}

/**
 * The what-if's answer, kept in view while a slider moves (beside the sliders on a wide screen,
 * a bar at the foot of a phone's screen): nitrate just before the last water change and at the
 * end, each against the saved run, then the toxic peaks (free ammonia, nitrite) and days above
 * the target. A peak above its caution line is flagged, and the run's warnings (the preview's
 * while a slider is moved) are said in words, so a change that harms fish shows at once.
 */
export function WhatIfSummary({
  saved,
  preview,
  labels,
  warnings = [],
}: {
  saved: DisplayKeyFigures;
  preview: DisplayKeyFigures | null;
  labels: Labels;
  /** The warnings of the run shown: the preview's while there is one, else the saved run's. */
  warnings?: readonly ResultWarning[];
}) {
  const now = preview ?? saved;
  const flagged = new Set(warnings.map((w) => w.figure));
  const rows = [
    {
      label: "Nitrate before the last water change",
      value: now.nitrateBeforeLastWaterChange,
      was: saved.nitrateBeforeLastWaterChange,
      unit: labels.nitrate,
    },
    { label: "Nitrate at the end", value: now.nitrateEnd, was: saved.nitrateEnd, unit: labels.nitrate },
    {
      label: "Peak free ammonia",
      value: now.peakFreeNh3.value,
      was: saved.peakFreeNh3.value,
      unit: labels.ammonia,
      warned: flagged.has("peakFreeNh3"),
    },
    {
      label: "Peak nitrite",
      value: now.peakNitrite.value,
      was: saved.peakNitrite.value,
      unit: labels.nitrite,
      warned: flagged.has("peakNitrite"),
    },
    {
      label: "Days above the nitrate target",
      value: now.daysAboveNitrateTarget,
      was: saved.daysAboveNitrateTarget,
      unit: "days",
    },
  ];
  return (
    <aside
      aria-labelledby="what-if-answer-title"
      aria-live="polite"
      className="sticky bottom-0 z-10 rounded-lg border-2 border-fern-700 bg-white p-3 shadow-md lg:top-4 lg:bottom-auto"
      data-what-if-summary
    >
      <h3 id="what-if-answer-title" className="text-sm font-semibold">
        {preview ? "What if — against the saved run" : "The saved run (move a slider)"}
      </h3>
      <dl className="mt-1 grid grid-cols-2 gap-x-3 gap-y-1 text-sm lg:grid-cols-1">
        {rows.map((r) => (
          <div
            key={r.label}
            className={"warned" in r && r.warned ? "rounded border-2 border-red-700 bg-red-50 px-1" : undefined}
            data-warned={"warned" in r && r.warned ? "" : undefined}
          >
            <dt className="text-xs text-stone-600">
              {r.label}
              {"warned" in r && r.warned ? (
                <span className="font-semibold text-red-800"> — above the caution line</span>
              ) : null}
            </dt>
            <dd className="figure">
              {r.value === null ? "no water changes" : `${formatNumber(r.value)} ${r.unit}`}
              {preview && r.value !== null ? (
                <span className="ml-1 text-xs text-stone-700">({change(r.value, r.was)})</span>
              ) : null}
            </dd>
          </div>
        ))}
      </dl>
      {warnings.length > 0 ? (
        // A phone's bar stays short: the first warning in two lines; a wide screen lists them all.
        <ul className="mt-2 space-y-1 text-xs text-red-900 lg:list-disc lg:pl-4" data-what-if-warnings>
          {warnings.map((w, i) => (
            <li key={w.code} className={i === 0 ? "line-clamp-2 lg:line-clamp-none" : "hidden lg:list-item"}>
              {w.text}
            </li>
          ))}
        </ul>
      ) : null}
    </aside>
  );
}
