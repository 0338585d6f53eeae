import { describe, expect, it } from "vitest";
import { ScenarioSchema, ammoniaCriteria, getPreset, simulate } from "../../models/index";
import { bareTank, rel } from "./helpers";

describe("US EPA (2013) ammonia criteria", () => {
  it("match the document's headline values at pH 7 and 20 °C: acute 17, chronic 1.9 mg TAN/L", () => {
    // US EPA 2013, EPA 822-R-13-001 (docs/sources.md §2); the document rounds to two figures
    const c = ammoniaCriteria(7, 20);
    expect(rel(c.acuteTanMgNPerL, 17)).toBeLessThan(0.03);
    expect(rel(c.chronicTanMgNPerL, 1.9)).toBeLessThan(0.03);
  });

  it("give 0.56 mg TAN/L chronic at pH 8 and 25 °C", () => {
    // US EPA 2013 chronic table value (docs/sources.md §2)
    expect(rel(ammoniaCriteria(8, 25).chronicTanMgNPerL, 0.563)).toBeLessThan(0.01);
  });

  it("fall with pH and temperature, with the document's plateaus", () => {
    // US EPA 2013: acute capped at 51.93 × the pH term below about 10 °C; chronic flat below 7 °C
    expect(ammoniaCriteria(8, 20).acuteTanMgNPerL).toBeLessThan(ammoniaCriteria(7, 20).acuteTanMgNPerL);
    expect(ammoniaCriteria(7, 28).chronicTanMgNPerL).toBeLessThan(ammoniaCriteria(7, 20).chronicTanMgNPerL);
    expect(ammoniaCriteria(7, 2).chronicTanMgNPerL).toBeCloseTo(ammoniaCriteria(7, 7).chronicTanMgNPerL, 12);
    expect(ammoniaCriteria(7, 0).acuteTanMgNPerL).toBeCloseTo(ammoniaCriteria(7, 5).acuteTanMgNPerL, 12);
  });
});

describe("plausibility warnings", () => {
  it("1,000 g of food a day in 1 L runs, but is flagged as beyond any tank", () => {
    // our own check of the example: a plausibility warning, not an error
    const r = simulate(
      ScenarioSchema.parse({ water: { volumeL: 1 }, fish: { feedGPerDay: 1000 }, run: { lengthDays: 30 } }),
    );
    const codes = r.warnings.map((w) => w.code);
    expect(codes).toEqual(expect.arrayContaining(["feedBeyondOxygenSupply", "heavyFeedingForVolume"]));
    for (const w of r.warnings) {
      expect(w.message.length).toBeGreaterThan(20);
      expect(Number.isFinite(w.value)).toBe(true);
    }
  });

  it("a logged feeding change to far more food is flagged from its day, as the scenario's own feeding would be", () => {
    // 0.03 g of food per litre a day as the heavy-feeding line (common practice, no source): 100 L
    // fed 0.5 g a day is well under it; a change on day 10 to 500 g a day is far over it, and
    // beyond any oxygen the surface brings in (our own worked example).
    const scenario = ScenarioSchema.parse({
      water: { volumeL: 100 },
      fish: { feedGPerDay: 0.5 },
      run: { lengthDays: 30 },
    });
    expect(simulate(scenario).warnings.map((w) => w.code)).not.toContain("heavyFeedingForVolume");
    const fedMore = simulate(scenario, { events: [{ kind: "feeding", day: 10, feedGPerDay: 500 }] });
    const heavy = fedMore.warnings.find((w) => w.code === "heavyFeedingForVolume");
    expect(heavy).toMatchObject({ value: 5, day: 10 });
    expect(heavy!.message).toMatch(/^From day 10, when the feeding was changed, 5 g of food per litre a day/);
    expect(fedMore.warnings.find((w) => w.code === "feedBeyondOxygenSupply")?.day).toBe(10);
    // A change to less food than the scenario's leaves the scenario's own feeding judged, undated.
    const heavyScenario = ScenarioSchema.parse({
      water: { volumeL: 10 },
      fish: { feedGPerDay: 1 },
      run: { lengthDays: 30 },
    });
    const fedLess = simulate(heavyScenario, { events: [{ kind: "feeding", day: 5, feedGPerDay: 0.1 }] });
    expect(fedLess.warnings.find((w) => w.code === "heavyFeedingForVolume")).toMatchObject({ value: 0.1, day: null });
  });

  it("the default tank has none", () => {
    expect(simulate(ScenarioSchema.parse({})).warnings).toEqual([]);
  });

  it("an overloaded filter raises the ammonia cautions with the day", () => {
    // US EPA 2013 criteria as cautions (docs/sources.md §2)
    const r = simulate(
      bareTank({
        water: { pH: 8 },
        fish: { feedGPerDay: 5 },
        filter: { establishedAtStart: false },
        run: { lengthDays: 40 },
      }),
    );
    const acute = r.warnings.find((w) => w.code === "ammoniaAboveAcuteCriterion");
    expect(acute).toBeDefined();
    expect(acute!.value).toBeGreaterThan(acute!.limit);
    expect(acute!.day).toBeGreaterThan(0);
    expect(r.warnings.some((w) => w.code === "ammoniaAboveChronicCriterion")).toBe(true);
    expect(acute!.message).toMatch(/change some of it now/);
  });

  it("a tank cycled without fish is told to wait for fish, not to change water", () => {
    // our own wording (common practice, no source: fish go in once ammonia and nitrite read zero)
    const r = simulate(ScenarioSchema.parse(getPreset("first-light-fishless")!.scenario));
    const acute = r.warnings.find((w) => w.code === "ammoniaAboveAcuteCriterion");
    expect(acute?.message).toMatch(/Add fish only once the tank has cycled/);
  });
});
