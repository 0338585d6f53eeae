/**
 * The target finder as a job: the smallest change of one setting that meets a keeper's goal
 * (nitrate just before a water change at most X, free ammonia never above Y), or a plain
 * explanation of why no value can and what would. The levers are in search-levers.server.ts,
 * the search itself in target-search.server.ts.
 */
import { z } from "zod";
import type { Scenario } from "~models";
import { speciesFactor } from "~models/units";
import { JOB_RUN_LIMITS } from "~/features/jobs/job-limits.server";
import type { JobContext, JobSpec } from "~/features/jobs/jobs.server";
import { contentHash } from "~/features/runs/simulation.server";
import { changeWaterNitrate, RO_KH_NOTE, searchLever, type SearchLever } from "~/features/sweeps/search-levers.server";
import { TARGET_LEVER_LABELS, TARGET_LEVERS, type TargetLeverId } from "~/features/sweeps/target-levers";
import {
  findLeastChange,
  judge,
  searchRuns,
  type Evaluation,
  type Goal,
  type SearchOutcome,
} from "~/features/sweeps/target-search.server";
import { formatNumber, unitLabels, type DisplayUnits, type UnitLabels } from "~/utils/display-units";

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

/** How results read: the goal and the evaluations in the person's units. */
type Wording = { goalText: string; describeAt(e: Evaluation): string; labels: UnitLabels; no3: number };

function wording(input: TargetInput, units: DisplayUnits): Wording {
  const labels = unitLabels(units);
  const no3 = speciesFactor("nitrate", units);
  const nh3 = speciesFactor("ammonia", units);
  const goalText = [
    input.nitrateMax === "" ? null : `nitrate just before a water change at most ${input.nitrateMax} ${labels.nitrate}`,
    input.nh3Max === "" ? null : `free ammonia never above ${input.nh3Max} ${labels.ammonia}`,
  ]
    .filter(Boolean)
    .join(" and ");
  const describeAt = (e: Evaluation) =>
    [
      e.nitrate === null ? null : `nitrate just before a change ${formatNumber(e.nitrate * no3)} ${labels.nitrate}`,
      e.nh3 === null ? null : `free ammonia at most ${formatNumber(e.nh3 * nh3)} ${labels.ammonia}`,
    ]
      .filter(Boolean)
      .join(", ");
  return { goalText, describeAt, labels, no3 };
}

type Levers = Record<TargetLeverId, SearchLever | { unavailable: string }>;
type Evaluate = (lever: SearchLever) => (value: number) => Promise<Evaluation>;
type Verdict = Pick<TargetResultJson, "status" | "headline" | "details" | "save" | "alternatives">;

const runsOf = (lever: SearchLever | { unavailable: string }) => ("unavailable" in lever ? 0 : searchRuns(lever));

/** The verdict when the chosen lever meets the goal (or already does). */
function metVerdict(
  input: TargetInput,
  main: SearchLever,
  outcome: Extract<SearchOutcome, { status: "met" }>,
  words: Wording,
): Verdict {
  return {
    status: outcome.alreadyMet ? "alreadyMet" : "met",
    headline: outcome.alreadyMet
      ? `The goal is already met as the tank is kept now. ${main.advice(outcome.value)}`
      : main.advice(outcome.value),
    details: [`With ${main.show(outcome.value)}: ${words.describeAt(outcome.at)}.`],
    save: outcome.alreadyMet ? null : { lever: main.id, value: outcome.value, ...companions(input) },
    alternatives: [],
  };
}

/** Why no value of the chosen lever meets the goal: the headline and what would help. */
function whyNot(
  input: TargetInput,
  scenario: Scenario,
  goal: Goal,
  main: SearchLever,
  extreme: Evaluation,
  words: Wording,
): { headline: string; details: string[] } {
  const details: string[] = [];
  const cin = changeWaterNitrate(scenario);
  const waterLever = input.lever === "waterChangeFraction" || input.lever === "waterChangeInterval";
  let headline = `No ${TARGET_LEVER_LABELS[input.lever].toLowerCase()} meets the goal: even with ${main.show(
    extreme.value,
  )}, ${words.describeAt(extreme)}.`;
  if (goal.nitrateMax !== null && waterLever && cin >= goal.nitrateMax) {
    const { labels } = words;
    headline = `The change water already carries ${formatNumber(cin * words.no3)} ${labels.nitrate} of nitrate, at or above your goal of ${
      input.nitrateMax
    } ${labels.nitrate}: however much of it you change, and however often, nitrate cannot fall below what the new water brings.`;
    details.push(
      "Water from reverse osmosis (or another low-nitrate source), more plants, or less food can get below it.",
    );
  }
  if (goal.nh3Max !== null && extreme.nh3 !== null && extreme.nh3 > goal.nh3Max) {
    details.push(
      "Free ammonia rises with pH and temperature; a filter that keeps up with the food, and less food, keep it down.",
    );
    if (input.lever === "roShare") details.push(RO_KH_NOTE);
  }
  return { headline, details };
}

