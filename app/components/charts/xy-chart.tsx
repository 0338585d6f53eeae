/**
 * A small chart of y against x for everything that is not a time series: an outcome against the
 * setting a sweep varied, and residuals (reading − model) against the day of each reading.
 * Built from the same pieces as the results charts (plot box, ticks, palette, fonts, container
 * width); values may be negative (residuals), so the y domain spans both signs and a zero line
 * can be drawn. The numbers are also in a table under the chart.
 *
 * Props: `title`, `description` (for the SVG's <desc>), `xLabel`/`yLabel` (with units),
 * `series` (each a label, colour, points {x, y}; `line` joins them in x order; `shape` of the
 * markers), optional `marker` (a vertical line at x, e.g. "now"), `xRange`, `zeroLine`, `height` (px,
 * default 260), `table` (default true).
 */
import { scaleLinear } from "d3-scale";
import { line as d3line } from "d3-shape";
import { useId, useMemo } from "react";
import { formatNumber } from "~/components/charts/format";
import { useContainerWidth } from "~/components/charts/hooks";
import { LineSwatch } from "~/components/charts/legend";
import { GRID, INK, MONO_STACK, SERIF_STACK } from "~/components/charts/palette";
import { plotBox, tickCounts, ticksOf } from "~/components/charts/scales";

export type XYPoint = { x: number; y: number | null };

export type XYSeries = {
  key: string;
  label: string;
  color: string;
  points: readonly XYPoint[];
  line?: boolean;
  dash?: string;
  shape?: "filled" | "ring";
};

export type XYChartProps = {
  title: string;
  description: string;
  xLabel: string;
  yLabel: string;
  series: readonly XYSeries[];
  marker?: { x: number; label: string };
  /** Fixed x range (e.g. a sweep's from–to, so the axis stays put while points arrive). */
  xRange?: [number, number];
  zeroLine?: boolean;
  height?: number;
  table?: boolean;
};

/**
 * A domain covering `values` (and 0 when asked), made round; a flat set widens by ±1 (or ±10 %).
 * `pad` adds 5 % headroom (values), none for the x axis (a sweep's range is exactly what was asked).
 */
function signedDomain(values: readonly number[], ticks: number, withZero: boolean, pad = true): [number, number] {
  const finite = values.filter(Number.isFinite);
  if (withZero) finite.push(0);
  if (finite.length === 0) return [0, 1];
  let lo = Math.min(...finite);
  let hi = Math.max(...finite);
  if (lo === hi) {
    const pad = lo === 0 ? 1 : Math.abs(lo) * 0.1;
    lo -= pad;
    hi += pad;
  } else if (pad) {
    const room = (hi - lo) * 0.05;
    // Headroom below only for negative values or a floating axis, and never below zero for values that are not negative.
    lo = lo < 0 ? lo - room : withZero ? lo : Math.max(0, lo - room);
    hi += room;
  }
  const d = scaleLinear().domain([lo, hi]).nice(ticks).domain();
  return [d[0], d[1]];
}

