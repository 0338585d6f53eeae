/** The event strip under a chart's plot (used by ChartFrame). */
import { type ScaleLinear } from "d3-scale";
import { type ReactNode } from "react";
import { EVENT_META, INK, type EventKind } from "~/components/charts/palette";
import { EVENT_ROW } from "~/components/charts/scales";
import { formatDay } from "~/components/charts/format";
import type { ChartEvent } from "~/utils/chart-data";

/** Rows of the event strip, top to bottom. */
export const EVENT_ORDER: readonly EventKind[] = [
  "waterChange",
  "filterCleaning",
  "trim",
  "dose",
  "dosingStopped",
  "feeding",
];

/**
 * Event glyphs under the plot, one row per kind. Events of a kind closer than a glyph's width
 * share one glyph (its title lists them all), so a year of weekly water changes on a phone
 * stays a row of marks rather than a smear.
 */
export function EventStrip({
  events,
  kinds,
  x,
  y,
  width,
}: {
  events: readonly ChartEvent[];
  kinds: readonly EventKind[];
  x: ScaleLinear<number, number>;
  y: number;
  width: number;
}) {
  const glyphs: ReactNode[] = [];
  kinds.forEach((kind, row) => {
    const meta = EVENT_META[kind];
    const stroked = kind === "dosingStopped";
    const buckets = new Map<number, ChartEvent[]>();
    for (const e of events) {
      if (e.kind !== kind) continue;
      const px = x(e.day);
      if (!(px >= -1 && px <= width + 1)) continue;
      const b = Math.round(px / 8);
      const list = buckets.get(b);
      if (list) list.push(e);
      else buckets.set(b, [e]);
    }
    for (const [b, items] of buckets) {
      const px = items.reduce((s, e) => s + x(e.day), 0) / items.length;
      const title = items.map((e) => `${meta.label}, ${formatDay(e.day)}${e.detail ? `: ${e.detail}` : ""}`).join("\n");
      glyphs.push(
        <g key={`${kind}-${b}`} transform={`translate(${px},${y + row * EVENT_ROW + EVENT_ROW / 2})`}>
          <title>{title}</title>
          <path
            d={meta.glyph}
            transform="scale(0.85)"
            fill={stroked ? "none" : INK}
            stroke={stroked ? INK : "#ffffff"}
            strokeWidth={stroked ? 1.75 : 0.75}
          />
        </g>,
      );
    }
  });
  return <g>{glyphs}</g>;
}
