/**
 * The target finder: the smallest change of one setting that meets a keeper's goal (nitrate
 * just before a water change at most X, free ammonia never above Y), found by bisection over
 * engine runs, or a plain explanation of why no value can and what would.
 *
 * Bisection needs the goal to be met on one side of a single threshold. That holds for these
 * levers where the science says so: a larger water-change fraction, more frequent changes, more
 * reverse-osmosis water, less feed and more plants (start and maximum scaled together — see
 * app/features/sweeps/sweeps.server.ts) each lower nitrate (and ammonia) or leave it. The search first runs the
 * most change the lever allows: if that misses the goal, no value of this lever can meet it.
 */
import { z } from "zod";
import { setScenarioValue, type Scenario } from "~models";
import type { GoalFigures, SettingChange } from "~/features/jobs/engine-tasks.server";
import { speciesFactor } from "~/display-units.server";
import { startJob, type JobContext } from "~/features/jobs/jobs.server";
import { JOB_RUN_LIMITS, plantMassLever } from "~/features/sweeps/sweeps.server";
import { unitLabels, formatNumber, type DisplayUnits } from "~/utils/display-units";
import { TARGET_LEVER_LABELS, TARGET_LEVERS, type TargetLeverId } from "~/features/sweeps/target-levers";

export { TARGET_LEVER_LABELS, TARGET_LEVERS, type TargetLeverId };

/** Goal in canonical units (mg N/L); null = no goal for that species. */
export type Goal = { nitrateMax: number | null; nh3Max: number | null };

export type Evaluation = {
  value: number;
  nitrate: number | null;
  nh3: number | null;
  meets: boolean;
  error: string | null;
};

/** A lever as the search sees it (canonical units). */
export type SearchLever = {
  id: TargetLeverId;
  lo: number;
  hi: number;
  /** Which way is "more change": towards hi ("up") or towards lo ("down"). */
  moreChange: "up" | "down";
  integer: boolean;
  /** Bisection stops when the bracket is this narrow (a ratio for log-scaled levers). */
  tolerance: number;
  scale: "linear" | "log";
  current: number;
  changes(value: number): SettingChange[];
  /** The value in the person's units, and a sentence for it. */
  show(value: number): string;
  advice(value: number): string;
};

export type SearchOutcome =
  | { status: "met"; value: number; at: Evaluation; alreadyMet: boolean; runs: number }
  | { status: "infeasible"; extreme: Evaluation; runs: number }
  | { status: "failed"; message: string; runs: number };

const path = (...p: (string | number)[]) => p;
const everyDays = (n: number) => (n === 1 ? "every day" : `every ${formatNumber(n)} days`);
const pct = (f: number) => `${formatNumber(f * 100, 3)} %`;

const RO_KH_NOTE =
  "Reverse-osmosis water carries almost no KH: used on its own it lets KH fall until the filter stalls and ammonia climbs (remineralise it, or mix it with tap water).";

/** Nitrate entering with the change water, mg N/L (tap blended with RO). */
export function changeWaterNitrate(s: Scenario): number {
  return s.tapWater.nitrate * (1 - s.tapWater.roShare);
}

/**
 * The levers of a scenario. `intervalDays` fixes the interval for the fraction lever and
 * `fraction` the share for the interval lever (defaults: the scenario's, or weekly / 25 %).
 * Returns the lever, or a sentence saying why it does not apply.
 */
