/**
 * The what-if answer shows the danger: the toxic peaks (free ammonia and nitrite) in the
 * person's units, flagged above their caution lines, and the preview's warnings in words.
 */
import { createElement } from "react";
import { renderToStaticMarkup } from "react-dom/server";
import { describe, expect, it } from "vitest";
import type { KeyFigures } from "../../models";
import { quietFigures } from "../support/key-figures";
import { WhatIfSummary } from "~/components/what-if-summary";
import { displayKeyFigures } from "~/features/runs/display-figures";
import { resultWarnings } from "~/features/runs/run-warnings";
import { DEFAULT_PREFERENCES, displayUnitsFor, unitLabels } from "~/utils/display-units";

const units = displayUnitsFor(DEFAULT_PREFERENCES);
const labels = unitLabels(units);

const figures = quietFigures;

const render = (saved: KeyFigures, preview: KeyFigures | null) => {
  const shown = preview ?? saved;
  const warnings = resultWarnings({ keyFigures: shown, warnings: [] }, units);
  return renderToStaticMarkup(
    createElement(WhatIfSummary, {
      saved: displayKeyFigures(saved, units),
      preview: preview ? displayKeyFigures(preview, units) : null,
      labels,
      warnings,
    }),
  );
};

describe("the what-if answer", () => {
  it("shows peak nitrite in the person's unit and flags it above the caution line (0.1 mg/L NO2-N, common practice, no source)", () => {
    // nitrite as NO2 = NO2-N / 0.30447 (atomic weights, docs/sources.md §0): 0.5 mg/L N is 1.64 mg/L NO2
    const html = render(figures(), figures({ peakNitrite: { value: 0.5, day: 9 } }));
    expect(html).toContain("Peak nitrite");
    expect(html).toMatch(/1\.64 mg\/L NO2/);
    expect(html).toMatch(/Peak nitrite<span[^>]*> — above the caution line/);
    expect(html).toContain("Nitrite reaches 1.64 mg/L NO2 on day 9, five times the caution line");
  });

  it("flags free ammonia above 0.02 mg/L NH3 (common practice, no source) and says nothing below", () => {
    // 0.1 mg/L NH3 is 0.082244 mg/L NH3-N (atomic weights)
    const high = render(figures(), figures({ peakFreeNh3: { value: 0.082244, day: 12 } }));
    expect(high).toMatch(/Peak free ammonia<span[^>]*> — above the caution line/);
    expect(high).toContain("Free ammonia reaches 0.1 mg/L NH3 on day 12, five times the caution line");
    const calm = render(figures(), figures({ peakFreeNh3: { value: 0.01, day: 12 } }));
    expect(calm).not.toContain("above the caution line");
    expect(calm).not.toContain("data-what-if-warnings");
  });
});
