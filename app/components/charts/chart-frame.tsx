/**
 * The one chart drawing module: axes, scales, decimated line paths, bands, caution lines,
 * readings, event glyphs on the time axis and the day cursor, for every chart in this folder.
 * TimeSeriesChart and CompareChart describe their lines and readout; this draws them.
 *
 * Rendering is split so a cursor move costs almost nothing: everything that does not depend on
 * the cursor (paths above all) is built in useMemo keyed on the data and the width, and the
 * resulting element is reused as is, so React skips it; only the cursor layer and the readout
 * re-render when the cursor moves.
 */
import { scaleLinear } from "d3-scale";
import { useId, useMemo, type ReactNode } from "react";
import { useContainerWidth, type CursorVia } from "~/components/charts/hooks";
import { PATH_SCALE, linePath, scaledDash } from "~/components/charts/paths";
import { CURSOR_KEYS_HELP, CURSOR_KEYS_SUMMARY, nearestIndex, sampleSide, valueAt } from "~/utils/series-lookup";
import { GRID, INK, MONO_STACK, SERIF_STACK } from "~/components/charts/palette";
import {
  EVENT_ROW,
  dayDomain,
  maxFinite,
  plotBox,
  spreadLabels,
  tickCounts,
  ticksOf,
  valueDomain,
} from "~/components/charts/scales";
import { formatDay } from "~/components/charts/format";
import { EVENT_ORDER, EventStrip } from "~/components/charts/event-strip";
import type { Axis, ChartFrameProps } from "~/components/charts/chart-frame-types";

export type { FrameBand, FrameGuide, FrameLine, FramePoint } from "~/components/charts/chart-frame-types";

const EMPTY: readonly never[] = [];

