/**
 * One panel of ChartFrame's stack: its grid, band, caution lines, value axis and title, curves,
 * readings and in-plot labels (placed by label-layout.ts so none overlaps another; those that
 * cannot fit are returned for the chart to list under the plot).
 */
import type { ScaleLinear } from "d3-scale";
import type { ReactNode } from "react";
import type { FramePanel } from "~/components/charts/chart-frame-types";
import { formatNumber } from "~/components/charts/format";
import { estimateTextWidth, layoutLabels, type LabelRequest } from "~/components/charts/label-layout";
import { GRID, INK, MONO_STACK, SERIF_STACK } from "~/components/charts/palette";
import { PATH_SCALE, linePath, scaledDash } from "~/components/charts/paths";
import { ticksOf, type PlotBox, type Ticks } from "~/components/charts/scales";

export type PlacedPanel = {
  panel: FramePanel;
  /** Top of the plot area in the SVG, px. */
  top: number;
  height: number;
  y: ScaleLinear<number, number>;
  yCount: number;
};

const EMPTY: readonly never[] = [];

export function drawPanel(
  { panel, height: h, y, yCount, top }: PlacedPanel,
  {
    box,
    fs,
    x,
    xTicks,
    clipId,
  }: { box: PlotBox; fs: number; x: ScaleLinear<number, number>; xTicks: Ticks; clipId: string },
): { element: ReactNode; overflow: string[] } {
  const bands = panel.bands ?? EMPTY;
  const guides = panel.guides ?? EMPTY;
  const points = panel.points ?? EMPTY;
  const yTicks = ticksOf(y, yCount);
  const paths = panel.lines.map((l) => ({ line: l, d: linePath(l.t, l.y, x, y, box.innerWidth) }));
  const labelH = Math.ceil(fs * 1.2);
  // Labels in order of importance: cautions, then the band, then the lines' direct labels.
  const texts = new Map<string, { text: string; color: string; bold: boolean }>();
  const requests: LabelRequest[] = [];
  for (const g of guides) {
    texts.set(g.key, { text: g.label, color: g.color, bold: false });
    requests.push({
      id: g.key,
      x: 4,
      anchor: "start",
      y: y(g.value) - labelH / 2 - 2,
      width: estimateTextWidth(g.label, fs),
      height: labelH,
    });
  }
  for (const b of bands) {
    texts.set(b.key, { text: b.label, color: INK, bold: false });
    requests.push({
      id: b.key,
      x: 4,
      anchor: "start",
      y: y(b.high) + labelH / 2 + 2,
      width: estimateTextWidth(b.label, fs),
      height: labelH,
    });
  }
  for (const l of panel.lines) {
    if (!l.label) continue;
    const last = lastFinite(l.y);
    // A line that ends above the scale (mayLeaveScale) is labelled at the top, with its value.
    const above = last > y.domain()[1];
    const text = above ? `↑ ${l.label}: ${formatNumber(last)}` : l.label;
    texts.set(l.key, { text, color: l.color, bold: true });
    requests.push({
      id: l.key,
      x: box.innerWidth - 3,
      anchor: "end",
      y: above ? 0 : y(last),
      width: estimateTextWidth(text, fs, true),
      height: labelH,
    });
  }
  const layout = layoutLabels(requests, { top: 0, bottom: h }, { gap: 2 });
  const overflow = layout.overflow.flatMap((o) => texts.get(o)?.text ?? []);

  const element = (
    <g key={panel.key} transform={`translate(0,${top})`} data-panel={panel.key}>
      <defs>
        <clipPath id={clipId}>
          <rect x={0} y={-2} width={box.innerWidth} height={h + 4} />
        </clipPath>
      </defs>
      {yTicks.map((tk) => (
        <line key={`g${tk.value}`} x1={0} x2={box.innerWidth} y1={tk.pos} y2={tk.pos} stroke={GRID} strokeWidth={1} />
      ))}
      {bands.map((b) => {
        const bt = y(b.high);
        const bb = y(b.low);
        return <rect key={b.key} x={0} width={box.innerWidth} y={bt} height={Math.max(0, bb - bt)} fill={b.color} />;
      })}
      {guides.map((g) => {
        const gy = y(g.value);
        return (
          <line
            key={g.key}
            x1={0}
            x2={box.innerWidth}
            y1={gy}
            y2={gy}
            stroke={g.color}
            strokeWidth={1.25}
            strokeDasharray="4 3"
          />
        );
      })}
      {/* Axes. */}
      <line x1={0} x2={box.innerWidth} y1={h} y2={h} stroke={INK} strokeWidth={1} />
      {xTicks.map((tk) => (
        <line key={`xt${tk.value}`} x1={tk.pos} x2={tk.pos} y1={h} y2={h + 4} stroke={INK} />
      ))}
      <line x1={0} x2={0} y1={0} y2={h} stroke={INK} />
      {yTicks.map((tk) => (
        <g key={`l${tk.value}`} transform={`translate(0,${tk.pos})`}>
          <line x1={-4} x2={0} stroke={INK} />
          <text
            x={-6}
            dy="0.32em"
            textAnchor="end"
            fontSize={fs}
            fill={INK}
            fontFamily={MONO_STACK}
            data-y-tick={tk.value}
          >
            {tk.label}
          </text>
        </g>
      ))}
      <text
        x={-box.margin.left + 2}
        y={-fs * 1.0}
        fontSize={fs}
        fontWeight={600}
        fill={INK}
        fontFamily={SERIF_STACK}
        data-axis-title={panel.key}
      >
        {panel.label}
      </text>
      {/* The curves, clipped to the plot. Paths are in tenths of a pixel (see paths.ts). */}
      <g clipPath={`url(#${clipId})`}>
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
        const cy = y(p.value);
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
      {/* In-plot labels, placed so that none overlaps another (label-layout.ts). */}
      {layout.placed.map((pl) => {
        const tx = texts.get(pl.id);
        if (!tx) return null;
        return (
          <text
            key={`lab-${pl.id}`}
            x={pl.x}
            y={pl.y}
            dy="0.35em"
            textAnchor={pl.anchor}
            fontSize={fs}
            fontWeight={tx.bold ? 600 : 400}
            fill={tx.color}
            fontFamily={SERIF_STACK}
            stroke="#fbfaf7"
            strokeWidth={3}
            paintOrder="stroke"
            data-chart-label=""
          >
            {tx.text}
          </text>
        );
      })}
    </g>
  );
  return { element, overflow };
}

function lastFinite(a: ArrayLike<number>): number {
  for (let i = a.length - 1; i >= 0; i--) if (Number.isFinite(a[i])) return a[i];
  return 0;
}
