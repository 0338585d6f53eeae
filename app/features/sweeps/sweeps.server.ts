/**
 * Sweeps: one setting of a scenario varied over a range, one outcome read from each run, run as
 * a job on the worker pool with progress. The settings a sweep offers are the scenario's numeric
 * fields (the engine's own list, bounds and units), plus "plant mass", which scales every plant
 * group's start mass and its "most the tank holds" together: sweeping the start mass alone with
 * the maximum fixed is not monotone (a group near its maximum takes up little; docs/engine.md).
 */
import { z } from "zod";
import { OUTCOMES, scenarioSettings, type Quantity, type Scenario, type Setting } from "~models";
import { fromDisplay, toDisplay, unitLabel } from "~models/units";
import { JOB_LIMITS, JOB_RUN_LIMITS } from "~/features/jobs/job-limits.server";
import type { JobContext, JobSpec } from "~/features/jobs/jobs.server";
import { contentHash } from "~/features/runs/simulation.server";
import type { DisplayUnits } from "~/utils/display-units";
import { fieldApplies } from "~/features/scenarios/field-visibility";
import type { Role } from "~/db/schema";

/** A setting a sweep can vary (models/nitrogen/scenario/settings.ts), canonical units. */
export type Lever = Setting;

/**
 * Every setting of a scenario a sweep offers: plant mass first (when there are plants), then the
 * numeric fields in form order — only those that apply to this scenario (the setup form's rules):
 * sweeping a setting the scenario switches off (a zone's capacity with the zones off, the dose
 * while fishless cycling is off) would draw a flat line that reads as "no effect".
 */
export function sweepLevers(scenario: Scenario): Lever[] {
  const valueOf = (name: string) => {
    let node: unknown = scenario;
    for (const p of name.split(".")) node = (node as Record<string, unknown> | undefined)?.[p];
    return node === undefined ? undefined : String(node);
  };
  return scenarioSettings(scenario).filter((l) => fieldApplies(l.id, valueOf));
}

/** The unit a lever is shown in, in the person's units. */
const shownUnit = (lever: Lever, units: DisplayUnits) => unitLabel(lever.quantity, units, lever.unit);

const display = (lever: Lever, v: number, units: DisplayUnits) =>
  Number(toDisplay(lever.quantity, v, units).toPrecision(6));

/** A lever's allowed range in the person's units: the numbers the form's hint shows and its check enforces. */
function leverBounds(lever: Lever, units: DisplayUnits): { min: number; max: number } {
  // Four significant figures, rounded inwards, so the bounds read cleanly and stay allowed.
  const tidy = (v: number, dir: "up" | "down") => {
    if (v === 0 || !Number.isFinite(v)) return v;
    const step = 10 ** (Math.floor(Math.log10(Math.abs(v))) - 3);
    return Number(((dir === "up" ? Math.ceil(v / step) : Math.floor(v / step)) * step).toPrecision(4));
  };
  return {
    min: tidy(toDisplay(lever.quantity, lever.min, units), "up"),
    max: tidy(toDisplay(lever.quantity, lever.max, units), "down"),
  };
}

/** A lever as the form draws it (display units). */
export function leverJson(lever: Lever, units: DisplayUnits) {
  return {
    id: lever.id,
    label: lever.label,
    hint: lever.hint,
    unit: shownUnit(lever, units),
    ...leverBounds(lever, units),
    current: display(lever, lever.current, units),
    integer: lever.integer,
  };
}

/** Factor from an outcome's canonical unit to what the person sees, and its unit label. */
function outcomeDisplay(quantity: Quantity, unit: string, units: DisplayUnits): { factor: number; unit: string } {
  return { factor: toDisplay(quantity, 1, units), unit: unitLabel(quantity, units, unit) };
}

export const SWEEP_OUTCOMES = OUTCOMES.map((o) => ({ id: o.id, label: o.label }));

