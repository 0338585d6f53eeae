/**
 * What a chart sends from the server: its place, kept at about the drawn chart's height, and,
 * for a browser with scripts off, why it stays empty and where the numbers are. The chart
 * (curves, toggles, readout, table) is drawn by the page's script once the page has loaded;
 * server-rendering its controls cost a third of a results page's render and gave a browser
 * without scripts only buttons that did nothing (docs/decisions/0012-charts-drawn-in-the-browser.md).
 */
import type { CSSProperties } from "react";

export function ChartBeforeScript({
  title,
  height,
  csvHref,
}: {
  title: string;
  /** The chart's own height prop: the stand-in reserves about what the drawn chart takes. */
  height: number;
  /** The run's CSV, offered when scripts are off. */
  csvHref?: string;
}) {
  const reserved = reservedHeight(height);
  return (
    <div className="space-y-3" data-chart-stand-in="">
      <svg
        width="100%"
        role="img"
        aria-label={`${title} (drawn when the page has loaded)`}
        className="block h-(--chart-stand-in) lg:h-(--chart-stand-in-lg)"
        style={
          { "--chart-stand-in": `${reserved.narrow}px`, "--chart-stand-in-lg": `${reserved.wide}px` } as CSSProperties
        }
      >
        <rect width="100%" height="100%" fill="#f5f5f4" rx={6} />
        <text x="50%" y={40} textAnchor="middle" fontSize={14} fill="#57534e">
          The chart is drawn when the page has loaded.
        </text>
      </svg>
      <noscript>
        <p className="text-sm text-stone-700">
          The chart and its table are drawn by the page’s script, which is off in this browser.
          {csvHref ? (
            <>
              {" "}
              The same numbers are in{" "}
              <a className="link" href={csvHref}>
                the run as a CSV file
              </a>{" "}
              (one row per sample; nitrogen in mg N/L, the model’s own unit).
            </>
          ) : null}
        </p>
      </noscript>
    </div>
  );
}

/**
 * About the drawn chart's height in px, so the page does not jump when it draws: the toggles,
 * the panels with their title rows, the downloads, and the readout (beside the chart from
 * Tailwind's lg breakpoint, under it before). Measured in Chromium on the demo's results page
 * at 1280 and 390 px wide: 1017 and 1618 px for the default height of 340.
 */
function reservedHeight(chartHeight: number): { narrow: number; wide: number } {
  const chartAndControls = Math.round(chartHeight * 1.5);
  return { wide: chartAndControls + 507, narrow: chartAndControls + 1108 };
}
