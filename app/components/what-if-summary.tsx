import type { DisplayKeyFigures } from "~/utils/chart-data";
import { formatNumber } from "~/utils/display-units";

type Labels = { nitrate: string; ammonia: string };

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
 * end, each against the saved run, then peak free ammonia and days above the target.
 */
export function WhatIfSummary({
  saved,
  preview,
  labels,
}: {
  saved: DisplayKeyFigures;
  preview: DisplayKeyFigures | null;
  labels: Labels;
}) {
  const now = preview ?? saved;
  const rows = [
    {
      label: "Nitrate before the last water change",
      value: now.nitrateBeforeLastWaterChange,
      was: saved.nitrateBeforeLastWaterChange,
      unit: labels.nitrate,
    },
    { label: "Nitrate at the end", value: now.nitrateEnd, was: saved.nitrateEnd, unit: labels.nitrate },
    { label: "Peak free ammonia", value: now.peakFreeNh3.value, was: saved.peakFreeNh3.value, unit: labels.ammonia },
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
          <div key={r.label}>
            <dt className="text-xs text-stone-600">{r.label}</dt>
            <dd className="figure">
              {r.value === null ? "no water changes" : `${formatNumber(r.value)} ${r.unit}`}
              {preview && r.value !== null ? (
                <span className="ml-1 text-xs text-stone-700">({change(r.value, r.was)})</span>
              ) : null}
            </dd>
          </div>
        ))}
      </dl>
    </aside>
  );
}
