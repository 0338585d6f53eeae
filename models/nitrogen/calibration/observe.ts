/**
 * What the model says at the readings' times: one engine run, read the way the results chart
 * reads it (linear between chart points; on an event's day the value just before the event,
 * since a keeper tests before changing water), plus what calibration needs besides: the days
 * the "when full" groups were trimmed (to pin them, see SimulateOptions.pinnedTrimDays) and a
 * daily grid of the three species (to say which reading would help).
 */
import type { Scenario } from "../scenario";
import type { SimulateOptions } from "../simulate";
import { simulate } from "../simulate";

/** Model values (mg N/L) in the requested days' order. */
export type ModelSamples = { tan: number[]; no2: number[]; no3: number[] };

export type Observed = {
  /** At the requested days. */
  samples: ModelSamples;
  /** Per plant group: the days it was trimmed because it was full (empty for other rules). */
  trimDays: number[][];
  /** At whole days 0, 1, … up to the last requested day. */
  grid: ModelSamples & { t: number[] };
};

/** Before an event at exactly `day`, else linear between the samples around it. */
function valueBefore(t: readonly number[], y: readonly number[], day: number): number {
  let lo = 0;
  let hi = t.length;
  while (lo < hi) {
    const mid = (lo + hi) >>> 1;
    if (t[mid] < day) lo = mid + 1;
    else hi = mid;
  }
  if (lo >= t.length) return y[t.length - 1];
  if (t[lo] === day || lo === 0) return y[lo];
  const w = (day - t[lo - 1]) / (t[lo] - t[lo - 1]);
  return y[lo - 1] + w * (y[lo] - y[lo - 1]);
}

/**
 * Runs `scenario` only as far as the readings need (two chart points past the last one, so
 * every reading sits between the same chart points as in the full run) and reads it.
 *
 * @param days Reading days (days from the run's start), within the run.
 * @throws ModelError as simulate() does.
 */
export function observe(
  scenario: Scenario,
  days: readonly number[],
  options: SimulateOptions & { pinnedTrimDays?: SimulateOptions["pinnedTrimDays"] } = {},
): Observed {
  const dt = options.outputIntervalDays ?? scenario.run.outputIntervalDays;
  const last = days.length ? Math.max(...days) : 0;
  const lengthDays = Math.min(scenario.run.lengthDays, Math.max(1, (Math.floor(last / dt) + 2) * dt));
  const s: Scenario = { ...scenario, run: { ...scenario.run, lengthDays } };
  const r = simulate(s, options);
  const { t } = r.series;
  const at = (y: readonly number[], when: readonly number[]) => when.map((d) => valueBefore(t, y, d));
  const gridT = Array.from({ length: Math.floor(Math.min(last, lengthDays)) + 1 }, (_v, i) => i);
  const trimDays = s.plants.map((g, i) => {
    if (g.trim.rule !== "whenFull") return [];
    const mass = r.series.plants[i].massG;
    const out: number[] = [];
    for (let k = 0; k + 1 < t.length; k++) if (t[k + 1] === t[k] && mass[k + 1] < mass[k] - 1e-9) out.push(t[k]);
    return out;
  });
  return {
    samples: { tan: at(r.series.tan, days), no2: at(r.series.no2, days), no3: at(r.series.no3, days) },
    trimDays,
    grid: { t: gridT, tan: at(r.series.tan, gridT), no2: at(r.series.no2, gridT), no3: at(r.series.no3, gridT) },
  };
}
