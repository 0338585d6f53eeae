import { describe, expect, it } from "vitest";
import { ModelError, ScenarioSchema, simulate } from "../../models/index";
import type { Scenario } from "../../models/index";
import { bareTank } from "./helpers";

// Our own checks of the failure contract: a typed error with a keeper's message, never NaN,
// never a hang.

function thrown(fn: () => unknown): ModelError {
  try {
    fn();
  } catch (e) {
    expect(e).toBeInstanceOf(ModelError);
    return e as ModelError;
  }
  throw new Error("expected a ModelError");
}

describe("ModelError", () => {
  it("INVALID for a scenario that breaks the schema (NaN volume), with the field named", () => {
    const s = { ...bareTank(), water: { ...bareTank().water, volumeL: Number.NaN } } as Scenario;
    const e = thrown(() => simulate(s));
    expect(e.code).toBe("INVALID");
    expect(e.message).toMatch(/water\.volumeL/);
  });

  it("INVALID for a chart spacing outside one hour to a week", () => {
    expect(thrown(() => simulate(bareTank(), { outputIntervalDays: 0.001 })).code).toBe("INVALID");
  });

  it("MAX_STEPS when the step budget is too small, with an actionable message and the day", () => {
    const e = thrown(() => simulate(bareTank({ fish: { feedGPerDay: 1 }, run: { lengthDays: 60 } }), { maxSteps: 5 }));
    expect(e.code).toBe("MAX_STEPS");
    expect(e.message).toMatch(/could not settle/);
    expect(e.message).toMatch(/Check /);
    expect(e.day).not.toBeNull();
  });

  it("WALL_TIME when the wall-clock bound is hit", () => {
    const s = ScenarioSchema.parse({
      fish: { pulsedFeeding: true, feedsPerDay: 12 },
      run: { lengthDays: 730, outputIntervalDays: 1 / 24 },
    });
    const e = thrown(() => simulate(s, { maxWallMs: 1 }));
    expect(e.code).toBe("WALL_TIME");
    expect(e.message).toMatch(/ran out of time/);
  });

  it("MAX_STEPS, not a hang, when a stiff tiny tank gets too small a step budget, naming the culprit", () => {
    const s = ScenarioSchema.parse({
      water: { volumeL: 1, startTan: 5 },
      plants: [{ id: "p", startMassG: 2500, maxMassG: 5000, growthRatePerDay: 1 }],
      lowOxygen: {
        enabled: true,
        zoneSize: "fromCapacity",
        denitrificationCapacityMgNPerDay: 10000,
        anammoxEnabled: true,
        anammoxCapacityMgNPerDay: 10000,
      },
      multipliers: { plantUptake: 10 },
      run: { lengthDays: 60 },
    });
    const started = performance.now();
    const e = thrown(() => simulate(s, { maxSteps: 300 }));
    expect(e.code).toBe("MAX_STEPS");
    expect(e.message).toMatch(/plants|low-oxygen/);
    expect(performance.now() - started).toBeLessThan(3000);
  });
});