export function searchLever(
  id: TargetLeverId,
  scenario: Scenario,
  opts: { intervalDays?: number; fraction?: number } = {},
): SearchLever | { unavailable: string } {
  const m = scenario.maintenance;
  const interval = opts.intervalDays ?? (m.waterChangeIntervalDays > 0 ? m.waterChangeIntervalDays : 7);
  const fraction = opts.fraction ?? (m.waterChangeFraction > 0 ? m.waterChangeFraction : 0.25);
  switch (id) {
    case "waterChangeFraction":
      return {
        id,
        lo: 0,
        hi: 0.95,
        moreChange: "up",
        integer: false,
        tolerance: 1e-4,
        scale: "linear",
        current: m.waterChangeIntervalDays > 0 ? m.waterChangeFraction : 0,
        changes: (v) => [
          { path: path("maintenance", "waterChangeFraction"), value: v },
          { path: path("maintenance", "waterChangeIntervalDays"), value: interval },
        ],
        show: (v) => `${pct(v)} ${everyDays(interval)}`,
        advice: (v) => `Change ${pct(v)} of the water ${everyDays(interval)}.`,
      };
    case "waterChangeInterval": {
      const longest = Math.max(2, Math.min(60, Math.floor(scenario.run.lengthDays / 3)));
      return {
        id,
        lo: 1,
        hi: longest,
        moreChange: "down",
        integer: true,
        tolerance: 1,
        scale: "linear",
        current: m.waterChangeIntervalDays,
        changes: (v) => [
          { path: path("maintenance", "waterChangeIntervalDays"), value: v },
          { path: path("maintenance", "waterChangeFraction"), value: fraction },
        ],
        show: (v) => `${pct(fraction)} ${everyDays(v)}`,
        advice: (v) => `Change ${pct(fraction)} of the water at least ${everyDays(v)}.`,
      };
    }
    case "plantMass": {
      const lever = plantMassLever(scenario);
      if (!lever) return { unavailable: "There are no plants in this scenario: add a plant group in the setup first." };
      return {
        id,
        lo: lever.min,
        hi: lever.max,
        moreChange: "up",
        integer: false,
        tolerance: 1.005,
        scale: "log",
        current: lever.current,
        changes: lever.changes,
        show: (v) => `${formatNumber(v)} g dry of plants`,
        advice: (v) =>
          `Grow about ${formatNumber(v)} g dry of plants in all (now ${formatNumber(lever.current)} g), with room to grow in proportion.`,
      };
    }
    case "feed": {
      const feed = scenario.fish.feedGPerDay;
      if (!(feed > 0)) return { unavailable: "This scenario feeds nothing, so there is no food to cut." };
      return {
        id,
        lo: 0,
        hi: feed,
        moreChange: "down",
        integer: false,
        tolerance: Math.max(0.001, feed * 0.002),
        scale: "linear",
        current: feed,
        changes: (v) => [{ path: path("fish", "feedGPerDay"), value: v }],
        show: (v) => `${formatNumber(v)} g of food a day`,
        advice: (v) => `Feed at most ${formatNumber(v)} g a day (now ${formatNumber(feed)} g).`,
      };
    }
    case "roShare":
      return {
        id,
        lo: 0,
        hi: 1,
        moreChange: "up",
        integer: false,
        tolerance: 1e-3,
        scale: "linear",
        current: scenario.tapWater.roShare,
        changes: (v) => [{ path: path("tapWater", "roShare"), value: v }],
        show: (v) => `${pct(v)} reverse-osmosis water`,
        advice: (v) =>
          `Make at least ${pct(v)} of the change water reverse-osmosis water (now ${pct(scenario.tapWater.roShare)}).`,
      };
  }
}

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
export const SCAN_STEPS = 8;

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

// ---------------------------------------------------------------------------------------------
// As a job

/** A goal typed in a form ("" or absent = none) or sent as JSON (null = none). */
const goalNumber = (what: string, max: number) =>
  z.preprocess(
    (v) => (v === null || v === undefined || (typeof v === "string" && v.trim() === "") ? "" : v),
    z.union([
      z.literal(""),
      z.coerce
        .number({ error: `The ${what} goal must be a number.` })
        .refine(Number.isFinite, `The ${what} goal must be a number.`)
        .min(0, `The ${what} goal cannot be negative.`)
        .max(max, `Keep the ${what} goal below ${max}.`),
    ]),
  );

