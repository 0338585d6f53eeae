import { useMemo } from "react";
import { XYChart, type XYSeries } from "~/components/charts/xy-chart";
import type { ChartSeries } from "~/utils/chart-data";
import { formatNumber } from "~/utils/display-units";

/** Samples kept for the oxygen panel: a pixel column's worth is plenty for a slow curve. */
const MAX_POINTS = 600;
const OXYGEN_COLOR = "#0e7490";
const CAUTION_COLOR = "#b91c1c";

/**
 * Dissolved oxygen over the run on its own panel (mg O2/L), with the level below which fish
 * suffer drawn as a dashed line. Nothing is drawn for runs made before oxygen was modelled.
 */
export function OxygenChart({ series, caution, name }: { series: ChartSeries; caution?: number; name: string }) {
  const lines = useMemo((): XYSeries[] => {
    const o2 = series.o2;
    if (!o2 || o2.length === 0) return [];
    const step = Math.max(1, Math.ceil(o2.length / MAX_POINTS));
    const points = [];
    for (let k = 0; k < o2.length; k += step) points.push({ x: series.t[k], y: o2[k] });
    if ((o2.length - 1) % step !== 0) points.push({ x: series.t[o2.length - 1], y: o2[o2.length - 1] });
    const out: XYSeries[] = [{ key: "o2", label: "Dissolved oxygen", color: OXYGEN_COLOR, points, line: true }];
    if (caution !== undefined) {
      const last = series.t[series.t.length - 1];
      out.push({
        key: "o2-caution",
        label: `Fish suffer below ${formatNumber(caution)} mg/L`,
        color: CAUTION_COLOR,
        points: [
          { x: 0, y: caution },
          { x: last, y: caution },
        ],
        line: true,
        dash: "6 4",
      });
    }
    return out;
  }, [series, caution]);
  if (lines.length === 0) return null;
  return (
    <section aria-labelledby="oxygen-title" className="card space-y-2">
      <h2 id="oxygen-title" className="text-lg">
        Dissolved oxygen
      </h2>
      <XYChart
        title={`${name}: dissolved oxygen`}
        description="Dissolved oxygen in the tank water over the run, in mg O2/L, with the level below which fish suffer."
        xLabel="day"
        yLabel="oxygen, mg O2/L"
        series={lines}
        xRange={[0, series.t[series.t.length - 1]]}
        height={200}
        zeroLine
        table={false}
      />
    </section>
  );
}