export function ChartFrame({
  title,
  description,
  t,
  lines,
  leftLabel,
  rightLabel,
  bands = EMPTY,
  guides = EMPTY,
  points = EMPTY,
  events = EMPTY,
  height,
  cursor,
  readout,
  announcement,
  toolbar,
  footer,
  svgRef,
}: ChartFrameProps) {
  const rawId = useId();
  const id = rawId.replace(/[^a-zA-Z0-9_-]/g, "");
  const [containerRef, width] = useContainerWidth<HTMLDivElement>();

  const geometry = useMemo(() => {
    if (width == null || width <= 0) return null;
    const hasLeft = lines.some((l) => l.axis === "left");
    const hasRight = lines.some((l) => l.axis === "right");
    const eventKinds = EVENT_ORDER.filter((k) => events.some((e) => e.kind === k));
    const box = plotBox(width, height, { rightAxis: hasRight, eventRows: eventKinds.length });
    const [x0, x1] = dayDomain(t);
    const counts = tickCounts(box);
    const x = scaleLinear().domain([x0, x1]).range([0, box.innerWidth]);
    const leftMax = [
      ...lines.filter((l) => l.axis === "left").map((l) => maxFinite(l.y)),
      ...guides.map((g) => g.value),
      ...bands.map((b) => b.high),
      ...points.map((p) => p.value),
    ];
    const rightMax = lines.filter((l) => l.axis === "right").map((l) => maxFinite(l.y));
    const yLeft = scaleLinear().domain(valueDomain(leftMax, counts.y)).range([box.innerHeight, 0]);
    const yRight = scaleLinear().domain(valueDomain(rightMax, counts.y)).range([box.innerHeight, 0]);
    return { box, x, x0, x1, counts, yLeft, yRight, hasLeft, hasRight, eventKinds };
  }, [width, height, t, lines, guides, bands, points, events]);

  // Everything that does not move with the cursor.
  const staticLayer = useMemo(() => {
    if (!geometry) return null;
    const { box, x, counts, yLeft, yRight, hasLeft, hasRight, eventKinds } = geometry;
    const strip = eventKinds.length * EVENT_ROW;
    const fs = box.fontSize;
    const small = Math.round(fs * 0.85);
    const yOf = (axis: Axis) => (axis === "left" ? yLeft : yRight);
    const gridScale = hasLeft ? yLeft : yRight;
    const xTicks = ticksOf(x, counts.x);
    const leftTicks = hasLeft ? ticksOf(yLeft, counts.y) : [];
    const rightTicks = hasRight ? ticksOf(yRight, counts.y) : [];

    const paths = lines.map((l) => ({ line: l, d: linePath(l.t, l.y, x, yOf(l.axis), box.innerWidth) }));

    const labelled = lines.filter((l) => l.label);
    const wanted = labelled.map((l) => yOf(l.axis)(lastFinite(l.y)));
    const placed = spreadLabels(wanted, fs + 1, fs * 0.6, box.innerHeight - fs * 0.4);

    return (
      <g>
        <defs>
          <clipPath id={`${id}-clip`}>
            <rect x={0} y={-2} width={box.innerWidth} height={box.innerHeight + 4} />
          </clipPath>
        </defs>
        {/* Grid and bands behind everything. */}
        {ticksOf(gridScale, counts.y).map((tk) => (
          <line key={`g${tk.value}`} x1={0} x2={box.innerWidth} y1={tk.pos} y2={tk.pos} stroke={GRID} strokeWidth={1} />
        ))}
        {bands.map((b) => {
          const top = yLeft(b.high);
          const bottom = yLeft(b.low);
          return (
            <g key={b.key}>
              <rect x={0} width={box.innerWidth} y={top} height={Math.max(0, bottom - top)} fill={b.color} />
              <text x={4} y={top + small + 1} fontSize={small} fill={INK} fontFamily={SERIF_STACK}>
                {b.label}
              </text>
            </g>
          );
        })}
        {guides.map((g, k) => {
          const y = yLeft(g.value);
          return (
            <g key={g.key}>
              <line x1={0} x2={box.innerWidth} y1={y} y2={y} stroke={g.color} strokeWidth={1} strokeDasharray="2 3" />
              <text
                // Side by side, so two cautions near zero do not print over each other.
                x={4 + (k * box.innerWidth) / Math.max(2, guides.length)}
                y={y - 3}
                fontSize={small}
                fill={g.color}
                fontFamily={SERIF_STACK}
                stroke="#ffffff"
                strokeWidth={3}
                paintOrder="stroke"
              >
                {g.label}
              </text>
            </g>
          );
        })}

        {/* Axes. */}
        <line x1={0} x2={box.innerWidth} y1={box.innerHeight} y2={box.innerHeight} stroke={INK} strokeWidth={1} />
        {xTicks.map((tk) => (
          <g key={`x${tk.value}`} transform={`translate(${tk.pos},${box.innerHeight})`}>
            <line y1={0} y2={4} stroke={INK} />
            <text y={strip + 4 + fs} textAnchor="middle" fontSize={fs} fill={INK} fontFamily={MONO_STACK}>
              {tk.label}
            </text>
          </g>
        ))}
        <text
          x={box.innerWidth / 2}
          y={box.innerHeight + strip + 4 + fs * 2.3}
          textAnchor="middle"
          fontSize={fs}
          fill={INK}
          fontFamily={SERIF_STACK}
        >
          day
        </text>
        {hasLeft ? (
          <g>
            <line x1={0} x2={0} y1={0} y2={box.innerHeight} stroke={INK} />
            {leftTicks.map((tk) => (
              <g key={`l${tk.value}`} transform={`translate(0,${tk.pos})`}>
                <line x1={-4} x2={0} stroke={INK} />
                <text x={-6} dy="0.32em" textAnchor="end" fontSize={fs} fill={INK} fontFamily={MONO_STACK}>
                  {tk.label}
                </text>
              </g>
            ))}
            {leftLabel ? (
              <text x={-box.margin.left + 2} y={-fs * 0.9} fontSize={fs} fill={INK} fontFamily={SERIF_STACK}>
                {leftLabel}
              </text>
            ) : null}
          </g>
        ) : null}
        {hasRight ? (
          <g transform={`translate(${box.innerWidth},0)`}>
            <line x1={0} x2={0} y1={0} y2={box.innerHeight} stroke={INK} />
            {rightTicks.map((tk) => (
              <g key={`r${tk.value}`} transform={`translate(0,${tk.pos})`}>
                <line x1={0} x2={4} stroke={INK} />
                <text x={6} dy="0.32em" fontSize={fs} fill={INK} fontFamily={MONO_STACK}>
                  {tk.label}
                </text>
              </g>
            ))}
            {rightLabel ? (
              <text
                x={box.margin.right - 2}
                y={-fs * 0.9}
                textAnchor="end"
                fontSize={fs}
                fill={INK}
                fontFamily={SERIF_STACK}
              >
                {rightLabel}
              </text>
            ) : null}
          </g>
        ) : null}

        {/* The curves: overlays first (the chart lists them first), clipped to the plot. Paths are
            in tenths of a pixel (see paths.ts), hence the scaled group and widths. */}
        <g clipPath={`url(#${id}-clip)`}>
          <g transform={`scale(${1 / PATH_SCALE})`} fill="none" strokeLinejoin="round" strokeLinecap="butt">
            {paths.map(({ line: l, d }) => (
              <path
                key={l.key}
                d={d}
                stroke={l.color}
                strokeWidth={l.width * PATH_SCALE}
                strokeDasharray={scaledDash(l.dash)}
                strokeOpacity={l.opacity}
              />
            ))}
          </g>
        </g>

        {/* Readings over the curves. */}
        {points.map((p) => {
          const cx = x(p.day);
          const cy = yLeft(p.value);
          if (!(cx >= 0 && cx <= box.innerWidth)) return null;
          return (
            <g key={p.key} transform={`translate(${cx},${cy})`}>
              <title>{p.title}</title>
              <circle
                r={p.shape === "filled" ? 3.75 : 4}
                fill={p.shape === "filled" ? p.color : "#ffffff"}
                stroke={p.shape === "filled" ? "#ffffff" : p.color}
                strokeWidth={p.shape === "filled" ? 1 : 2}
              />
              {p.shape === "dot" ? <circle r={1.5} fill={p.color} /> : null}
            </g>
          );
        })}

        {/* Direct labels at the right end of each labelled line. */}
        {labelled.map((l, k) => (
          <text
            key={`lab-${l.key}`}
            x={box.innerWidth - 3}
            y={placed[k]}
            dy="0.32em"
            textAnchor="end"
            fontSize={small}
            fontWeight={600}
            fill={l.color}
            fontFamily={SERIF_STACK}
            stroke="#fbfaf7"
            strokeWidth={3}
            paintOrder="stroke"
          >
            {l.label}
          </text>
        ))}

        {/* Events on the time axis. */}
        <EventStrip events={events} kinds={eventKinds} x={x} y={box.innerHeight + 4} width={box.innerWidth} />
      </g>
    );
  }, [geometry, lines, bands, guides, points, events, id, leftLabel, rightLabel]);

  const help = `${id}-help`;
  const titleId = `${id}-title`;
  const descId = `${id}-desc`;

  let cursorLayer: ReactNode = null;
  if (geometry && t.length > 0) {
    const { box, x, yLeft, yRight } = geometry;
    const i = cursor.index;
    const day = t[i];
    const side = sampleSide(t, i) ?? "before";
    const cx = x(day);
    const fs = box.fontSize;
    cursorLayer = (
      <g data-export="skip" pointerEvents="none">
        <line x1={cx} x2={cx} y1={0} y2={box.innerHeight} stroke={INK} strokeWidth={1} />
        {lines
          .filter((l) => l.cursorDot !== false)
          .map((l) => {
            const v = valueAt(l.t, l.y, day, side);
            if (!Number.isFinite(v)) return null;
            return (
              <circle
                key={l.key}
                cx={cx}
                cy={(l.axis === "left" ? yLeft : yRight)(v)}
                r={3.5}
                fill={l.color}
                stroke="#ffffff"
                strokeWidth={1.5}
              />
            );
          })}
        <text
          x={cx < box.innerWidth / 2 ? cx + 4 : cx - 4}
          y={fs}
          textAnchor={cx < box.innerWidth / 2 ? "start" : "end"}
          fontSize={Math.round(fs * 0.85)}
          fill={INK}
          fontFamily={SERIF_STACK}
          stroke="#fbfaf7"
          strokeWidth={4}
          paintOrder="stroke"
        >
          {formatDay(day)}
        </text>
      </g>
    );
  }

  const onPointer = (e: React.PointerEvent<SVGSVGElement>, via: CursorVia) => {
    if (!geometry || t.length === 0) return;
    if (via === "pointer" && e.pointerType !== "mouse" && e.buttons === 0) return;
    const rect = e.currentTarget.getBoundingClientRect();
    const px = e.clientX - rect.left - geometry.box.margin.left;
    const day = geometry.x.invert(Math.min(Math.max(px, 0), geometry.box.innerWidth));
    const next = nearestIndex(t, day);
    if (next !== cursor.index || via !== "pointer") cursor.moveTo(next, via);
  };

  return (
    <div className="space-y-3">
      {toolbar}
      <div className="grid gap-4 lg:grid-cols-[minmax(0,1fr)_17rem]">
        <div ref={containerRef} className="min-w-0">
          {geometry ? (
            <div
              role="application"
              tabIndex={0}
              aria-roledescription="chart"
              aria-label={`${title}. ${CURSOR_KEYS_SUMMARY}`}
              aria-describedby={help}
              onKeyDown={cursor.onKeyDown}
              className="touch-pan-y rounded-md"
            >
              <svg
                ref={svgRef}
                width={geometry.box.width}
                height={geometry.box.height}
                viewBox={`0 0 ${geometry.box.width} ${geometry.box.height}`}
                role="img"
                aria-labelledby={`${titleId} ${descId}`}
                className="block select-none"
                fontFamily={SERIF_STACK}
                onPointerMove={(e) => onPointer(e, "pointer")}
                onPointerDown={(e) => onPointer(e, "click")}
              >
                <title id={titleId}>{title}</title>
                <desc id={descId}>{description}</desc>
                <g transform={`translate(${geometry.box.margin.left},${geometry.box.margin.top})`}>
                  {staticLayer}
                  {cursorLayer}
                </g>
              </svg>
            </div>
          ) : (
            // Server render and first paint: keep the space so nothing jumps when the chart draws.
            <svg width="100%" height={height} role="img" aria-label={`${title} (drawn when the page has loaded)`}>
              <rect width="100%" height="100%" fill="#f5f5f4" rx={6} />
            </svg>
          )}
          <p id={help} className="mt-1 text-xs text-stone-600">
            {CURSOR_KEYS_HELP}
          </p>
        </div>
        <div className="min-w-0 text-sm">{readout}</div>
      </div>
      <p className="sr-only" aria-live="polite" aria-atomic="true">
        {announcement}
      </p>
      {footer}
    </div>
  );
}

function lastFinite(a: ArrayLike<number>): number {
  for (let i = a.length - 1; i >= 0; i--) if (Number.isFinite(a[i])) return a[i];
  return 0;
}
