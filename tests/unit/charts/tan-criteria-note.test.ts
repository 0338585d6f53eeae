/**
 * Under a chart that draws the TAN caution lines, a note says they are averages (US EPA 2013,
 * docs/sources.md §2: the long-term limit for 30-day averages, the short-term criterion for
 * 1-hour averages), so a spike across the long-term line with no warning reads as it should.
 * A chart without the lines carries no note. The series are our own worked numbers.
 */
import { createElement } from "react";
import { renderToString } from "react-dom/server";
import { describe, expect, it, vi } from "vitest";

// The chart as the browser draws it, right after hydration (the server sends a stand-in, decision 0012).
vi.mock("~/utils/use-hydrated", () => ({ useHydrated: () => true }));
import { TimeSeriesChart } from "~/components/charts/time-series-chart";
import type { ChartSeries } from "~/utils/chart-data";
import { DEFAULT_PREFERENCES, displayUnitsFor, unitLabels } from "~/utils/display-units";

const units = unitLabels(displayUnitsFor(DEFAULT_PREFERENCES));
const plain: ChartSeries = {
  t: [0, 1, 2, 3],
  tan: [0, 2.5, 1, 0.1],
  nh3: [0, 0.02, 0.01, 0],
  no2: [0, 0, 0, 0],
  no3: [0, 0, 0, 0],
  plants: [],
};
// pH 7, 20 °C: long-term limit 1.9, short-term criterion 17 mg TAN-N/L (US EPA 2013).
const withLines: ChartSeries = { ...plain, tanLongTerm: [1.9, 1.9, 1.9, 1.9], tanShortTerm: [17, 17, 17, 17] };

const render = (series: ChartSeries) =>
  renderToString(
    createElement(TimeSeriesChart, { title: "Test run", series, units, downloadName: false, table: false }),
  );

describe("the note under the TAN caution lines", () => {
  it("says both lines are averages when the chart draws them", () => {
    const html = render(withLines);
    expect(html).toContain("data-tan-criteria-note");
    expect(html).toMatch(/long-term limit\s+holds for 30-day averages/);
    expect(html).toMatch(/short-term criterion holds for 1-hour averages/);
  });

  it("is left out when the chart has no caution lines", () => {
    expect(render(plain)).not.toContain("data-tan-criteria-note");
  });

  it("is left out when TAN is hidden", () => {
    const html = renderToString(
      createElement(TimeSeriesChart, {
        title: "Test run",
        series: withLines,
        units,
        downloadName: false,
        table: false,
        visible: { tan: false, nh3: true, no2: true, no3: true, plants: true },
      }),
    );
    expect(html).not.toContain("data-tan-criteria-note");
  });
});
