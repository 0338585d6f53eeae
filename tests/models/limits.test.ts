import fc from "fast-check";
import { describe, expect, it } from "vitest";
import {
  ModelError,
  ScenarioSchema,
  listScenarioFields,
  simulate,
  type ScenarioInput,
  type SimulationResult,
} from "../../models/index";
import { REQUEST_RUN_LIMITS } from "~/features/runs/simulation.server";

// Our own check of the engine's contract under the bounds the web app runs it with
// (REQUEST_RUN_LIMITS: 3 s of wall time, 300 000 solver steps): every scenario the schema
// accepts either finishes with finite, non-negative output or ends with the typed ModelError —
// within the wall bound plus a small margin for the last step and the result assembly.
const WALL_BOUND_MS = REQUEST_RUN_LIMITS.maxWallMs + 750;

function runWithinBound(input: ScenarioInput): {
  result?: SimulationResult & { rawSeries: { names: string[]; rows: number[][] } };
  error?: ModelError;
  ms: number;
} {
  const scenario = ScenarioSchema.parse(input);
  const t0 = performance.now();
  try {
    const result = simulate(scenario, { ...REQUEST_RUN_LIMITS, rawSeries: true });
    return { result, ms: performance.now() - t0 };
  } catch (error) {
    if (!(error instanceof ModelError)) throw error;
    return { error, ms: performance.now() - t0 };
  }
}

function expectSane({ result, error, ms }: ReturnType<typeof runWithinBound>) {
  expect(ms).toBeLessThan(WALL_BOUND_MS);
  if (error) {
    // The stiff solver takes over where odex would need too many steps: no valid scenario may
    // end in MAX_STEPS. Only the wall-clock bound may stop a (very long, very detailed) run.
    expect(error.code, error.message).toBe("WALL_TIME");
    expect(error.message.length).toBeGreaterThan(20);
    return;
  }
  // Raw, unclamped samples (the chart's series are clamped at zero for display): nothing below
  // zero beyond solver noise, relative to the largest value of that quantity in the run.
  const { names, rows } = result!.rawSeries;
  names.forEach((name, i) => {
    if (name === "pH (unclamped)") return;
    const column = rows.map((row) => row[i]);
    for (const v of column) expect(Number.isFinite(v), name).toBe(true);
    const largest = Math.max(1, ...column.map(Math.abs));
    expect(Math.min(...column), name).toBeGreaterThan(-1e-5 * largest);
  });
  expect(Number.isFinite(result!.keyFigures.nitrateEnd)).toBe(true);
}

