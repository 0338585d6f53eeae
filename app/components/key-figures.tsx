import type { DisplayKeyFigures } from "~/utils/chart-data";
import { formatNumber } from "~/utils/display-units";

export type FigureUnits = { ammonia: string; nitrite: string; nitrate: string };

export function keyFigureRows(
  k: DisplayKeyFigures,
  u: FigureUnits,
): { id?: string; label: string; value: string; unit: string; note?: string }[] {
  return [
    {
      id: "peakFreeNh3",
      label: "Peak free ammonia",
      value: formatNumber(k.peakFreeNh3.value),
      unit: u.ammonia,
      note: `day ${formatNumber(k.peakFreeNh3.day, 3)}`,
    },
    {
      id: "peakNitrite",
      label: "Peak nitrite",
      value: formatNumber(k.peakNitrite.value),
      unit: u.nitrite,
      note: `day ${formatNumber(k.peakNitrite.day, 3)}`,
    },
    { label: "Nitrate at the end", value: formatNumber(k.nitrateEnd), unit: u.nitrate },
    {
      label: "Nitrate before the last water change",
      value: k.nitrateBeforeLastWaterChange === null ? "–" : formatNumber(k.nitrateBeforeLastWaterChange),
      unit: k.nitrateBeforeLastWaterChange === null ? "" : u.nitrate,
    },
    { label: "Days above the nitrate target", value: formatNumber(k.daysAboveNitrateTarget, 3), unit: "days" },
    {
      label: "Cycling finished",
      value:
        k.cyclingFinishedDay === null
          ? k.cycleSeen
            ? "not yet"
            : "no cycle seen"
          : `day ${formatNumber(k.cyclingFinishedDay, 3)}`,
      unit: "",
    },
    { label: "Plants trimmed out", value: formatNumber(k.plantsTrimmedG), unit: "g dry" },
  ];
}

/** Key figures as cards; a card a warning is about (`flagged`, by figure id) is marked in red. */
export function KeyFiguresList({
  figures,
  units,
  flagged = [],
}: {
  figures: DisplayKeyFigures;
  units: FigureUnits;
  flagged?: readonly (string | null)[];
}) {
  return (
    <dl className="grid grid-cols-2 gap-2 sm:gap-3 lg:grid-cols-4">
      {keyFigureRows(figures, units).map((r) => {
        const warned = r.id !== undefined && flagged.includes(r.id);
        return (
          <div
            key={r.label}
            className={
              warned
                ? "rounded-md border-2 border-red-700 bg-red-50 p-3"
                : "rounded-md border border-stone-200 bg-white p-3"
            }
            data-flagged={warned || undefined}
          >
            <dt className="text-xs text-stone-600">
              {r.label}
              {warned ? <span className="ml-1 font-semibold text-red-800">· above caution</span> : null}
            </dt>
            <dd className="figure text-lg text-stone-900">
              {r.value} <span className="text-xs text-stone-600">{r.unit}</span>
            </dd>
            {r.note ? <dd className="text-xs text-stone-500">{r.note}</dd> : null}
          </div>
        );
      })}
    </dl>
  );
}
