import fc from "fast-check";
import { describe, expect, it } from "vitest";
import { ModelError, plannedEvents, plantGroupFromForm, simulate } from "../../models/index";
import type { SimulationResult, TankEventInput } from "../../models/index";
import { bareTank } from "./helpers";

/** Largest difference between two runs' series (every species, every sample). */
function largestDifference(a: SimulationResult, b: SimulationResult): number {
  expect(a.series.t).toEqual(b.series.t);
  let worst = 0;
  for (const key of ["tan", "no2", "no3", "kh", "o2", "aob", "nob", "organicWater", "organicFilter"] as const) {
    a.series[key].forEach((v, k) => (worst = Math.max(worst, Math.abs(v - b.series[key][k]))));
  }
  a.series.plants.forEach((p, i) =>
    p.massG.forEach((v, k) => (worst = Math.max(worst, Math.abs(v - b.series.plants[i].massG[k])))),
  );
  return worst;
}

describe("an explicit event schedule (a tank replayed as it happened)", () => {
  it("equals the scenario run when it holds exactly the scheduled events", () => {
    // model choice, no source: the replay and the periodic schedule must be the same arithmetic
    const s = bareTank({
      fish: { feedGPerDay: 0.6 },
      maintenance: { waterChangeIntervalDays: 7, waterChangeFraction: 0.3, gravelCleaningFraction: 0.25 },
      filter: { cleaningIntervalDays: 20 },
      tapWater: { nitrate: 1.5 },
      plants: [
        plantGroupFromForm("stem", {
          startMassG: 20,
          maxMassG: 60,
          trim: { rule: "everyDays", everyDays: 10, trimToFraction: 0.5, fullAtFraction: 0.9 },
        }),
      ],
      run: { lengthDays: 60, outputIntervalDays: 0.5 },
    });
    const events = plannedEvents(s, s.run.lengthDays);
    expect(events.some((e) => e.kind === "waterChange")).toBe(true);
    expect(events.some((e) => e.kind === "filterCleaning")).toBe(true);
    expect(events.some((e) => e.kind === "trim")).toBe(true);
    const periodic = simulate(s);
    const replay = simulate(s, { events });
    expect(largestDifference(periodic, replay)).toBeLessThanOrEqual(1e-9);
    expect(replay.events).toEqual(periodic.events);
    expect(Math.abs(replay.budget.imbalance - periodic.budget.imbalance)).toBeLessThan(1e-9);
  });

  it("equals the scenario run for any schedule of water changes and cleanings", () => {
    // model choice, no source (property over random intervals and shares)
    fc.assert(
      fc.property(
        fc.integer({ min: 2, max: 14 }),
        fc.double({ min: 0.05, max: 0.9, noNaN: true }),
        fc.integer({ min: 0, max: 20 }),
        fc.boolean(),
        (every, share, cleanEvery, tap) => {
          const s = bareTank({
            fish: { feedGPerDay: 0.5 },
            maintenance: { waterChangeIntervalDays: every, waterChangeFraction: share, gravelCleaningFraction: 0.2 },
            filter: { cleaningIntervalDays: cleanEvery, cleanedInTapWater: tap },
            tapWater: { nitrate: 2 },
            run: { lengthDays: 40 },
          });
          const a = simulate(s);
          const b = simulate(s, { events: plannedEvents(s, 40) });
          expect(largestDifference(a, b)).toBeLessThanOrEqual(1e-9);
        },
      ),
      { numRuns: 12 },
    );
  });

  it("follows the keeper's history instead of the timetable: a 50 % change halves nitrate on its day", () => {
    // Dilution: a share f replaced by nitrate-free water leaves (1 − f) of the nitrate — mass balance, no source needed beyond arithmetic
    const s = bareTank({
      water: { startNitrate: 10 },
      maintenance: { waterChangeIntervalDays: 7, waterChangeFraction: 0.3 },
    });
    const r = simulate(s, { events: [{ kind: "waterChange", day: 5.5, fraction: 0.5 }] });
    const at = r.series.t.flatMap((t, k) => (Math.abs(t - 5.5) < 1e-9 ? [k] : []));
    expect(at).toHaveLength(2);
    expect(r.series.no3[at[1]]).toBeCloseTo(r.series.no3[at[0]] * 0.5, 4);
    expect(r.events.filter((e) => e.kind === "waterChange")).toHaveLength(1);
    expect(r.budget.imbalanceRelative).toBeLessThan(1e-9);
  });

  it("tap nitrate measured on the day and an RO share change what the change water brings", () => {
    // mass balance: change water at 5 mg N/L with half RO brings 2.5 mg N/L × the share
    const s = bareTank({ water: { startNitrate: 0 } });
    const r = simulate(s, { events: [{ kind: "waterChange", day: 2, fraction: 0.4, tapNitrate: 5, roShare: 0.5 }] });
    const k = r.series.t.findLastIndex((t) => Math.abs(t - 2) < 1e-9);
    expect(r.series.no3[k]).toBeCloseTo(0.4 * 2.5, 4);
  });

  it("a feeding change from a date raises the nitrogen in, and the budget still closes", () => {
    // mass balance (docs/engine.md): inputs − outputs = change in stocks
    const s = bareTank({ fish: { feedGPerDay: 1 }, run: { lengthDays: 20 } });
    const flat = simulate(s);
    const more = simulate(s, { events: [{ kind: "feeding", day: 10, feedGPerDay: 2 }] });
    expect(more.budget.inputs.feed).toBeCloseTo(flat.budget.inputs.feed * 1.5, 6);
    expect(more.budget.imbalanceRelative).toBeLessThan(1e-6);
    expect(more.series.no3.at(-1)!).toBeGreaterThan(flat.series.no3.at(-1)!);
  });

  it("plants put in and taken out move their nitrogen, and the budget closes", () => {
    // mass balance (docs/engine.md)
    const g = plantGroupFromForm("floating", {
      startMassG: 5,
      maxMassG: 40,
      trim: { rule: "none", fullAtFraction: 0.9, trimToFraction: 0.6, everyDays: 14 },
    });
    const s = bareTank({ plants: [g], fish: { feedGPerDay: 0.5 } });
    const r = simulate(s, {
      events: [
        { kind: "plants", day: 3, groupId: g.id, changeG: 10 },
        { kind: "plants", day: 12, groupId: g.id, changeG: -4 },
        { kind: "gravelCleaning", day: 15, fraction: 0.5 },
      ],
    });
    expect(r.budget.inputs.plantsAdded).toBeGreaterThan(0);
    expect(r.budget.outputs.trims).toBeGreaterThan(0);
    expect(r.budget.outputs.gravelCleaning).toBeGreaterThan(0);
    expect(r.budget.imbalanceRelative).toBeLessThan(1e-6);
  });

  it("refuses an event list it cannot use, with the typed error", () => {
    const s = bareTank();
    const bad = [{ kind: "waterChange", day: 1, fraction: 2 }] as unknown as TankEventInput[];
    expect(() => simulate(s, { events: bad })).toThrow(ModelError);
    expect(() => simulate(s, { events: [{ kind: "plants", day: 1, groupId: "nope", changeG: 1 }] })).toThrow(
      /plant group/,
    );
  });
});