export const TargetInputSchema = z
  .object({
    nitrateMax: goalNumber("nitrate", 1000),
    nh3Max: goalNumber("free ammonia", 10),
    lever: z.enum(TARGET_LEVERS, { error: "Choose what you are willing to change." }),
    intervalDays: z.coerce
      .number()
      .min(1, "Change water at most once a day.")
      .max(365, "At most every 365 days.")
      .optional(),
    fractionPercent: z.coerce
      .number()
      .min(1, "Change at least 1 % of the water.")
      .max(95, "Change at most 95 % of the water.")
      .optional(),
  })
  .refine((v) => v.nitrateMax !== "" || v.nh3Max !== "", {
    path: ["nitrateMax"],
    message: "Give a nitrate goal, a free ammonia goal, or both.",
  });

export type TargetInput = z.infer<typeof TargetInputSchema>;

export type TargetResultJson = {
  goalText: string;
  lever: { id: TargetLeverId; label: string };
  status: "met" | "alreadyMet" | "infeasible" | "unavailable" | "failed";
  headline: string;
  details: string[];
  /** For "save as a new scenario": the lever's canonical value and its fixed companion. */
  save: { lever: TargetLeverId; value: number; intervalDays?: number; fraction?: number } | null;
  alternatives: { id: TargetLeverId; label: string; text: string; works: boolean }[];
};

function goalOf(input: TargetInput, units: DisplayUnits): Goal {
  return {
    nitrateMax: input.nitrateMax === "" ? null : input.nitrateMax / speciesFactor("nitrate", units),
    nh3Max: input.nh3Max === "" ? null : input.nh3Max / speciesFactor("ammonia", units),
  };
}

function companions(input: TargetInput) {
  return {
    intervalDays: input.intervalDays,
    fraction: input.fractionPercent === undefined ? undefined : input.fractionPercent / 100,
  };
}

