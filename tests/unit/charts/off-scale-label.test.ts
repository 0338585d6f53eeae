/**
 * A caution line far above the data leaves the ammonia panel's scale (decision 0010): the panel
 * scales to TAN and the long-term limit, and the short-term criterion's label is pinned at the
 * top with an arrow and its value. US EPA 2013 (docs/sources.md §2) at pH 7 and 26 °C: long-term
 * limit 1.3, short-term criterion 10 mg TAN-N/L, over a cycling peak of 5.
 */
import { scaleLinear } from "d3-scale";
import { createElement } from "react";
import { renderToStaticMarkup } from "react-dom/server";
import { describe, expect, it } from "vitest";
import { drawPanel } from "~/components/charts/chart-panel";
import type { FramePanel } from "~/components/charts/chart-frame-types";
import { panelMaxima, plotBox, ticksOf, valueDomain } from "~/components/charts/scales";
import { criterionLine, TAN_CRITERIA } from "~/components/charts/tan-criteria";
import type { ChartSeries } from "~/utils/chart-data";

const t = [0, 1, 2, 3];
const series: ChartSeries = {
  t,
  tan: [0, 5, 2, 0.1],
  nh3: [0, 0.05, 0.02, 0],
  no2: [0, 0, 0, 0],
  no3: [0, 0, 0, 0],
  plants: [],
  tanLongTerm: [1.3, 1.3, 1.3, 1.3],
  tanShortTerm: [10, 10, 10, 10],
};

describe("a short-term criterion far above TAN", () => {
  it("stays off the scale, its label at the top with an arrow and its value", () => {
    const lines = [
      { key: "tan", t, y: series.tan, color: "#000", width: 2, label: "TAN" },
      criterionLine("long", series, "longTerm", "#000", TAN_CRITERIA.longTerm.name)!,
      criterionLine("short", series, "shortTerm", "#000", TAN_CRITERIA.shortTerm.name)!,
    ];
    const panel: FramePanel = { key: "ammonia", label: "TAN", lines, height: 130 };
    const box = plotBox(800, 100, { rightAxis: false });
    const y = scaleLinear()
      .domain(valueDomain(panelMaxima(panel), 4))
      .range([130, 0]);
    expect(y.domain()[1]).toBeLessThan(10);
    const x = scaleLinear().domain([0, 3]).range([0, box.innerWidth]);
    const { element, overflow } = drawPanel(
      { panel, top: 0, height: 130, y, yCount: 4 },
      { box, fs: 11, x, xTicks: ticksOf(x, 4), clipId: "c" },
    );
    expect(overflow).toEqual([]);
    const html = renderToStaticMarkup(createElement("svg", null, element));
    expect(html).toContain(`↑ ${TAN_CRITERIA.shortTerm.name}: 10`);
    expect(html).toContain(`>${TAN_CRITERIA.longTerm.name}<`);
  });
});
