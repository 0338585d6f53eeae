/**
 * Labels and hints (issue 12, item 12): hints speak the person's units, shares are hinted the way
 * they are entered (per cent), and the page-word checks the end-to-end crawl uses catch what they
 * should. Conversions: docs/sources.md §0 (nitrate = nitrate-N × 62.004/14.007).
 */
import { describe, expect, it } from "vitest";
import { listScenarioFields } from "~models";
import { nitrateBandHint } from "~/features/tanks/nitrate-targets";
import { displayUnitsFor, DEFAULT_PREFERENCES, unitLabels } from "~/utils/display-units";
import { speciesFactor } from "~models/units";
import { doubledLabels, internalNames, titleProblems } from "../support/label-checks";

describe("hints follow the person's units", () => {
  it("the nitrate target hint is 5–20 mg/L NO3 for NO3 readers and about 1.1–4.5 mg/L NO3-N for N readers", () => {
    const asIon = displayUnitsFor(DEFAULT_PREFERENCES);
    const asN = displayUnitsFor({ ...DEFAULT_PREFERENCES, nitrateUnit: "N" });
    expect(nitrateBandHint(speciesFactor("nitrate", asIon), unitLabels(asIon).nitrate)).toContain("5–20 mg/L NO3 ");
    // 5 mg/L NO3 × 14.007/62.004 = 1.13 mg/L NO3-N; 20 → 4.52 (common practice band, converted).
    const hint = nitrateBandHint(speciesFactor("nitrate", asN), unitLabels(asN).nitrate);
    expect(hint).toContain("1.1–4.5 mg/L NO3-N");
    expect(hint).not.toMatch(/\bNO3\b(?!-N)/);
  });
});

describe("shares are entered and hinted one way", () => {
  // The form shows every fraction field as a percentage (unitLabel gives "%"), so its hint must
  // not give examples as fractions of one ("0.02–0.04", "e.g. 0.25").
  const fractions = listScenarioFields().filter((f) => f.meta.quantity === "fraction");
  it("there are share fields, the plants' nitrogen content among them", () => {
    expect(fractions.some((f) => f.key.endsWith("nitrogenContent"))).toBe(true);
  });
  it.each(fractions.map((f) => [f.key, f.meta.hint]))("%s: no fraction of one in its hint", (_key, hint) => {
    expect(hint).not.toMatch(/(^|[^\d.])0\.\d/);
  });
  it("the nitrogen content hint gives its typical range in per cent", () => {
    const n = fractions.find((f) => f.key.endsWith("nitrogenContent"))!;
    expect(n.meta.hint).toMatch(/\d+–\d+ %/);
  });
});

describe("the page-word checks", () => {
  it("catch a label said twice, with or without an ending", () => {
    expect(doubledLabels("In the tank: In the tank 12 mg N")).toHaveLength(1);
    expect(doubledLabels("Ammonia dose: Ammonia dosed: +1.5 mg N/L")).toHaveLength(1);
    expect(doubledLabels("Nitrate: Nitrate (NO3) 12")).toHaveLength(1);
  });
  it("let plain sentences through", () => {
    expect(doubledLabels("Ammonia dose: +1.5 mg N/L (90 mg N)")).toEqual([]);
    expect(doubledLabels("This is a model, not a water test: test your water before acting on it.")).toEqual([]);
    expect(doubledLabels("In the tank: TAN 0.1, nitrite 0.2")).toEqual([]);
  });
  it("find internal field names", () => {
    expect(internalNames("Readings, sorted by takenAt (descending)")).toEqual(["takenAt"]);
    expect(internalNames("Readings, sorted by date and time (descending)")).toEqual([]);
  });
  it("find doubled punctuation in titles", () => {
    expect(titleProblems("Tank — — Fernwater")).not.toEqual([]);
    expect(titleProblems("Results.. · Fernwater")).not.toEqual([]);
    expect(titleProblems("Lesson: — · Fernwater")).not.toEqual([]);
    expect(titleProblems("Sweep ·  · Fernwater")).not.toEqual([]);
    expect(titleProblems("Journal · Home tank · Fernwater")).toEqual([]);
    expect(titleProblems("Saving…  · Fernwater")).not.toEqual([]);
  });
});
