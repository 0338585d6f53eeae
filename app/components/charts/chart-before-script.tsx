/**
 * What a chart sends from the server: its place, kept at about the drawn chart's height, and,
 * for a browser with scripts off, why it stays empty and where the numbers are. The chart
 * (curves, toggles, readout, table) is drawn by the page's script once the page has loaded;
 * server-rendering its controls cost a good part of a results page's first render and gave a
 * browser without scripts only buttons that did nothing (docs/decisions/0012-script-parts-drawn-in-the-browser.md).
 */
import type { CSSProperties } from "react";

/** The drawn chart's height in px, about, on narrow screens and from Tailwind's lg breakpoint. */
export type ReservedHeight = { narrow: number; wide: number };

export function ChartBeforeScript({
  title,
  reserved,
  csvHref,
}: {
  title: string;
  /** About what the drawn chart takes, so the page does not jump when it draws. */
  reserved: ReservedHeight;
  /** The run's CSV, offered when scripts are off. */
  csvHref?: string;
}) {
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
        {/* Without scripts the chart never draws: no empty box, only why and where the numbers are. */}
        <style>{"[data-chart-stand-in] > svg { display: none; }"}</style>
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
 * The charts' heights as drawn: the toggles, the panels with their title rows, the downloads,
 * and the readout (beside the chart from Tailwind's lg breakpoint, under it before). Measured in
 * Chromium on the demo's pages: the results chart 1017 px at 1280 px wide and 1618 px at 390 px
 * for the default height of 340, 1258 px for the presentation's 640 at 1920 px wide; the compare
 * chart (one species, nitrate and plants) 651 and 877 px; the journal's replay chart comes
 * within 35 px of the results chart's.
 */
export function seriesChartHeight(chartHeight: number): ReservedHeight {
  const panels = Math.round(chartHeight * 0.8);
  return { wide: panels + 744, narrow: panels + 1346 };
}

export function compareChartHeight(chartHeight: number): ReservedHeight {
  const panels = Math.round(chartHeight * 0.8);
  return { wide: panels + 379, narrow: panels + 605 };
}
