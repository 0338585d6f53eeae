import { describe, expect, it } from "vitest";
import { howFarAbove, resultWarnings, type ToxicPeaks } from "~/features/runs/run-warnings";
import { DEFAULT_PREFERENCES, displayUnitsFor } from "~/utils/display-units";

const units = displayUnitsFor(DEFAULT_PREFERENCES);
// NH3 → N ×0.82244 and NO2⁻ → N ×0.30447, computed from atomic weights (docs/sources.md §0).
const NH3_N = 0.82244;
const NO2_N = 0.30447;

/** The peaks of a quiet run (nothing near a caution line), with `over` changed. */
const figures = (over: Partial<ToxicPeaks> = {}): ToxicPeaks => ({
  peakFreeNh3: { value: 0, day: 0 },
  peakNitrite: { value: 0, day: 0 },
  ...over,
});

describe("the run's warnings in plain words", () => {
  it("names free ammonia's peak, its day and how far above the caution line (0.02 mg/L NH3, common practice, no source)", () => {
    const [w] = resultWarnings(
      { keyFigures: figures({ peakFreeNh3: { value: 0.4 * NH3_N, day: 12 } }), warnings: [], tapWater: { khDkh: 6 } },
      units,
    );
    expect(w.text).toBe("Free ammonia reaches 0.4 mg/L NH3 on day 12, twenty times the caution line (0.02 mg/L NH3).");
    expect(w.figure).toBe("peakFreeNh3");
  });

  it("names nitrite above its caution line (0.1 mg/L NO2-N, common practice, no source)", () => {
    const list = resultWarnings(
      { keyFigures: figures({ peakNitrite: { value: 0.5, day: 20 } }), warnings: [], tapWater: { khDkh: 6 } },
      units,
    );
    expect(list.map((w) => w.code)).toEqual(["nitriteAboveCaution"]);
    expect(list[0].text).toContain(`${Number((0.5 / NO2_N).toPrecision(3))} mg/L NO2 on day 20, five times`);
  });

  it("says nothing for a run below every caution", () => {
    expect(resultWarnings({ keyFigures: figures(), warnings: [], tapWater: { khDkh: 6 } }, units)).toEqual([]);
  });

  it("warns of KH running out and of change water blended below a safe KH (2 dKH, common practice, no source)", () => {
    const list = resultWarnings(
      {
        keyFigures: figures(),
        warnings: [
          { code: "khExhausted", severity: "caution", message: "", value: 0.2, unit: "dKH", limit: 0.5, day: 40 },
        ],
        tapWater: { khDkh: 3, roShare: 0.5 },
      },
      units,
    );
    expect(list.map((w) => w.code)).toEqual(["khExhausted", "blendBelowSafeKh"]);
    expect(list[0].text).toMatch(/^KH runs out on day 40 \(down to 0\.2 dKH\)/);
    expect(list[1].text).toContain("1.5 dKH");
    // 3 dKH with 25 % RO water is 2.25 dKH: no warning.
    expect(
      resultWarnings({ keyFigures: figures(), warnings: [], tapWater: { khDkh: 3, roShare: 0.25 } }, units),
    ).toEqual([]);
  });

  it("states KH in the person's KH unit (1 dKH = 17.848 mg/L CaCO3: 10 mg CaO per litre, atomic weights)", () => {
    const caco3 = displayUnitsFor({ ...DEFAULT_PREFERENCES, khUnit: "CaCO3" });
    const list = resultWarnings(
      {
        keyFigures: figures(),
        warnings: [
          { code: "khExhausted", severity: "caution", message: "", value: 0.2, unit: "dKH", limit: 0.5, day: 40 },
        ],
        tapWater: { khDkh: 3, roShare: 0.5 },
      },
      caco3,
    );
    expect(list[0].text).toContain("(down to 3.57 mg/L CaCO3)");
    // 1.5 dKH blend, 2 dKH safe line
    expect(list[1].text).toContain("a KH of only 26.8 mg/L CaCO3, below the 35.7 mg/L CaCO3");
    for (const w of list) expect(w.text).not.toMatch(/dKH/);
  });

  it("dates a feeding warning that a logged feeding change brought, and says so", () => {
    const list = resultWarnings(
      {
        keyFigures: figures(),
        warnings: [
          {
            code: "heavyFeedingForVolume",
            severity: "implausible",
            message: "",
            value: 5,
            unit: "g/L/day",
            limit: 0.03,
            day: 10,
          },
          {
            code: "feedBeyondOxygenSupply",
            severity: "implausible",
            message: "",
            value: 3,
            unit: "× the oxygen supply",
            limit: 1,
            day: 10,
          },
        ],
      },
      units,
    );
    expect(list.map((w) => w.text)).toEqual([
      expect.stringMatching(
        /^From day 10, when the feeding was changed, 5 g of food a day per L of water is far beyond/,
      ),
      expect.stringMatching(/^From day 10, when the feeding was changed, the food needs more oxygen than/),
    ]);
  });

  it("states feeding per volume in the person's volume unit (1 US gal = 3.785411784 L, NIST SP 811)", () => {
    const gallons = displayUnitsFor({ ...DEFAULT_PREFERENCES, volumeUnit: "usgal" });
    const list = resultWarnings(
      {
        keyFigures: figures(),
        warnings: [
          {
            code: "heavyFeedingForVolume",
            severity: "implausible",
            message: "",
            value: 0.05,
            unit: "g/L/day",
            limit: 0.03,
            day: null,
          },
          {
            code: "feedBeyondOxygenSupply",
            severity: "implausible",
            message: "",
            value: 2,
            unit: "× the oxygen supply",
            limit: 1,
            day: null,
          },
        ],
        tapWater: { khDkh: 6 },
        volumeL: 37.85411784,
      },
      gallons,
    );
    expect(list[0].text).toMatch(/^0\.189 g of food a day per US gal of water .* \(about 0\.114 g at most\)/);
    expect(list[1].text).toContain("(twice the most they bring in): no tank of 10 US gal could carry");
    for (const w of list) expect(w.text).not.toMatch(/\bL\b|litre/);
  });

  it("puts the ratio in words", () => {
    expect(howFarAbove(1.4)).toBe("40 % above");
    expect(howFarAbove(2)).toBe("twice");
    expect(howFarAbove(20.2)).toBe("twenty times");
    expect(howFarAbove(35)).toBe("35 times");
  });
});
