/** Toggle buttons with a line sample: the charts' legend and series switches in one. */
import type { ReactNode } from "react";
import { EVENT_META, INK } from "~/components/charts/palette";
import type { ChartEvent } from "~/utils/chart-data";

/** A short line in the series' colour and dash, as drawn on the chart. */
export function LineSwatch({
  color,
  dash,
  width = 2.5,
  opacity,
}: {
  color: string;
  dash?: string;
  width?: number;
  opacity?: number;
}) {
  return (
    <svg width="28" height="10" aria-hidden="true" className="shrink-0">
      <line
        x1="1"
        x2="27"
        y1="5"
        y2="5"
        stroke={color}
        strokeWidth={width}
        strokeDasharray={dash}
        strokeOpacity={opacity}
      />
    </svg>
  );
}

export function ToggleButton({
  pressed,
  onToggle,
  swatch,
  children,
  disabled,
}: {
  pressed: boolean;
  onToggle: () => void;
  swatch: ReactNode;
  children: ReactNode;
  disabled?: boolean;
}) {
  return (
    <button
      type="button"
      aria-pressed={pressed}
      disabled={disabled}
      onClick={onToggle}
      className={`inline-flex min-h-9 items-center gap-2 rounded-md border px-2.5 py-1 text-sm ${
        pressed
          ? "border-stone-400 bg-white text-stone-900 shadow-sm"
          : "border-dashed border-stone-300 bg-stone-50 text-stone-500 line-through decoration-stone-400"
      }`}
    >
      <span className={pressed ? "" : "opacity-40"}>{swatch}</span>
      {children}
    </button>
  );
}

/** The glyph key for the event kinds on this chart. */
export function EventKey({ events }: { events: readonly ChartEvent[] }) {
  const kinds = [...new Set(events.map((e) => e.kind))];
  if (!kinds.length) return null;
  return (
    <p className="flex flex-wrap items-center gap-x-4 gap-y-1 text-xs text-stone-700">
      <span>On the time axis:</span>
      {kinds.map((k) => (
        <span key={k} className="inline-flex items-center gap-1">
          <svg width="12" height="12" viewBox="-6 -6 12 12" aria-hidden="true">
            <path
              d={EVENT_META[k].glyph}
              fill={k === "dosingStopped" ? "none" : INK}
              stroke={k === "dosingStopped" ? INK : "none"}
              strokeWidth={1.75}
            />
          </svg>
          {EVENT_META[k].label} ({events.filter((e) => e.kind === k).length})
        </span>
      ))}
    </p>
  );
}