/** Each other lever on its own: what it would take, or why it cannot. */
async function alternatives(
  input: TargetInput,
  levers: Levers,
  goal: Goal,
  evaluate: Evaluate,
  words: Wording,
): Promise<TargetResultJson["alternatives"]> {
  const out: TargetResultJson["alternatives"] = [];
  for (const id of TARGET_LEVERS.filter((l) => l !== input.lever)) {
    const lever = levers[id];
    if ("unavailable" in lever) {
      out.push({ id, label: TARGET_LEVER_LABELS[id], text: lever.unavailable, works: false });
      continue;
    }
    const alt = await findLeastChange(lever, evaluate(lever));
    const roNote =
      id === "roShare" && goal.nh3Max !== null && alt.status === "infeasible" && (alt.extreme.nh3 ?? 0) > goal.nh3Max;
    out.push({
      id,
      label: TARGET_LEVER_LABELS[id],
      works: alt.status === "met",
      text:
        alt.status === "met"
          ? lever.advice(alt.value)
          : alt.status === "infeasible"
            ? `Not on its own: even with ${lever.show(alt.extreme.value)}, ${words.describeAt(alt.extreme)}.${roNote ? ` ${RO_KH_NOTE}` : ""}`
            : `The model could not run it: ${alt.message}`,
    });
  }
  return out;
}

/** The whole search for one input: the chosen lever, then (if it cannot) each other lever. */
async function search(
  input: TargetInput,
  scenario: Scenario,
  levers: Levers,
  goal: Goal,
  ctx: JobContext<unknown>,
  words: Wording,
): Promise<Verdict> {
  const main = levers[input.lever];
  if ("unavailable" in main)
    return { status: "unavailable", headline: main.unavailable, details: [], save: null, alternatives: [] };
  let runs = 0;
  let total = searchRuns(main);
  const evaluate: Evaluate = (lever) => async (value) => {
    const r = await ctx.run({ kind: "goal", scenario, changes: lever.changes(value), limits: JOB_RUN_LIMITS });
    runs++;
    ctx.progress(runs, Math.max(total, runs + 1));
    if (r.kind !== "goal") throw new Error("unexpected task result");
    return judge(value, r.figures, r.error, goal);
  };
  const outcome = await findLeastChange(main, evaluate(main));
  if (outcome.status === "failed") {
    const headline = `The model could not run one of the values: ${outcome.message}`;
    return { status: "failed", headline, details: [], save: null, alternatives: [] };
  }
  if (outcome.status === "met") {
    ctx.progress(runs, runs);
    return metVerdict(input, main, outcome, words);
  }
  // No value of this lever meets the goal: say why, then try each other lever on its own.
  const { headline, details } = whyNot(input, scenario, goal, main, outcome.extreme, words);
  total = runs + TARGET_LEVERS.filter((id) => id !== input.lever).reduce((n, id) => n + runsOf(levers[id]), 0);
  const others = await alternatives(input, levers, goal, evaluate, words);
  ctx.progress(runs, runs);
  return { status: "infeasible", headline, details, save: null, alternatives: others };
}

/** A target search job, ready to start or to run again after a restart (params as for a sweep). */
export function targetSearchJob(
  user: { id: number },
  scenarioId: number,
  scenario: Scenario,
  input: TargetInput,
  units: DisplayUnits,
): JobSpec<TargetResultJson> {
  const words = wording(input, units);
  const goal = goalOf(input, units);
  const levers = Object.fromEntries(
    TARGET_LEVERS.map((id) => [id, searchLever(id, scenario, companions(input))]),
  ) as Levers;
  const main = levers[input.lever];
  return {
    start: {
      user,
      kind: "target",
      label: `${TARGET_LEVER_LABELS[input.lever].toLowerCase()} for ${words.goalText}`,
      total: "unavailable" in main ? 1 : searchRuns(main),
      params: { scenarioId, input, fingerprint: contentHash({ scenario, units }) },
    },
    work: async (ctx: JobContext<unknown>) => ({
      goalText: words.goalText,
      lever: { id: input.lever, label: TARGET_LEVER_LABELS[input.lever] },
      ...(await search(input, scenario, levers, goal, ctx, words)),
    }),
  };
}
