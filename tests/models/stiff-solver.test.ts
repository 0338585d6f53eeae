import { describe, expect, it } from "vitest";
import type { OdeProblem } from "../../models/core/problem";
import { integrateStiffSegment } from "../../models/core/rosenbrock";
import type { SegmentRequest } from "../../models/core/segment";
import { SolverChoice } from "../../models/core/solver-choice";
import { ScenarioSchema, simulate } from "../../models/index";
import { rel } from "./helpers";

// Published stiff reference problems (docs/sources.md §15): Hairer & Wanner, "Solving Ordinary
// Differential Equations II" (1996), and the Test Set for IVP Solvers (Mazzia & Magherini).

const robertson = (rtol: number): OdeProblem => ({
  dim: 3,
  names: ["y1", "y2", "y3"],
  rhs: (_t, y) => [
    -0.04 * y[0] + 1e4 * y[1] * y[2],
    0.04 * y[0] - 1e4 * y[1] * y[2] - 3e7 * y[1] * y[1],
    3e7 * y[1] * y[1],
  ],
  absoluteTolerance: [rtol * 1e-2, rtol * 1e-6, rtol * 1e-2],
  relativeTolerance: rtol,
});

const vanDerPol = (mu: number, tol: number): OdeProblem => ({
  dim: 2,
  names: ["x", "x'"],
  rhs: (_t, y) => [y[1], mu * (1 - y[0] * y[0]) * y[1] - y[0]],
  absoluteTolerance: [tol, tol],
  relativeTolerance: tol,
});

const request = (
  problem: OdeProblem,
  y0: number[],
  t1: number,
  over: Partial<SegmentRequest> = {},
): SegmentRequest => ({
  problem,
  t0: 0,
  y0,
  t1,
  sampleTimes: [],
  onSample: () => {},
  maxSteps: 1_000_000,
  deadline: Infinity,
  initialStepSize: 1e-6,
  ...over,
});

describe("RODAS4 on published stiff problems", () => {
  it("Robertson's kinetics at t = 40: 0.7158270687, 9.185534764e-6, 0.2841637457", () => {
    // Hairer & Wanner (1996) §IV.1 (docs/sources.md §15)
    const r = integrateStiffSegment(request(robertson(1e-8), [1, 0, 0], 40));
    expect(r.status).toBe("done");
    expect(Math.abs(r.y[0] - 0.7158270687)).toBeLessThan(1e-8);
    expect(Math.abs(r.y[1] - 9.185534764e-6)).toBeLessThan(1e-12);
    expect(Math.abs(r.y[2] - 0.2841637457)).toBeLessThan(1e-8);
    // the linear invariant y1 + y2 + y3 = 1 is kept to round-off
    expect(Math.abs(r.y[0] + r.y[1] + r.y[2] - 1)).toBeLessThan(1e-13);
  });

  it("Robertson's kinetics at t = 1e11 in a few thousand steps", () => {
    // Test Set for IVP Solvers, problem ROBER: 0.2083340149701255e-7, 0.8333360770334713e-13, 0.9999999791665050
    const r = integrateStiffSegment(request(robertson(1e-8), [1, 0, 0], 1e11));
    expect(r.status).toBe("done");
    expect(rel(r.y[0], 0.2083340149701255e-7)).toBeLessThan(1e-3);
    expect(rel(r.y[1], 0.8333360770334713e-13)).toBeLessThan(1e-3);
    expect(Math.abs(r.y[2] - 0.999999979166505)).toBeLessThan(1e-10);
    expect(r.steps).toBeLessThan(5000);
  });

  it("Van der Pol with μ = 1000 at t = 2000: 1.706167732170469, −8.928097010248125e-4", () => {
    // Test Set for IVP Solvers, problem VDPOL (Hairer & Wanner's stiff Van der Pol)
    const r = integrateStiffSegment(request(vanDerPol(1000, 1e-9), [2, 0], 2000));
    expect(r.status).toBe("done");
    expect(Math.abs(r.y[0] - 1.706167732170469)).toBeLessThan(1e-6);
    expect(Math.abs(r.y[1] + 8.928097010248125e-4)).toBeLessThan(1e-8);
  });

  it("samples on the way never overshoot between the ends of a step", () => {
    // our own check: y' = −1e4 (y − 1) from y = 0 rises monotonically to 1
    const stiff: OdeProblem = {
      dim: 1,
      names: ["y"],
      rhs: (_t, y) => [-1e4 * (y[0] - 1)],
      absoluteTolerance: [1e-8],
      relativeTolerance: 1e-6,
    };
    const samples: number[] = [];
    const times = Array.from({ length: 999 }, (_, i) => (i + 1) / 1000);
    integrateStiffSegment(request(stiff, [0], 1, { sampleTimes: times, onSample: (_t, y) => samples.push(y[0]) }));
    expect(samples).toHaveLength(999);
    for (let i = 1; i < samples.length; i++) expect(samples[i]).toBeGreaterThanOrEqual(samples[i - 1] - 1e-12);
    expect(Math.max(...samples)).toBeLessThanOrEqual(1 + 1e-9);
  });
});

describe("choosing the solver", () => {
  it("keeps odex for a non-stiff problem and switches when odex needs too many steps", () => {
    // our own check of the stiffness switch (model choice, docs/engine.md)
    const counters = { steps: 0, rhsEvals: 0, rejected: 0, stiffSegments: 0 };
    const gentle = new SolverChoice();
    const decay: OdeProblem = {
      dim: 1,
      names: ["y"],
      rhs: (_t, y) => [-0.5 * y[0]],
      absoluteTolerance: [1e-9],
      relativeTolerance: 1e-8,
    };
    expect(gentle.integrate(request(decay, [1], 10), counters).status).toBe("done");
    expect(gentle.isStiff).toBe(false);
    const stiff = new SolverChoice();
    const r = stiff.integrate(request(robertson(1e-6), [1, 0, 0], 1e5), counters);
    expect(r.status).toBe("done");
    expect(stiff.isStiff).toBe(true);
    expect(counters.stiffSegments).toBe(1);
    expect(rel(r.y[0], 0.01786592114210887)).toBeLessThan(1e-3); // Robertson at t = 1e5: 0.0178659 (computed with scipy Radau at rtol 1e-12, docs/sources.md §15)
  });

  it("the issue's stiff tanks finish, switch to RODAS4 and keep the nitrogen balance", () => {
    // our own check (issue 13's examples)
    const tanks = [
      { water: { volumeL: 1 }, maintenance: { dripLPerDay: 10000 } },
      {
        water: { volumeL: 1 },
        plants: [{ id: "f", growthForm: "floating", startMassG: 4000, maxMassG: 5000, growthRatePerDay: 0.2 }],
      },
      {
        water: { volumeL: 1, startTan: 5 },
        lowOxygen: {
          enabled: true,
          zoneSize: "fromCapacity",
          denitrificationCapacityMgNPerDay: 10000,
          anammoxEnabled: true,
          anammoxCapacityMgNPerDay: 10000,
        },
      },
    ] as const;
    for (const t of tanks) {
      const r = simulate(ScenarioSchema.parse(t));
      expect(r.stats.stiffSegments).toBeGreaterThan(0);
      expect(r.budget.imbalanceRelative).toBeLessThan(1e-9);
    }
    // and the usual tank never needs it
    expect(simulate(ScenarioSchema.parse({})).stats.stiffSegments).toBe(0);
  });
});
