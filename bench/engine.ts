/**
 * Engine benchmark (issues #3 and #13). Run alone with `npx tsx bench/engine.ts`, or all
 * benches with `npm run bench`. Prints, for a default one-year scenario (with oxygen) with weekly
 * water changes, monthly filter cleanings and two plant groups: median wall ms over 30 runs,
 * solver steps and RHS evaluations; total ms of a 50-point plant-mass sweep; JSON size of one
 * year at hourly output; and the median of each stiff scenario of issue 13 (180 days).
 * Targets (2-core machine): median ≤ 15 ms, sweep ≤ 1.0 s, hourly-year JSON ≤ 2 MB, each stiff
 * scenario ≤ 200 ms.
 */
import process from "node:process";
import { ScenarioSchema, plantGroupFromForm, simulate, sweep } from "../models/index";
import type { Scenario } from "../models/index";

export const BENCH_SCENARIO: Scenario = ScenarioSchema.parse({
  plants: [
    plantGroupFromForm("stem", { id: "stems", name: "Stem plants" }),
    plantGroupFromForm("floating", { id: "floaters", name: "Floating plants" }),
  ],
  maintenance: { waterChangeIntervalDays: 7, waterChangeFraction: 0.25 },
  filter: { cleaningIntervalDays: 30 },
  run: { lengthDays: 365, outputIntervalDays: 1 },
});

/** The tanks odex alone could not finish (issue 13): RODAS4 takes over. */
export const STIFF_SCENARIOS: Record<string, Scenario> = {
  "10,000 L/day drip into 1 L": ScenarioSchema.parse({ water: { volumeL: 1 }, maintenance: { dripLPerDay: 10000 } }),
  "4,000 g of floating plants in 1 L": ScenarioSchema.parse({
    water: { volumeL: 1 },
    plants: [plantGroupFromForm("floating", { startMassG: 4000, maxMassG: 5000 })],
  }),
  "denitrification and anammox in 1 L": ScenarioSchema.parse({
    water: { volumeL: 1, startTan: 5 },
    lowOxygen: {
      enabled: true,
      zoneSize: "fromCapacity",
      denitrificationCapacityMgNPerDay: 10000,
      anammoxEnabled: true,
      anammoxCapacityMgNPerDay: 10000,
    },
  }),
};

const TARGETS = { medianMs: 15, sweepMs: 1000, hourlyJsonBytes: 2 * 1024 * 1024, stiffMs: 200 };

export interface EngineBenchReport {
  medianMs: number;
  minMs: number;
  runs: number;
  steps: number;
  rhsEvals: number;
  segments: number;
  sweepPoints: number;
  sweepMs: number;
  hourlyJsonBytes: number;
  hourlySamples: number;
  hourlyRunMs: number;
  stiff: { name: string; medianMs: number; steps: number; rhsEvals: number }[];
  metTargets: boolean;
}

const median = (xs: number[]) => {
  const s = [...xs].sort((a, b) => a - b);
  const m = s.length >> 1;
  return s.length % 2 ? s[m] : (s[m - 1] + s[m]) / 2;
};

export function run(): EngineBenchReport {
  // Warm up the JIT so the median reflects steady-state speed.
  for (let i = 0; i < 5; i++) simulate(BENCH_SCENARIO);
  const times: number[] = [];
  let last = simulate(BENCH_SCENARIO);
  for (let i = 0; i < 30; i++) {
    const t0 = performance.now();
    last = simulate(BENCH_SCENARIO);
    times.push(performance.now() - t0);
  }

  const values = Array.from({ length: 50 }, (_, i) => (60 * i) / 49); // stem start mass 0–60 g dry
  const s0 = performance.now();
  const points = sweep(BENCH_SCENARIO, ["plants", 0, "startMassG"], values, { outcomes: ["nitrateEnd"] });
  const sweepMs = performance.now() - s0;
  const failed = points.filter((p) => p.error).length;

  const h0 = performance.now();
  const hourly = simulate(BENCH_SCENARIO, { outputIntervalDays: 1 / 24 });
  const hourlyRunMs = performance.now() - h0;
  const hourlyJsonBytes = Buffer.byteLength(JSON.stringify(hourly), "utf8");

  const stiff = Object.entries(STIFF_SCENARIOS).map(([name, scenario]) => {
    simulate(scenario);
    const ms: number[] = [];
    let r = simulate(scenario);
    for (let i = 0; i < 7; i++) {
      const t0 = performance.now();
      r = simulate(scenario);
      ms.push(performance.now() - t0);
    }
    return { name, medianMs: median(ms), steps: r.stats.steps, rhsEvals: r.stats.rhsEvals };
  });

  const report: EngineBenchReport = {
    medianMs: median(times),
    minMs: Math.min(...times),
    runs: times.length,
    steps: last.stats.steps,
    rhsEvals: last.stats.rhsEvals,
    segments: last.stats.segments,
    sweepPoints: points.length,
    sweepMs,
    hourlyJsonBytes,
    hourlySamples: hourly.series.t.length,
    hourlyRunMs,
    stiff,
    metTargets: false,
  };
  report.metTargets =
    report.medianMs <= TARGETS.medianMs &&
    sweepMs <= TARGETS.sweepMs &&
    hourlyJsonBytes <= TARGETS.hourlyJsonBytes &&
    stiff.every((x) => x.medianMs <= TARGETS.stiffMs) &&
    failed === 0;

  const ok = (v: boolean) => (v ? "ok" : "MISSED");
  const lines = [
    "engine: one year, weekly water changes, monthly filter cleaning, two plant groups",
    `  median wall time     ${report.medianMs.toFixed(2)} ms over ${report.runs} runs (min ${report.minMs.toFixed(2)} ms)  target ≤ ${TARGETS.medianMs} ms  ${ok(report.medianMs <= TARGETS.medianMs)}`,
    `  solver               ${report.steps} steps, ${report.rhsEvals} RHS evaluations, ${report.segments} segments`,
    `  plant-mass sweep     ${report.sweepPoints} points in ${sweepMs.toFixed(0)} ms${failed ? ` (${failed} failed)` : ""}  target ≤ ${TARGETS.sweepMs} ms  ${ok(sweepMs <= TARGETS.sweepMs && failed === 0)}`,
    `  hourly year as JSON  ${(hourlyJsonBytes / 1024 / 1024).toFixed(2)} MB, ${report.hourlySamples} samples, run ${hourlyRunMs.toFixed(1)} ms  target ≤ 2 MB  ${ok(hourlyJsonBytes <= TARGETS.hourlyJsonBytes)}`,
    ...stiff.map(
      (x) =>
        `  stiff: ${x.name.padEnd(36)} median ${x.medianMs.toFixed(1)} ms (${x.steps} steps, ${x.rhsEvals} RHS evaluations)  target ≤ ${TARGETS.stiffMs} ms  ${ok(x.medianMs <= TARGETS.stiffMs)}`,
    ),
  ];
  process.stdout.write(lines.join("\n") + "\n");
  return report;
}

if (process.argv[1] && /bench[\\/]engine\.ts$/.test(process.argv[1])) run();