describe("engine limits", () => {
  it("refuses an interval below a day instead of scheduling millions of events", () => {
    // Found by the property below: 1e-300 days between water changes exhausted the heap.
    expect(ScenarioSchema.safeParse({ maintenance: { waterChangeIntervalDays: 1e-300 } }).success).toBe(false);
    expect(ScenarioSchema.safeParse({ filter: { cleaningIntervalDays: 0.5 } }).success).toBe(false);
    expect(ScenarioSchema.safeParse({ maintenance: { waterChangeIntervalDays: 0 } }).success).toBe(true);
  });

  it.each<[string, ScenarioInput]>([
    // Emerson et al. 1975: at pH 9.5 and 32 °C about two thirds of TAN is free NH3.
    ["pH 9.5 at 32 °C", { water: { pH: 9.5, temperatureC: 32 }, fish: { feedGPerDay: 2 }, run: { lengthDays: 120 } }],
    ["a 1 L tank fed 1000 g a day", { water: { volumeL: 1 }, fish: { feedGPerDay: 1000 }, run: { lengthDays: 60 } }],
    // The stiff scenarios that used to stop with "too many steps" (issue 13).
    ["a 10,000 L/day drip into 1 L", { water: { volumeL: 1 }, maintenance: { dripLPerDay: 10000 } }],
    [
      "4,000 g of floating plants in 1 L",
      {
        water: { volumeL: 1 },
        plants: [{ id: "f", growthForm: "floating", startMassG: 4000, maxMassG: 5000, growthRatePerDay: 0.2 }],
      },
    ],
    [
      "strong denitrification and anammox in 1 L",
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
    ],
    [
      "no bacteria to speak of",
      {
        filter: { capacityMgTanPerDay: 1, establishedAtStart: false },
        multipliers: { nitrifierCapacity: 0.1 },
        fish: { feedGPerDay: 5 },
        run: { lengthDays: 120 },
      },
    ],
    [
      "everything at its most, two years at hourly output",
      {
        water: {
          volumeL: 10000,
          temperatureC: 40,
          pH: 10,
          khDkh: 30,
          startTan: 50,
          startNitrite: 50,
          startNitrate: 200,
        },
        fish: { feedGPerDay: 1000, proteinFraction: 0.8, feedsPerDay: 12, pulsedFeeding: true },
        filter: { capacityMgTanPerDay: 100000, cleaningIntervalDays: 1 },
        lowOxygen: {
          enabled: true,
          denitrificationCapacityMgNPerDay: 10000,
          anammoxEnabled: true,
          anammoxCapacityMgNPerDay: 10000,
        },
        multipliers: { feedLoad: 10, plantUptake: 10, nitrifierCapacity: 10 },
        run: { lengthDays: 730, outputIntervalDays: 1 / 24 },
      },
    ],
    [
      "cold, acid and empty",
      {
        water: { temperatureC: 0, pH: 4, khDkh: 0 },
        fish: { feedGPerDay: 0 },
        plants: [],
        maintenance: { waterChangeIntervalDays: 0 },
        run: { lengthDays: 730 },
      },
    ],
  ])(
    "%s: finishes within the bound or says why not",
    (_name, input) => {
      expectSane(runWithinBound(input));
    },
    60_000,
  );

  it("searches the schema's extremes and finds no scenario the solver gives up on", () => {
    // Every numeric setting at its minimum, its maximum or its default, from the schema's own
    // field list (so new settings are searched too); switches and choices at random.
    const fields = listScenarioFields().filter(
      (f) => f.path[0] !== "plants" && f.path[0] !== "schemaVersion" && f.path[0] !== "targets",
    );
    const plantFields = listScenarioFields().filter((f) => f.path[0] === "plants" && f.key !== "plants.*.id");
    const pick = (f: (typeof fields)[number]) =>
      f.kind === "number" || f.kind === "integer"
        ? fc.constantFrom(f.min!, f.max!, f.defaultValue as number)
        : f.kind === "boolean"
          ? fc.boolean()
          : f.kind === "enum"
            ? fc.constantFrom(...f.options!)
            : fc.constant(f.defaultValue);
    const setAt = (obj: Record<string, unknown>, path: readonly string[], v: unknown) => {
      let node = obj;
      for (const k of path.slice(0, -1)) node = (node[k] ??= {}) as Record<string, unknown>;
      node[path[path.length - 1]] = v;
    };
    const corner = fc.tuple(
      fc.tuple(...fields.map(pick)),
      fc.array(fc.tuple(...plantFields.map(pick)), { maxLength: 2 }),
    );
    let runs = 0;
    fc.assert(
      fc.property(corner, ([values, groups]) => {
        const input: Record<string, unknown> = {};
        fields.forEach((f, i) => setAt(input, f.path as string[], values[i]));
        input.plants = groups.map((g, gi) => {
          const out: Record<string, unknown> = {};
          plantFields.forEach((f, i) => setAt(out, f.path.slice(2) as string[], g[i]));
          out.id = `g${gi}`;
          out.startMassG = Math.min(out.startMassG as number, out.maxMassG as number);
          const trim = out.trim as { rule: string; trimToFraction: number; fullAtFraction: number };
          if (trim.rule === "whenFull" && trim.trimToFraction >= trim.fullAtFraction) trim.rule = "everyDays";
          return out;
        });
        const water = input.water as Record<string, unknown>;
        if ((water.khDkh as number) <= 0) water.phFollowsKh = false;
        const parsed = ScenarioSchema.safeParse(input);
        if (!parsed.success) return; // a cross-field rule the corners broke; other corners cover the rest
        runs++;
        expectSane(runWithinBound(parsed.data));
      }),
      { numRuns: 30, seed: 20261213 },
    );
    expect(runs).toBeGreaterThan(18);
  }, 300_000);

  const anywhere = (min: number, max: number) => fc.double({ min, max, noNaN: true, noDefaultInfinity: true });
  it("holds for random scenarios across the whole range the schema accepts", () => {
    fc.assert(
      fc.property(
        fc.record({
          water: fc.record({
            volumeL: anywhere(1, 10000),
            temperatureC: anywhere(0, 40),
            pH: anywhere(4, 10),
            khDkh: anywhere(0, 30),
            startTan: anywhere(0, 50),
          }),
          fish: fc.record({
            feedGPerDay: anywhere(0, 1000),
            proteinFraction: anywhere(0, 0.8),
            fractionEaten: anywhere(0, 1),
          }),
          filter: fc.record({ capacityMgTanPerDay: anywhere(1, 100000), establishedAtStart: fc.boolean() }),
          maintenance: fc.record({
            waterChangeIntervalDays: fc.oneof(fc.constant(0), anywhere(1, 365)),
            waterChangeFraction: anywhere(0, 0.95),
          }),
          multipliers: fc.record({
            feedLoad: anywhere(0.1, 10),
            plantUptake: anywhere(0.1, 10),
            nitrifierCapacity: anywhere(0.1, 10),
          }),
          run: fc.record({ lengthDays: anywhere(1, 730), outputIntervalDays: fc.constantFrom(1 / 24, 0.25, 1, 7) }),
        }),
        (input) => expectSane(runWithinBound(input as ScenarioInput)),
      ),
      { numRuns: 12, seed: 20261202 },
    );
  }, 120_000);
});
