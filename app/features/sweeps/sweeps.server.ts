/**
 * Sweeps: one setting of a scenario varied over a range, one outcome read from each run, run as
 * a job on the worker pool with progress. The settings a sweep offers are the scenario's numeric
 * fields (the engine's own list, bounds and units), plus "plant mass", which scales every plant
 * group's start mass and its "most the tank holds" together: sweeping the start mass alone with
 * the maximum fixed is not monotone (a group near its maximum takes up little; docs/engine.md).
 */
import { z } from "zod";
import { listScenarioFields, OUTCOMES, type Quantity, type Scenario, type ScenarioField } from "~models";
import { fromDisplay, speciesFactor, toDisplay } from "~/display-units.server";
import type { SettingChange } from "~/features/jobs/engine-tasks.server";
import { JOB_LIMITS, startJob, type JobContext } from "~/features/jobs/jobs.server";
import { unitFor } from "~/features/scenarios/scenario-form.server";
import type { DisplayUnits } from "~/utils/display-units";
import { unitLabels } from "~/utils/display-units";
import type { Role } from "~/db/schema";

/** Limits for a run inside a job: like a request's, a bad point fails fast. */
export const JOB_RUN_LIMITS = { maxWallMs: 3000, maxSteps: 300_000 };

/** A setting a sweep or the target finder can vary, in canonical units. */
export type Lever = {
  id: string;
  label: string;
  hint: string;
  quantity: Quantity;
  /** Unit shown to the person. */
  unit: string;
  min: number;
  max: number;
  integer: boolean;
  /** The scenario's value now. */
  current: number;
  /** The setting changes for a value of this lever. */
  changes(value: number): SettingChange[];
};

/** Settings not offered: the file version, the tank's nitrate band, chart spacing and run length, per-group plant fields. */
const EXCLUDED = /^(schemaVersion|targets\.|run\.|plants\.)/;

function fieldLever(field: ScenarioField, scenario: Scenario, units: DisplayUnits): Lever | null {
  if ((field.kind !== "number" && field.kind !== "integer") || EXCLUDED.test(field.key)) return null;
  const path = field.path as string[];
  let current: unknown = scenario;
  for (const p of path) current = (current as Record<string, unknown> | undefined)?.[p];
  if (typeof current !== "number") return null;
  return {
    id: field.key,
    label: field.meta.label,
    hint: field.meta.hint,
    quantity: field.meta.quantity,
    unit: unitFor(field, units),
    min: field.min ?? 0,
    max: field.max ?? current * 10,
    integer: field.kind === "integer",
    current,
    changes: (value) => [{ path, value }],
  };
}

/** Plant mass of all groups, start and maximum scaled together; the lever's value is the total start mass, g dry. */
export function plantMassLever(scenario: Scenario): Lever | null {
  const total = scenario.plants.reduce((s, g) => s + g.startMassG, 0);
  if (scenario.plants.length === 0 || !(total > 0)) return null;
  const biggestMax = Math.max(...scenario.plants.map((g) => g.maxMassG));
  const minMax = Math.min(...scenario.plants.map((g) => g.maxMassG));
  // Scale factor k: every max stays within the schema's 0.01–5000 g.
  const kMin = 0.01 / minMax;
  const kMax = 5000 / biggestMax;
  return {
    id: "plantMass",
    label: "Plant mass, all groups",
    hint: "Every group's start mass and “most the tank holds” scaled together.",
    quantity: "mass",
    unit: "g dry",
    min: Math.max(0.01, total * kMin),
    max: total * kMax,
    integer: false,
    current: total,
    changes: (value) => {
      const k = value / total;
      return scenario.plants.flatMap((g, i) => [
        { path: ["plants", i, "startMassG"], value: g.startMassG * k },
        { path: ["plants", i, "maxMassG"], value: g.maxMassG * k },
      ]);
    },
  };
}

const FIELDS = listScenarioFields();

/** Every lever of a scenario: plant mass first (when there are plants), then the numeric fields in form order. */
export function sweepLevers(scenario: Scenario, units: DisplayUnits): Lever[] {
  const plant = plantMassLever(scenario);
  const fields = FIELDS.map((f) => fieldLever(f, scenario, units)).filter((l): l is Lever => l !== null);
  return plant ? [plant, ...fields] : fields;
}