/** The sweep form (display units), checked against the lever's bounds and the person's point cap. */
export function sweepInputSchema(levers: Lever[], units: DisplayUnits, role: Role) {
  const maxPoints = JOB_LIMITS.sweepPoints[role];
  const num = (label: string) =>
    z.coerce.number({ error: `${label} must be a number.` }).refine(Number.isFinite, `${label} must be a number.`);
  return (
    z
      .object({
        setting: z.string().refine((id) => levers.some((l) => l.id === id), "Choose a setting to vary."),
        from: num("“From”"),
        to: num("“To”"),
        points: z.coerce
          .number({ error: "Give the number of points." })
          .int("Give a whole number of points.")
          .min(2, "Use at least 2 points.")
          .max(maxPoints, `At most ${maxPoints} points for your account.`),
        outcome: z.enum(OUTCOMES.map((o) => o.id) as [string, ...string[]], { error: "Choose an outcome." }),
      })
      // `when`: the range checks run even when another field is wrong, so the form shows every
      // problem at once; each check looks only at fields that are themselves numbers.
      .superRefine(
        (v, ctx) => {
          const lever = levers.find((l) => l.id === v.setting);
          if (!lever) return;
          const { min: lo, max: hi } = leverBounds(lever, units);
          const ok = (x: unknown): x is number => typeof x === "number" && Number.isFinite(x);
          for (const key of ["from", "to"] as const) {
            const x = v[key];
            if (ok(x) && (x < lo || x > hi)) {
              ctx.addIssue({
                code: "custom",
                path: [key],
                message: `Keep ${lever.label.toLowerCase()} between ${lo} and ${hi} ${shownUnit(lever, units)}.`,
              });
            }
          }
          if (ok(v.from) && ok(v.to) && v.from === v.to)
            ctx.addIssue({ code: "custom", path: ["to"], message: "“To” must differ from “From”." });
        },
        // …but only on an object: a body of `null` or a number has no fields to look at.
        { when: (payload) => typeof payload.value === "object" && payload.value !== null },
      )
  );
}

export type SweepInput = z.infer<ReturnType<typeof sweepInputSchema>>;

type SweepPointJson = { x: number; y: number | null; error: string | null };

export type SweepResultJson = {
  setting: { id: string; label: string; unit: string; current: number; from: number; to: number };
  outcome: { id: string; label: string; unit: string };
  points: SweepPointJson[];
};

/** The values of a sweep, canonical: evenly spaced in display units (what the person typed), integers rounded. */
function sweepValues(lever: Lever, input: SweepInput, units: DisplayUnits): { x: number[]; canonical: number[] } {
  const n = input.points;
  const x = Array.from({ length: n }, (_v, i) => input.from + ((input.to - input.from) * i) / (n - 1));
  const canonical = x.map((v) => {
    const c = Math.min(lever.max, Math.max(lever.min, fromDisplay(lever.quantity, v, units)));
    return lever.integer ? Math.round(c) : c;
  });
  return {
    x: x.map((v, i) => (lever.integer ? display(lever, canonical[i], units) : Number(v.toPrecision(6)))),
    canonical,
  };
}

/**
 * A sweep job, ready to start or to run again after a restart: its params name the scenario and
 * the form's input, and fingerprint what it ran on (the scenario, the person's units).
 */
export function sweepJob(
  user: { id: number },
  scenarioId: number,
  scenario: Scenario,
  input: SweepInput,
  units: DisplayUnits,
): JobSpec<SweepResultJson, SweepResultJson> {
  const levers = sweepLevers(scenario);
  const lever = levers.find((l) => l.id === input.setting)!;
  const outcome = OUTCOMES.find((o) => o.id === input.outcome)!;
  const { factor, unit } = outcomeDisplay(outcome.quantity, outcome.unit, units);
  const { x, canonical } = sweepValues(lever, input, units);
  const head: Omit<SweepResultJson, "points"> = {
    setting: {
      id: lever.id,
      label: lever.label,
      unit: shownUnit(lever, units),
      current: display(lever, lever.current, units),
      from: input.from,
      to: input.to,
    },
    outcome: { id: outcome.id, label: outcome.label, unit },
  };
  return {
    start: {
      user,
      kind: "sweep",
      label: `${lever.label} from ${input.from} to ${input.to} ${shownUnit(lever, units)}, ${input.points} points`,
      total: input.points,
      params: { scenarioId, input, fingerprint: contentHash({ scenario, units }) },
    },
    work: async (ctx: JobContext<SweepResultJson>) => {
      const points: SweepPointJson[] = [];
      let done = 0;
      await ctx.map(canonical, async (value, i) => {
        const result = await ctx.run({
          kind: "outcomes",
          scenario,
          changes: lever.changes(value),
          outcomes: [outcome.id],
          limits: JOB_RUN_LIMITS,
        });
        if (result.kind !== "outcomes") throw new Error("unexpected task result");
        const y = result.point.outcomes[outcome.id];
        points[i] = { x: x[i], y: y == null ? null : Number((y * factor).toPrecision(6)), error: result.point.error };
        done++;
        ctx.progress(done, input.points, { ...head, points: points.filter(Boolean) });
      });
      return { ...head, points };
    },
  };
}
