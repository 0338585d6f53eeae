/**
 * The chronic ammonia criterion moves with pH, and pH moves in a run: a new filter's
 * nitrification uses up KH and pH falls over the weeks. The criterion of a 30-day window must
 * be the one at that window's pH, not at the run's average pH, which is lower than the pH of the
 * weeks when ammonia is high and so gives a laxer line just when it matters.
 */
import { describe, expect, it } from "vitest";
import { ScenarioSchema, simulate } from "../../models/index";
import { rel } from "./helpers";

/**
 * US EPA 2013, EPA 822-R-13-001, the chronic criterion equation (docs/sources.md §2), written
 * out here on its own so the check does not lean on the engine's copy: mg TAN-N/L.
 */
function epaChronic(pH: number, temperatureC: number): number {
  const phTerm = 0.0278 / (1 + 10 ** (7.688 - pH)) + 1.1994 / (1 + 10 ** (pH - 7.688));
  return 0.8876 * phTerm * 2.126 * 10 ** (0.028 * (20 - Math.max(temperatureC, 7)));
}

/** Time-weighted mean of samples `from`..`to` (inclusive), trapezoids. */
function mean(t: number[], v: number[], from: number, to: number): number {
  let area = 0;
  for (let k = from + 1; k <= to; k++) area += ((v[k] + v[k - 1]) / 2) * (t[k] - t[k - 1]);
  return area / (t[to] - t[from]);
}

// Our own worked example: a new filter in soft water (3 dKH) at pH 8.2 and 26 °C, pH following
// KH, no water changes. Ammonia is highest in the first weeks, while pH is still near 8.2.
const SOFT_NEW_FILTER = ScenarioSchema.parse({
  water: { volumeL: 100, pH: 8.2, khDkh: 3, phFollowsKh: true, temperatureC: 26 },
  fish: { feedGPerDay: 0.5 },
  filter: { establishedAtStart: false },
  maintenance: { waterChangeIntervalDays: 0 },
  run: { lengthDays: 120, outputIntervalDays: 0.25 },
});

describe("the chronic ammonia criterion at each window's pH", () => {
  const r = simulate(SOFT_NEW_FILTER);
  const { t, tan, ph } = r.series;
  // The reference: every 30-day window of the samples, its mean TAN against the criterion at
  // its mean pH (US EPA 2013 states the chronic criterion for a 30-day average).
  const span = Math.round(30 / 0.25);
  let worst = { ratio: 0, tan: 0, limit: 0, end: 0, ph: 0 };
  for (let end = span; end < t.length; end++) {
    const mTan = mean(t, tan, end - span, end);
    const mPh = mean(t, ph, end - span, end);
    const limit = epaChronic(mPh, 26);
    if (mTan / limit > worst.ratio) worst = { ratio: mTan / limit, tan: mTan, limit, end: t[end], ph: mPh };
  }

  it("pH falls over the run, so the run's average pH is well below the worst window's", () => {
    expect(Math.max(...ph) - Math.min(...ph)).toBeGreaterThan(0.5);
    const runPh = mean(t, ph, 0, t.length - 1);
    expect(worst.ph - runPh).toBeGreaterThan(0.2);
    // At the run's average pH the worst window would pass: the old rule missed it.
    expect(worst.tan).toBeLessThan(epaChronic(runPh, 26));
  });

  it("warns for the window that crosses the criterion at its own pH, with that criterion", () => {
    expect(worst.ratio).toBeGreaterThan(1);
    const w = r.warnings.find((x) => x.code === "ammoniaAboveChronicCriterion");
    expect(w, "the 30-day warning").toBeDefined();
    expect(rel(w!.value, worst.tan)).toBeLessThan(0.02);
    expect(rel(w!.limit, worst.limit)).toBeLessThan(0.02);
    expect(Math.abs(w!.day! - worst.end)).toBeLessThan(1);
    expect(w!.message).toMatch(/over 30 days, above the chronic criterion of .* at the pH of those days/);
  });

  it("with pH held still, the same tank is judged at that pH throughout", () => {
    // Control: the same settings with pH fixed at 8.2; the criterion is one number.
    const still = simulate(
      ScenarioSchema.parse({ ...SOFT_NEW_FILTER, water: { ...SOFT_NEW_FILTER.water, phFollowsKh: false } }),
    );
    const w = still.warnings.find((x) => x.code === "ammoniaAboveChronicCriterion");
    if (w && w.message.includes("30 days")) expect(rel(w.limit, epaChronic(8.2, 26))).toBeLessThan(0.005);
    else if (w) expect(rel(w.limit, 2.5 * epaChronic(8.2, 26))).toBeLessThan(0.005);
    expect(w, "fixed at pH 8.2 the same feeding crosses the line too").toBeDefined();
  });
});