const display = (lever: Lever, v: number, units: DisplayUnits) =>
  Number(toDisplay(lever.quantity, v, units).toPrecision(6));

/** A lever as the form draws it (display units). */
export function leverJson(lever: Lever, units: DisplayUnits) {
  return {
    id: lever.id,
    label: lever.label,
    hint: lever.hint,
    unit: lever.unit,
    min: display(lever, lever.min, units),
    max: display(lever, lever.max, units),
    current: display(lever, lever.current, units),
    integer: lever.integer,
  };
}

/** Factor from an outcome's canonical unit to what the person sees, and its unit label. */
export function outcomeDisplay(
  quantity: Quantity,
  unit: string,
  units: DisplayUnits,
): { factor: number; unit: string } {
  if (quantity === "nitrate" || quantity === "nitrite" || quantity === "ammonia") {
    return { factor: speciesFactor(quantity, units), unit: unitLabels(units)[quantity] };
  }
  return { factor: 1, unit };
}

export const SWEEP_OUTCOMES = OUTCOMES.map((o) => ({ id: o.id, label: o.label }));

/** The sweep form (display units), checked against the lever's bounds and the person's point cap. */
export function sweepInputSchema(levers: Lever[], units: DisplayUnits, role: Role) {
  const maxPoints = JOB_LIMITS.sweepPoints[role];
  const num = (label: string) =>
    z.coerce.number({ error: `${label} must be a number.` }).refine(Number.isFinite, `${label} must be a number.`);
  return z
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
    .superRefine((v, ctx) => {
      const lever = levers.find((l) => l.id === v.setting);
      if (!lever) return;
      const lo = display(lever, lever.min, units);
      const hi = display(lever, lever.max, units);
      for (const key of ["from", "to"] as const) {
        if (v[key] < lo || v[key] > hi) {
          ctx.addIssue({
            code: "custom",
            path: [key],
            message: `Keep ${lever.label.toLowerCase()} between ${lo} and ${hi} ${lever.unit}.`,
          });
        }
      }
      if (v.from === v.to) ctx.addIssue({ code: "custom", path: ["to"], message: "“To” must differ from “From”." });
    });
}

export type SweepInput = z.infer<ReturnType<typeof sweepInputSchema>>;

export type SweepPointJson = { x: number; y: number | null; error: string | null };

export type SweepResultJson = {
  setting: { id: string; label: string; unit: string; current: number; from: number; to: number };
  outcome: { id: string; label: string; unit: string };
  points: SweepPointJson[];
};

/** The values of a sweep, canonical: evenly spaced in display units (what the person typed), integers rounded. */
export function sweepValues(
  lever: Lever,
  input: SweepInput,
  units: DisplayUnits,
): { x: number[]; canonical: number[] } {
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
 * Starts a sweep job for `user` on `scenario` (tank targets already applied). Throws JobRefused
 * when the person's limit or the server's is reached.
 */
export function startSweep(
  user: { id: number },
  scenarioId: number,
  scenario: Scenario,
  input: SweepInput,
  units: DisplayUnits,
) {
  const levers = sweepLevers(scenario, units);
  const lever = levers.find((l) => l.id === input.setting)!;
  const outcome = OUTCOMES.find((o) => o.id === input.outcome)!;
  const { factor, unit } = outcomeDisplay(outcome.quantity, outcome.unit, units);
  const { x, canonical } = sweepValues(lever, input, units);
  const head: Omit<SweepResultJson, "points"> = {
    setting: {
      id: lever.id,
      label: lever.label,
      unit: lever.unit,
      current: display(lever, lever.current, units),
      from: input.from,
      to: input.to,
    },
    outcome: { id: outcome.id, label: outcome.label, unit },
  };
  return startJob<SweepResultJson, SweepResultJson>(
    {
      user,
      kind: "sweep",
      label: `${lever.label} from ${input.from} to ${input.to} ${lever.unit}, ${input.points} points`,
      total: input.points,
      params: { scenarioId, input },
    },
    async (ctx: JobContext<SweepResultJson>) => {
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
  );
}