export function XYChart({
  title,
  description,
  xLabel,
  yLabel,
  series,
  marker,
  xRange,
  zeroLine = false,
  height = 260,
  table = true,
}: XYChartProps) {
  const id = useId().replace(/[^a-zA-Z0-9_-]/g, "");
  const [ref, width] = useContainerWidth<HTMLDivElement>();

  const drawing = useMemo(() => {
    if (width == null || width <= 0) return null;
    const box = plotBox(width, height, { rightAxis: false });
    const counts = tickCounts(box);
    const xs = series.flatMap((s) => s.points.map((p) => p.x));
    if (marker) xs.push(marker.x);
    if (xRange) xs.push(...xRange);
    const ys = series.flatMap((s) => s.points.map((p) => p.y ?? NaN));
    const [x0, x1] = signedDomain(xs, counts.x, false, false);
    const x = scaleLinear().domain([x0, x1]).range([0, box.innerWidth]);
    const y = scaleLinear()
      .domain(signedDomain(ys, counts.y, zeroLine))
      .range([box.innerHeight, 0]);
    const fs = box.fontSize;
    const path = d3line<XYPoint>()
      .defined((p) => p.y !== null && Number.isFinite(p.y))
      .x((p) => x(p.x))
      .y((p) => y(p.y ?? 0))
      .digits(1);
    return (
      <svg
        width={box.width}
        height={box.height}
        viewBox={`0 0 ${box.width} ${box.height}`}
        role="img"
        aria-labelledby={`${id}-t ${id}-d`}
        fontFamily={SERIF_STACK}
        className="block"
      >
        <title id={`${id}-t`}>{title}</title>
        <desc id={`${id}-d`}>{description}</desc>
        <g transform={`translate(${box.margin.left},${box.margin.top})`}>
          {ticksOf(y, counts.y).map((t) => (
            <g key={`y${t.value}`}>
              <line x1={0} x2={box.innerWidth} y1={t.pos} y2={t.pos} stroke={GRID} />
              <text x={-6} y={t.pos} dy="0.32em" textAnchor="end" fontSize={fs} fill={INK} fontFamily={MONO_STACK}>
                {t.label}
              </text>
            </g>
          ))}
          {zeroLine ? <line x1={0} x2={box.innerWidth} y1={y(0)} y2={y(0)} stroke={INK} strokeDasharray="4 3" /> : null}
          <line x1={0} x2={0} y1={0} y2={box.innerHeight} stroke={INK} />
          <line x1={0} x2={box.innerWidth} y1={box.innerHeight} y2={box.innerHeight} stroke={INK} />
          {ticksOf(x, counts.x).map((t) => (
            <g key={`x${t.value}`} transform={`translate(${t.pos},${box.innerHeight})`}>
              <line y2={4} stroke={INK} />
              <text y={4 + fs} textAnchor="middle" fontSize={fs} fill={INK} fontFamily={MONO_STACK}>
                {t.label}
              </text>
            </g>
          ))}
          <text x={box.innerWidth / 2} y={box.innerHeight + 4 + fs * 2.3} textAnchor="middle" fontSize={fs} fill={INK}>
            {xLabel}
          </text>
          <text x={-box.margin.left + 2} y={-fs * 0.9} fontSize={fs} fill={INK}>
            {yLabel}
          </text>
          {marker ? (
            <g>
              <line x1={x(marker.x)} x2={x(marker.x)} y1={0} y2={box.innerHeight} stroke={INK} strokeDasharray="2 3" />
              <text
                x={x(marker.x) + (x(marker.x) > box.innerWidth * 0.8 ? -4 : 4)}
                y={fs}
                textAnchor={x(marker.x) > box.innerWidth * 0.8 ? "end" : "start"}
                fontSize={Math.round(fs * 0.85)}
                fill={INK}
                stroke="#ffffff"
                strokeWidth={3}
                paintOrder="stroke"
              >
                {marker.label}
              </text>
            </g>
          ) : null}
          {series.map((s) => {
            const sorted = [...s.points].sort((a, b) => a.x - b.x);
            return (
              <g key={s.key}>
                {s.line ? (
                  <path d={path(sorted) ?? ""} fill="none" stroke={s.color} strokeWidth={2} strokeDasharray={s.dash} />
                ) : null}
                {sorted.map((p, k) =>
                  p.y === null || !Number.isFinite(p.y) ? null : (
                    <circle
                      key={k}
                      cx={x(p.x)}
                      cy={y(p.y)}
                      r={s.shape === "ring" ? 3.5 : 3.25}
                      fill={s.shape === "ring" ? "#ffffff" : s.color}
                      stroke={s.shape === "ring" ? s.color : "#ffffff"}
                      strokeWidth={s.shape === "ring" ? 1.75 : 1}
                    >
                      <title>{`${s.label}: ${formatNumber(p.x)}, ${formatNumber(p.y)}`}</title>
                    </circle>
                  ),
                )}
              </g>
            );
          })}
        </g>
      </svg>
    );
  }, [width, height, series, marker, xRange, zeroLine, title, description, xLabel, yLabel, id]);

  return (
    <figure className="space-y-2">
      {series.length > 1 ? (
        <ul className="flex flex-wrap gap-x-4 gap-y-1 text-sm" aria-label="Legend">
          {series.map((s) => (
            <li key={s.key} className="flex items-center gap-1.5">
              {s.line ? (
                <LineSwatch color={s.color} dash={s.dash} />
              ) : (
                <svg width="12" height="12" aria-hidden="true">
                  <circle
                    cx="6"
                    cy="6"
                    r="4"
                    fill={s.shape === "ring" ? "#ffffff" : s.color}
                    stroke={s.color}
                    strokeWidth={1.75}
                  />
                </svg>
              )}
              {s.label}
            </li>
          ))}
        </ul>
      ) : null}
      <div ref={ref} className="min-w-0">
        {drawing ?? (
          <svg width="100%" height={height} role="img" aria-label={`${title} (drawn when the page has loaded)`}>
            <rect width="100%" height="100%" fill="#f5f5f4" rx={6} />
          </svg>
        )}
      </div>
      {table ? (
        <details className="text-sm">
          <summary className="cursor-pointer text-fern-800">Show the numbers as a table</summary>
          <div className="mt-2 max-h-80 overflow-auto">
            <table className="w-full text-left">
              <caption className="sr-only">{title}: the numbers</caption>
              <thead>
                <tr className="text-xs text-stone-600">
                  <th scope="col" className="pr-3 font-normal">
                    Series
                  </th>
                  <th scope="col" className="pr-3 text-right font-normal">
                    {xLabel}
                  </th>
                  <th scope="col" className="text-right font-normal">
                    {yLabel}
                  </th>
                </tr>
              </thead>
              <tbody>
                {series.flatMap((s) =>
                  s.points.map((p, k) => (
                    <tr key={`${s.key}-${k}`}>
                      <td className="pr-3">{s.label}</td>
                      <td className="num pr-3 text-right">{formatNumber(p.x, 4)}</td>
                      <td className="num text-right">{p.y === null ? "–" : formatNumber(p.y, 4)}</td>
                    </tr>
                  )),
                )}
              </tbody>
            </table>
          </div>
        </details>
      ) : null}
    </figure>
  );
}
