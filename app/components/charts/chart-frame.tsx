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
import { CURSOR_KEYS_HELP, CURSOR_KEYS_SUMMARY, nearestIndex, sampleSide, valueAt } from "~/utils/series-lookup";
import { INK, MONO_STACK, SERIF_STACK } from "~/components/charts/palette";
import { EVENT_ROW, dayDomain, panelMaxima, plotBox, ticksOf, valueDomain } from "~/components/charts/scales";
import { formatDay } from "~/components/charts/format";
import { EVENT_ORDER, EventStrip } from "~/components/charts/event-strip";
import type { ChartFrameProps } from "~/components/charts/chart-frame-types";
import { drawPanel } from "~/components/charts/chart-panel";

export type { FrameLine, FramePanel } from "~/components/charts/chart-frame-types";

const EMPTY: readonly never[] = [];

/** Space between stacked panels, in font sizes. */
const PANEL_GAP_EM = 0.8;
/** Row above each panel for its axis title, in font sizes. */
const PANEL_HEADER_EM = 2.1;

export function ChartFrame({
  title,
  description,
  t,
  panels,
  events = EMPTY,
  minFontSize = 11,
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
  const shown = useMemo(() => panels.filter((p) => p.lines.length > 0), [panels]);
  const fallbackHeight = panels.reduce((s, p) => s + p.height + 40, 60);

  const geometry = useMemo(() => {
    if (width == null || width <= 0) return null;
    const eventKinds = EVENT_ORDER.filter((k) => events.some((e) => e.kind === k));
    const box = plotBox(width, 100, { rightAxis: false, eventRows: eventKinds.length, minFontSize });
    const fs = box.fontSize;
    const header = Math.round(fs * PANEL_HEADER_EM);
    const gap = Math.round(fs * PANEL_GAP_EM);
    // The top margin holds only the cursor's day; each panel has its own title row.
    const top = Math.round(fs * 1.5);
    const [x0, x1] = dayDomain(t);
    const x = scaleLinear().domain([x0, x1]).range([0, box.innerWidth]);
    let offset = top;
    const placedPanels = shown.map((p, k) => {
      const plotTop = offset + header;
      const h = Math.max(40, p.height);
      offset = plotTop + h + (k < shown.length - 1 ? gap : 0);
      const yCount = Math.max(2, Math.floor(h / (fs * 3.2)));
      const y = scaleLinear()
        .domain(valueDomain(panelMaxima(p), yCount))
        .range([h, 0]);
      return { panel: p, top: plotTop, height: h, y, yCount };
    });
    const totalHeight = offset + box.margin.bottom;
    const xCount = Math.max(2, Math.floor(box.innerWidth / (fs * 6.5)));
    return { box, fs, x, xCount, panels: placedPanels, plotBottom: offset, totalHeight, eventKinds };
  }, [width, t, shown, events, minFontSize]);

  // Everything that does not move with the cursor.
  const staticLayer = useMemo(() => {
    if (!geometry) return null;
    const { box, fs, x, xCount, eventKinds, plotBottom } = geometry;
    const strip = eventKinds.length * EVENT_ROW;
    const xTicks = ticksOf(x, xCount);
    const overflowLabels: string[] = [];

    const drawn = geometry.panels.map((p) => {
      const { element, overflow } = drawPanel(p, { box, fs, x, xTicks, clipId: `${id}-clip-${p.panel.key}` });
      overflowLabels.push(...overflow);
      return element;
    });

    return {
      overflowLabels,
      layer: (
        <g>
          {drawn}
          {/* The shared time axis under the last panel. */}
          {xTicks.map((tk) => (
            <text
              key={`x${tk.value}`}
              x={tk.pos}
              y={plotBottom + strip + 4 + fs}
              textAnchor="middle"
              fontSize={fs}
              fill={INK}
              fontFamily={MONO_STACK}
            >
              {tk.label}
            </text>
          ))}
          <text
            x={box.innerWidth / 2}
            y={plotBottom + strip + 4 + fs * 2.3}
            textAnchor="middle"
            fontSize={fs}
            fill={INK}
            fontFamily={SERIF_STACK}
          >
            day
          </text>
          <EventStrip events={events} kinds={eventKinds} x={x} y={plotBottom + 4} width={box.innerWidth} />
        </g>
      ),
    };
  }, [geometry, events, id]);

  const help = `${id}-help`;
  const titleId = `${id}-title`;
  const descId = `${id}-desc`;

  let cursorLayer: ReactNode = null;
  if (geometry && t.length > 0) {
    const { box, x, fs } = geometry;
    const i = cursor.index;
    const day = t[i];
    const side = sampleSide(t, i) ?? "before";
    const cx = x(day);
    const first = geometry.panels[0];
    const firstTop = first ? first.top : 0;
    cursorLayer = (
      <g data-export="skip" pointerEvents="none" data-cursor-day={day}>
        {geometry.panels.map(({ panel, top, height: h, y }) => (
          <g key={panel.key} transform={`translate(0,${top})`}>
            <line x1={cx} x2={cx} y1={0} y2={h} stroke={INK} strokeWidth={1} data-cursor-line={panel.key} />
            {panel.lines
              .filter((l) => l.cursorDot !== false)
              .map((l) => {
                const v = valueAt(l.t, l.y, day, side);
                if (!Number.isFinite(v)) return null;
                return (
                  <circle key={l.key} cx={cx} cy={y(v)} r={3.5} fill={l.color} stroke="#ffffff" strokeWidth={1.5} />
                );
              })}
          </g>
        ))}
        {/* The day sits in its own row above the panels, clear of every label. */}
        <text
          x={Math.min(Math.max(cx, fs * 3), box.innerWidth - fs * 3)}
          y={firstTop - PANEL_HEADER_EM * fs - fs * 0.45}
          textAnchor="middle"
          fontSize={fs}
          fill={INK}
          fontFamily={SERIF_STACK}
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
                height={geometry.totalHeight}
                viewBox={`0 0 ${geometry.box.width} ${geometry.totalHeight}`}
                role="img"
                aria-labelledby={`${titleId} ${descId}`}
                className="block select-none"
                fontFamily={SERIF_STACK}
                onPointerMove={(e) => onPointer(e, "pointer")}
                onPointerDown={(e) => onPointer(e, "click")}
              >
                <title id={titleId}>{title}</title>
                <desc id={descId}>{description}</desc>
                <g transform={`translate(${geometry.box.margin.left},0)`}>
                  {staticLayer?.layer}
                  {cursorLayer}
                </g>
              </svg>
            </div>
          ) : (
            // Server render and first paint: keep the space so nothing jumps when the chart draws.
            <svg
              width="100%"
              height={fallbackHeight}
              role="img"
              aria-label={`${title} (drawn when the page has loaded)`}
            >
              <rect width="100%" height="100%" fill="#f5f5f4" rx={6} />
            </svg>
          )}
          {staticLayer && staticLayer.overflowLabels.length ? (
            <p className="mt-1 text-sm text-stone-700" data-chart-overflow="">
              Also on the chart: {staticLayer.overflowLabels.join("; ")}.
            </p>
          ) : null}
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