/** Starts a target search job. Throws JobRefused at the person's or the server's limit. */
export function startTargetSearch(
  user: { id: number },
  scenarioId: number,
  scenario: Scenario,
  input: TargetInput,
  units: DisplayUnits,
) {
  const labels = unitLabels(units);
  const goal = goalOf(input, units);
  const no3 = speciesFactor("nitrate", units);
  const nh3 = speciesFactor("ammonia", units);
  const goalParts = [
    input.nitrateMax === "" ? null : `nitrate just before a water change at most ${input.nitrateMax} ${labels.nitrate}`,
    input.nh3Max === "" ? null : `free ammonia never above ${input.nh3Max} ${labels.ammonia}`,
  ].filter(Boolean);
  const goalText = goalParts.join(" and ");
  const levers = Object.fromEntries(
    TARGET_LEVERS.map((id) => [id, searchLever(id, scenario, companions(input))]),
  ) as Record<TargetLeverId, SearchLever | { unavailable: string }>;
  const main = levers[input.lever];
  const describeAt = (e: Evaluation) =>
    [
      e.nitrate === null ? null : `nitrate just before a change ${formatNumber(e.nitrate * no3)} ${labels.nitrate}`,
      e.nh3 === null ? null : `free ammonia at most ${formatNumber(e.nh3 * nh3)} ${labels.ammonia}`,
    ]
      .filter(Boolean)
      .join(", ");

  return startJob<TargetResultJson>(
    {
      user,
      kind: "target",
      label: `${TARGET_LEVER_LABELS[input.lever].toLowerCase()} for ${goalText}`,
      total: "unavailable" in main ? 1 : searchRuns(main),
      params: { scenarioId, input },
    },
    async (ctx: JobContext<unknown>) => {
      let runs = 0;
      let total = "unavailable" in main ? 0 : searchRuns(main);
      const evaluator = (lever: SearchLever) => async (value: number) => {
        const r = await ctx.run({ kind: "goal", scenario, changes: lever.changes(value), limits: JOB_RUN_LIMITS });
        runs++;
        ctx.progress(runs, Math.max(total, runs + 1));
        if (r.kind !== "goal") throw new Error("unexpected task result");
        return judge(value, r.figures, r.error, goal);
      };
      const base: Omit<TargetResultJson, "status" | "headline" | "details" | "save" | "alternatives"> = {
        goalText,
        lever: { id: input.lever, label: TARGET_LEVER_LABELS[input.lever] },
      };
      if ("unavailable" in main) {
        return {
          ...base,
          status: "unavailable",
          headline: main.unavailable,
          details: [],
          save: null,
          alternatives: [],
        };
      }
      const outcome = await findLeastChange(main, evaluator(main));
      if (outcome.status === "failed") {
        return {
          ...base,
          status: "failed",
          headline: `The model could not run one of the values: ${outcome.message}`,
          details: [],
          save: null,
          alternatives: [],
        };
      }
      if (outcome.status === "met") {
        const save = { lever: main.id, value: outcome.value, ...companions(input) };
        ctx.progress(runs, runs);
        return {
          ...base,
          status: outcome.alreadyMet ? "alreadyMet" : "met",
          headline: outcome.alreadyMet
            ? `The goal is already met as the tank is kept now. ${main.advice(outcome.value)}`
            : main.advice(outcome.value),
          details: [`With ${main.show(outcome.value)}: ${describeAt(outcome.at)}.`],
          save: outcome.alreadyMet ? null : save,
          alternatives: [],
        };
      }
      // No value of this lever meets the goal: say why, then try each other lever on its own.
      const details: string[] = [];
      const cin = changeWaterNitrate(scenario);
      const waterLever = input.lever === "waterChangeFraction" || input.lever === "waterChangeInterval";
      let headline = `No ${TARGET_LEVER_LABELS[input.lever].toLowerCase()} meets the goal: even with ${main.show(
        outcome.extreme.value,
      )}, ${describeAt(outcome.extreme)}.`;
      if (goal.nitrateMax !== null && waterLever && cin >= goal.nitrateMax) {
        headline = `The change water already carries ${formatNumber(cin * no3)} ${labels.nitrate} of nitrate, at or above your goal of ${
          input.nitrateMax
        } ${labels.nitrate}: however much of it you change, and however often, nitrate cannot fall below what the new water brings.`;
        details.push(
          "Water from reverse osmosis (or another low-nitrate source), more plants, or less food can get below it.",
        );
      }
      if (goal.nh3Max !== null && outcome.extreme.nh3 !== null && outcome.extreme.nh3 > goal.nh3Max) {
        details.push(
          "Free ammonia rises with pH and temperature; a filter that keeps up with the food, and less food, keep it down.",
        );
        if (input.lever === "roShare") details.push(RO_KH_NOTE);
      }
      const others = TARGET_LEVERS.filter((id) => id !== input.lever);
      total =
        runs +
        others.reduce((n, id) => n + ("unavailable" in levers[id] ? 0 : searchRuns(levers[id] as SearchLever)), 0);
      const alternatives: TargetResultJson["alternatives"] = [];
      for (const id of others) {
        const lever = levers[id];
        if ("unavailable" in lever) {
          alternatives.push({ id, label: TARGET_LEVER_LABELS[id], text: lever.unavailable, works: false });
          continue;
        }
        const alt = await findLeastChange(lever, evaluator(lever));
        alternatives.push({
          id,
          label: TARGET_LEVER_LABELS[id],
          works: alt.status === "met",
          text:
            alt.status === "met"
              ? lever.advice(alt.value)
              : alt.status === "infeasible"
                ? `Not on its own: even with ${lever.show(alt.extreme.value)}, ${describeAt(alt.extreme)}.${
                    id === "roShare" && goal.nh3Max !== null && (alt.extreme.nh3 ?? 0) > goal.nh3Max
                      ? ` ${RO_KH_NOTE}`
                      : ""
                  }`
                : `The model could not run it: ${alt.message}`,
        });
      }
      ctx.progress(runs, runs);
      return { ...base, status: "infeasible", headline, details, save: null, alternatives };
    },
  );
}

/** The scenario with a found value applied (for "save as a new scenario"). */
export function applyLever(scenario: Scenario, lever: SearchLever, value: number): Scenario {
  return lever.changes(value).reduce((s, c) => setScenarioValue(s, c.path, c.value), scenario);
}
