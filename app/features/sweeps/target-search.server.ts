/**
 * The target finder's search: the least change of one lever that meets a goal, by a scan and
 * then bisection over engine runs (one run per value, through `evaluate`). The search first runs
 * the least change, then scans towards the most the lever allows: if even that misses the goal,
 * no value of this lever can meet it.
 */
import type { GoalFigures } from "~/features/jobs/engine-tasks.server";
import type { SearchLever } from "~/features/sweeps/search-levers.server";

/** Goal in canonical units (mg N/L); null = no goal for that species. */
export type Goal = { nitrateMax: number | null; nh3Max: number | null };

export type Evaluation = {
  value: number;
  nitrate: number | null;
  nh3: number | null;
  meets: boolean;
  error: string | null;
};

export type SearchOutcome =
  | { status: "met"; value: number; at: Evaluation; alreadyMet: boolean; runs: number }
  | { status: "infeasible"; extreme: Evaluation; runs: number }
  | { status: "failed"; message: string; runs: number };

/**
 * Judges one run against the goal. The nitrate goal is judged on inorganic N (TAN + nitrite-N +
 * nitrate-N) just before the last water change — see GoalFigures — which in a working tank is
 * nitrate to within a few hundredths of a mg/L.
 */
export function judge(value: number, figures: GoalFigures | null, error: string | null, goal: Goal): Evaluation {
  if (error || !figures) return { value, nitrate: null, nh3: null, meets: false, error: error ?? "no result" };
  const nitrate = figures.inorganicNBeforeChange;
  const nh3 = figures.peakFreeNh3;
  const meets =
    (goal.nitrateMax === null || nitrate <= goal.nitrateMax) && (goal.nh3Max === null || nh3 <= goal.nh3Max);
  return { value, nitrate, nh3, meets, error: null };
}

/** Points of the first scan from the least change to the most (see findLeastChange). */
const SCAN_STEPS = 8;

/** Runs of a search at most: the scan, then halving the bracket it found. */
export function searchRuns(lever: SearchLever): number {
  const width =
    lever.scale === "log"
      ? Math.log(lever.hi / lever.lo) / Math.log(lever.tolerance)
      : (lever.hi - lever.lo) / lever.tolerance;
  return 1 + SCAN_STEPS + Math.ceil(Math.log2(Math.max(2, width / SCAN_STEPS)));
}

/**
 * The least change that meets the goal: the least change itself first, then a scan of
 * SCAN_STEPS points towards the most change, then bisection between the last point that
 * misses and the first that meets. The scan keeps the search right where only part of the
 * range works — much reverse-osmosis water lowers nitrate but takes the KH with it, and free
 * ammonia climbs once the filter stalls — and bisection does the rest. `evaluate` runs the
 * engine at a value of the lever.
 */
export async function findLeastChange(
  lever: SearchLever,
  evaluate: (value: number) => Promise<Evaluation>,
): Promise<SearchOutcome> {
  let runs = 0;
  const run = async (v: number) => {
    runs++;
    return evaluate(v);
  };
  const most = lever.moreChange === "up" ? lever.hi : lever.lo;
  const least = lever.moreChange === "up" ? lever.lo : lever.hi;
  const atLeast = await run(least);
  if (atLeast.error) return { status: "failed", message: atLeast.error, runs };
  if (atLeast.meets) return { status: "met", value: least, at: atLeast, alreadyMet: true, runs };
  const scanPoint = (k: number) => {
    const v =
      lever.scale === "log" ? least * (most / least) ** (k / SCAN_STEPS) : least + ((most - least) * k) / SCAN_STEPS;
    return lever.integer ? Math.round(v) : v;
  };
  // Invariant once found: `fails` misses the goal, `ok` meets it.
  let fails = least;
  let last = atLeast;
  let found: { value: number; at: Evaluation } | null = null;
  for (let k = 1; k <= SCAN_STEPS && !found; k++) {
    const v = scanPoint(k);
    if (v === fails) continue;
    const at = await run(v);
    if (at.error) return { status: "failed", message: at.error, runs };
    if (at.meets) found = { value: v, at };
    else {
      fails = v;
      last = at;
    }
  }
  if (!found) return { status: "infeasible", extreme: last, runs };
  let ok = found.value;
  let okAt = found.at;
  const narrow = () =>
    lever.scale === "log"
      ? Math.max(fails, ok) / Math.min(fails, ok) <= lever.tolerance
      : Math.abs(ok - fails) <= lever.tolerance;
  while (!narrow()) {
    let mid = lever.scale === "log" ? Math.sqrt(fails * ok) : (fails + ok) / 2;
    if (lever.integer) mid = lever.moreChange === "up" ? Math.ceil(mid) : Math.floor(mid);
    if (mid === fails || mid === ok) break;
    const at = await run(mid);
    if (at.error) return { status: "failed", message: at.error, runs };
    if (at.meets) {
      ok = mid;
      okAt = at;
    } else fails = mid;
  }
  return {
    status: "met",
    value: ok,
    at: okAt,
    alreadyMet: lever.current === ok || isAtLeast(lever, lever.current, ok),
    runs,
  };
}

/** Whether `current` is already at least as much change as `needed`. */
function isAtLeast(lever: SearchLever, current: number, needed: number): boolean {
  return lever.moreChange === "up" ? current >= needed : current <= needed;
}
