import { afterEach, describe, expect, it } from "vitest";
import type { Scenario } from "../../models/index";
import { runEngineTask } from "~/features/jobs/engine-tasks.server";
import { clearJobs, startJob, type Job } from "~/features/jobs/jobs.server";
import { searchLever, type SearchLever } from "~/features/sweeps/search-levers.server";
import { targetSearchJob, type TargetResultJson } from "~/features/sweeps/target-finder.server";
import { findLeastChange, judge, type Goal } from "~/features/sweeps/target-search.server";
import { displayUnitsFor, DEFAULT_PREFERENCES } from "~/utils/display-units";
import { bareTank, feedForLoad } from "../models/helpers";

// The analytic case of docs/sources.md §10: V 100 L, constant load L = 20 mg N/day, no plants,
// an established filter, changes of fraction f every τ days with change water at C_in. Just
// before a change, at the periodic steady state: C⁻ = C_in + Lτ/(Vf).
const V = 100;
const L = 20;
const C_IN = 10;

function tank(over: { tapNitrate?: number; plants?: boolean } = {}): Scenario {
  return bareTank({
    fish: { feedGPerDay: feedForLoad(L), proteinFraction: 0.45 },
    maintenance: { waterChangeIntervalDays: 7, waterChangeFraction: 0.1, gravelCleaningFraction: 0 },
    tapWater: { nitrate: over.tapNitrate ?? C_IN, khDkh: 6 },
    run: { lengthDays: 400, outputIntervalDays: 1 },
  });
}

function evaluator(s: Scenario, lever: SearchLever, goal: Goal) {
  return async (value: number) => {
    const r = runEngineTask({ kind: "goal", scenario: s, changes: lever.changes(value), limits: {} });
    if (r.kind !== "goal") throw new Error("unexpected");
    return judge(value, r.figures, r.error, goal);
  };
}

async function finished<R>(job: Job<R>): Promise<Job<R>> {
  while (job.status === "running") await new Promise((r) => setTimeout(r, 5));
  return job;
}

afterEach(() => clearJobs());

describe("the target finder", () => {
  it("finds the water-change fraction of the periodic-change formula within 1 %", async () => {
    for (const X of [15.6, 13]) {
      const s = tank();
      const lever = searchLever("waterChangeFraction", s, { intervalDays: 7 }) as SearchLever;
      const found = await findLeastChange(lever, evaluator(s, lever, { nitrateMax: X, nh3Max: null }));
      expect(found.status).toBe("met");
      // Periodic water changes, docs/sources.md §10 (computed): f = Lτ / (V (X − C_in))
      const f = (L * 7) / (V * (X - C_IN));
      expect(Math.abs((found as { value: number }).value / f - 1), `goal ${X}`).toBeLessThan(0.01);
    }
  });

  it("finds the longest interval that keeps to the goal", async () => {
    const s = tank();
    const lever = searchLever("waterChangeInterval", s, { fraction: 0.25 }) as SearchLever;
    const found = await findLeastChange(lever, evaluator(s, lever, { nitrateMax: 15.7, nh3Max: null }));
    // docs/sources.md §10 (computed): τ ≤ (X − C_in)·V·f / L = 5.7 × 100 × 0.25 / 20 = 7.125 days → every 7 days
    expect(found).toMatchObject({ status: "met", value: 7 });
  });

  it("says plainly when tap water already carries more nitrate than the goal, and what would help", async () => {
    const units = displayUnitsFor({ ...DEFAULT_PREFERENCES, nitrateUnit: "N" });
    const job = startJob(
      targetSearchJob(
        { id: 1 },
        1,
        tank({ tapNitrate: 16 }),
        { nitrateMax: 15.6, nh3Max: "", lever: "waterChangeFraction", intervalDays: 7 },
        units,
      ),
    );
    const done = await finished(job);
    expect(done.status).toBe("done");
    const result = done.result as TargetResultJson;
    expect(result.status).toBe("infeasible");
    expect(result.headline).toMatch(
      /change water already carries 16 mg\/L NO3-N of nitrate, at or above your goal of 15.6/,
    );
    expect(result.save).toBeNull();
    const ro = result.alternatives.find((a) => a.id === "roShare")!;
    // With RO water the change water is below the goal again: C_in = 16 (1 − share) (our own worked example)
    expect(ro.works).toBe(true);
    expect(ro.text).toMatch(/reverse-osmosis water/);
    expect(result.alternatives.find((a) => a.id === "plantMass")!.text).toMatch(/no plants/);
    expect(done.done).toBe(done.total);
  });

  it("reports a goal already met without proposing a change to save", async () => {
    const s = tank();
    const job = startJob(
      targetSearchJob(
        { id: 2 },
        1,
        s,
        { nitrateMax: 100, nh3Max: "", lever: "feed" },
        displayUnitsFor({ ...DEFAULT_PREFERENCES, nitrateUnit: "N" }),
      ),
    );
    const result = (await finished(job)).result as TargetResultJson;
    expect(result.status).toBe("alreadyMet");
    expect(result.save).toBeNull();
  });

  it("runs one job per person at a time", () => {
    const never = () => new Promise<never>(() => {});
    startJob({ start: { user: { id: 3 }, kind: "sweep", label: "first", total: 1 }, work: never });
    expect(() =>
      startJob({ start: { user: { id: 3 }, kind: "target", label: "second", total: 1 }, work: never }),
    ).toThrow(/already have a sweep running \(first\)/);
    expect(() =>
      startJob({ start: { user: { id: 4 }, kind: "target", label: "someone else", total: 1 }, work: never }),
    ).not.toThrow();
  });
});

describe("reverse-osmosis water", () => {
  it("finds a share that meets both goals where all-RO water would starve the filter of KH", async () => {
    const weekly = tank({ tapNitrate: 16 });
    const s = { ...weekly, maintenance: { ...weekly.maintenance, waterChangeFraction: 0.5 } };
    const lever = searchLever("roShare", s) as SearchLever;
    // free NH3 0.02 mg/L as NH3 (common practice, no source) in mg N/L: × 0.82244 (docs/sources.md §0)
    const goal = { nitrateMax: 15.6, nh3Max: 0.02 * 0.82244 };
    const evaluate = evaluator(s, lever, goal);
    const all = await evaluate(1);
    expect(all.meets).toBe(false);
    expect(all.nh3!).toBeGreaterThan(goal.nh3Max);
    const found = await findLeastChange(lever, evaluate);
    expect(found.status).toBe("met");
    const share = (found as { value: number }).value;
    expect(share).toBeGreaterThan(0);
    expect(share).toBeLessThan(1);
    // docs/sources.md §10 (computed): C⁻ = C_in + Lτ/(Vf) ≤ 15.6 with C_in = 16 (1 − share), Lτ/(Vf) = 2.8 → share ≥ 0.2
    expect(share).toBeGreaterThan(0.19);
    expect(share).toBeLessThan(0.25);
  });
});
