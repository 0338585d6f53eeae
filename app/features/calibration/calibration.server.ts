/**
 * Calibration as a job: the tank's readings within a scenario's run, the engine runs of the
 * robust fit (models/nitrogen/calibration/) on the worker pool, and the result in the person's
 * units. Before a fit, the page asks which multipliers the readings can tell (assessment: four
 * short runs) to pre-tick only those. Saving the fitted multipliers makes a new scenario.
 */
import { z } from "zod";
import type { Scenario, TankEventInput } from "~models";
import {
  assessReadings,
  calibrateMultipliers,
  DEFAULT_CARDS,
  describeKit,
  kitStepIn,
  kitUnit,
  KIT_UNITS,
  kitsFor,
  KitSchema,
  MULTIPLIER_BOUNDS,
  MULTIPLIER_KEYS,
  SPECIES,
  type CalibrationReading,
  type CalibrationResult,
  type Kit,
  type Kits,
  type MultiplierKey,
  type Observed,
  type ObserveRequest,
  type Species,
} from "~models/nitrogen/calibrate";
import { speciesFactor } from "~models/units";
import { getEnginePool } from "~/features/jobs/engine-pool.server";
import { KeeperError, startJob, type JobContext, type JobSpec } from "~/features/jobs/jobs.server";
import { contentHash } from "~/features/runs/simulation.server";
import { readingsForCalibration } from "~/features/readings/readings.server";
import { JOB_RUN_LIMITS } from "~/features/jobs/jobs.server";
import type { EngineTask } from "~/features/jobs/engine-tasks.server";
import { unitLabels, type DisplayUnits } from "~/utils/display-units";
import type { CalibrationAssessment, CalibrationJson, KitView } from "~/features/calibration/calibration-json";
export type { CalibrationAssessment, CalibrationJson, KitView } from "~/features/calibration/calibration-json";

export const MULTIPLIER_LABELS: Record<MultiplierKey, { label: string; hint: string }> = {
  feedLoad: { label: "Feed load", hint: "How much ammonia the food brings in, compared with the model's estimate." },
  plantUptake: { label: "Plant uptake", hint: "How fast the plants grow and take nitrogen up." },
  nitrifierCapacity: {
    label: "Filter capacity",
    hint: "How much ammonia and nitrite the filter bacteria can process.",
  },
};

/** Iterations of each local fit at most. */
const MAX_ITERATIONS = 25;

const SPECIES_UNIT: Record<Species, "ammonia" | "nitrite" | "nitrate"> = {
  tan: "ammonia",
  no2: "nitrite",
  no3: "nitrate",
};
const SPECIES_NAME: Record<Species, string> = { tan: "TAN", no2: "Nitrite", no3: "Nitrate" };

export const CalibrateInputSchema = z.object({
  fit: z
    .array(z.enum(MULTIPLIER_KEYS, { error: "Choose among the listed multipliers." }))
    .min(1, "Choose at least one multiplier to fit.")
    .max(3),
  kits: z.partialRecord(z.enum(SPECIES), KitSchema).optional(),
});

const StepSchema = z.coerce
  .number({ error: "The kit's step must be a number." })
  .positive("The kit's step must be above zero.")
  .max(1000, "The kit's step must be at most 1000.");

/**
 * The kits chosen on the form (`kit.<species>` and `step.<species>`, steps in the person's
 * units), as engine kits; field errors by name. "auto" leaves the species to be inferred.
 */
export function kitsFromForm(
  form: Record<string, string>,
  units: DisplayUnits,
): { kits: Kits; errors: Record<string, string> } {
  const kits: Kits = {};
  const errors: Record<string, string> = {};
  for (const species of SPECIES) {
    const choice = form[`kit.${species}`] ?? "auto";
    const unit = units[SPECIES_UNIT[species]];
    if (choice === "exact") kits[species] = { kind: "exact" };
    else if (choice === "card") kits[species] = defaultCard(species, unit);
    else if (choice === "steps") {
      const step = StepSchema.safeParse(form[`step.${species}`]);
      if (step.success) kits[species] = { kind: "steps", unit, step: step.data };
      else errors[`step.${species}`] = step.error.issues[0].message;
    } else if (choice !== "auto") errors[`kit.${species}`] = "Choose how you tested from the list.";
  }
  return { kits, errors };
}

function defaultCard(species: Species, unit: string): Kit {
  // The card is printed in the ion's unit; a person who reads as N gets the same card.
  return { kind: "card", unit: unit === "asN" ? KIT_UNITS[species][0].id : unit, values: [...DEFAULT_CARDS[species]] };
}

/** A kit for the page, in the person's units: its words, and its step as the step field takes it. */
function kitView(k: { species: Species; kit: Kit; inferred: boolean }, units: DisplayUnits): KitView {
  const shownIn = preferredUnits(units)[k.species];
  return {
    species: k.species,
    name: SPECIES_NAME[k.species],
    choice: k.kit.kind,
    step: k.kit.kind === "steps" ? kitStepIn(k.species, k.kit, shownIn) : null,
    text: describeKit(k.species, k.kit, shownIn),
    unit: kitUnit(k.species, shownIn).label,
    inferred: k.inferred,
  };
}

const round = (v: number) => Number(v.toPrecision(4));

function toJson(
  scenario: { id: number; name: string },
  readings: CalibrationReading[],
  r: CalibrationResult,
  units: DisplayUnits,
): CalibrationJson {
  const labels = unitLabels(units);
  const factor = (k: Species) => speciesFactor(SPECIES_UNIT[k], units);
  return {
    scenario,
    readingsUsed: readings.length,
    residualCount: r.residualCount,
    kits: r.kits.map((k) => kitView(k, units)),
    multipliers: r.multipliers.map((m) => ({
      key: m.key,
      label: MULTIPLIER_LABELS[m.key].label,
      fitted: m.fitted,
      start: round(m.start),
      value: round(m.value),
      low95: m.low95 === null ? null : round(m.low95),
      high95: m.high95 === null ? null : round(m.high95),
      lowOpen: m.lowOpen,
      highOpen: m.highOpen,
      atBound: m.atBound,
      determined: m.verdict ? m.verdict.determined : null,
      reason: m.verdict ? m.verdict.reason : null,
      correlatedWith: m.verdict?.correlatedWith
        ? {
            label: MULTIPLIER_LABELS[m.verdict.correlatedWith.key].label,
            correlation: round(m.verdict.correlatedWith.correlation),
          }
        : null,
      effectPercent: m.effect === null ? null : Number((m.effect * 100).toPrecision(2)),
      suggestion: m.suggestion,
    })),
    rmse: SPECIES.filter((k) => r.rmseBefore[k] !== null).map((k) => ({
      species: k,
      name: SPECIES_NAME[k],
      unit: labels[SPECIES_UNIT[k]],
      before: round(r.rmseBefore[k]! * factor(k)),
      after: round(r.rmseAfter[k]! * factor(k)),
    })),
    weightedRmseBefore: round(r.weightedRmseBefore),
    weightedRmseAfter: round(r.weightedRmseAfter),
    noisePercent: Number((r.noiseLevel * 100).toPrecision(2)),
    residuals: readings.flatMap((reading, i) =>
      SPECIES.flatMap((k) => {
        const measured = reading[k];
        if (measured == null) return [];
        const day = Number(reading.day.toFixed(4));
        return [
          {
            species: k,
            day,
            before: round((measured - r.modelBefore[k][i]) * factor(k)),
            after: round((measured - r.modelAfter[k][i]) * factor(k)),
          },
        ];
      }),
    ),
    evaluations: r.evaluations,
    localFits: r.localFits,
    converged: r.converged,
  };
}

const observeTask = (days: number[], req: ObserveRequest, events?: TankEventInput[]): EngineTask => ({
  kind: "observe",
  scenario: req.scenario,
  days,
  pinnedTrimDays: req.pinnedTrimDays,
  limits: JOB_RUN_LIMITS,
  events,
});

/**
 * What the fit runs against: the scenario's periodic schedule from its start date, or the
 * tank's journal replayed "as it happened" (its events in place of the schedule, from the
 * journal's first day; `scenario` and `startMs` are then the replay's).
 */
export type FitSchedule = { kind: "periodic" } | { kind: "journal"; events: TankEventInput[] };

const SCHEDULE_TEXT = {
  periodic: "the scenario's periodic schedule",
  journal: "the tank's journal, as it happened",
} as const;

const observedOf = (r: Awaited<ReturnType<JobContext<unknown>["run"]>>): Observed | null =>
  r.kind === "observe" ? r.observed : null;

/** The unit id each species is shown in, for inferring kits. */
const preferredUnits = (units: DisplayUnits) => ({ tan: units.ammonia, no2: units.nitrite, no3: units.nitrate });

/**
 * Starts a calibration job: `scenario` is the stored settings with the tank's targets,
 * `startMs` the scenario's day 0. Throws JobRefused at the person's or the server's limit.
 */
export function startCalibration(
  user: { id: number },
  row: { id: number; name: string },
  tankId: number,
  scenario: Scenario,
  startMs: number,
  fit: MultiplierKey[],
  units: DisplayUnits,
  kits: Kits = {},
  schedule: FitSchedule = { kind: "periodic" },
) {
  const { start, work } = calibrationJob(user, row, tankId, scenario, startMs, fit, units, kits, schedule);
  return startJob(start, work);
}

/**
 * A calibration job, ready to start or to run again after a restart: its params name the
 * scenario, the fit, the kits and the schedule, and fingerprint what it ran on (the scenario or
 * the journal's replay, the readings, the person's units).
 */
export function calibrationJob(
  user: { id: number },
  row: { id: number; name: string },
  tankId: number,
  scenario: Scenario,
  startMs: number,
  fit: MultiplierKey[],
  units: DisplayUnits,
  kits: Kits = {},
  schedule: FitSchedule = { kind: "periodic" },
): JobSpec<CalibrationJson> {
  const events = schedule.kind === "journal" ? schedule.events : undefined;
  const readings = readingsForCalibration(tankId, startMs, scenario.run.lengthDays);
  const days = readings.map((r) => r.day);
  // Engine runs to expect, for the progress bar: the recovery suite's fits take about 110 per
  // multiplier with exact readings and 180–350 with kit readings (their ranges look further).
  const kitReadings = kitsFor(readings, kits, preferredUnits(units)).some((k) => k.kit.kind !== "exact");
  const estimate = (kitReadings ? 250 : 110) * fit.length;
  const fingerprint = contentHash({ scenario, startMs, events: events ?? null, readings, units });
  return {
    start: {
      user,
      kind: "calibration",
      label: `fit ${fit.map((k) => MULTIPLIER_LABELS[k].label.toLowerCase()).join(", ")} to ${readings.length} readings`,
      total: estimate,
      params: { scenarioId: row.id, fit, kits, schedule: schedule.kind, fingerprint },
    },
    work: async (ctx: JobContext<unknown>) => {
      if (readings.length === 0) {
        throw new KeeperError(
          "No readings of TAN, nitrite or nitrate fall within this scenario's run. Check its start date, or add readings.",
        );
      }
      let runs = 0;
      const result = await calibrateMultipliers({
        scenario,
        readings,
        fit,
        kits,
        preferredUnits: preferredUnits(units),
        maxIterations: MAX_ITERATIONS,
        predict: (list) =>
          ctx.map(list, async (req) => {
            const observed = observedOf(await ctx.run(observeTask(days, req, events)));
            runs++;
            ctx.progress(runs, Math.max(estimate, runs + fit.length + 1));
            return observed;
          }),
      }).catch((error: unknown) => {
        if (error instanceof RangeError || (error instanceof Error && /could not be run/.test(error.message))) {
          throw new KeeperError(error.message);
        }
        throw error;
      });
      ctx.progress(runs, runs);
      return { ...toJson(row, readings, result, units), schedule: SCHEDULE_TEXT[schedule.kind] };
    },
  };
}

/**
 * Which multipliers the readings in the run can tell, before any fit (four short runs on the
 * pool's interactive lane); null when there are no readings or the model cannot run.
 */
export async function assessCalibration(
  user: { id: number },
  tankId: number,
  scenario: Scenario,
  startMs: number,
  units: DisplayUnits,
  candidates: MultiplierKey[],
): Promise<CalibrationAssessment | null> {
  const readings = readingsForCalibration(tankId, startMs, scenario.run.lengthDays);
  if (readings.length === 0 || candidates.length === 0) return null;
  const days = readings.map((r) => r.day);
  const pool = getEnginePool();
  try {
    const a = await assessReadings({
      scenario,
      readings,
      candidates,
      preferredUnits: preferredUnits(units),
      predict: (list) =>
        Promise.all(
          list.map(async (req) =>
            observedOf(await pool.run(observeTask(days, req), { lane: "interactive", owner: `user:${user.id}` })),
          ),
        ),
    });
    return {
      kits: a.kits.map((k) => kitView(k, units)),
      multipliers: a.multipliers.map((m) => ({
        key: m.key,
        determinable: m.determinable,
        expectedPercent: m.expectedFactor === null ? null : Math.round((m.expectedFactor - 1) * 100),
        reason: m.reason,
        suggestion: m.suggestion,
      })),
    };
  } catch {
    return null;
  }
}

/** The kits the readings in the run suggest (no model runs), for the form when there is no assessment. */
export function inferredKits(tankId: number, scenario: Scenario, startMs: number, units: DisplayUnits): KitView[] {
  const readings = readingsForCalibration(tankId, startMs, scenario.run.lengthDays);
  return kitsFor(readings, {}, preferredUnits(units)).map((k) => kitView(k, units));
}

export const SaveFittedSchema = z.object({
  name: z
    .string({ error: "Give the new scenario a name." })
    .trim()
    .min(1, "Give the new scenario a name.")
    .max(120, "Keep the name under 120 characters."),
  ...(Object.fromEntries(
    MULTIPLIER_KEYS.map((k) => [
      k,
      z.coerce
        .number({ error: "The multipliers must be numbers." })
        .min(MULTIPLIER_BOUNDS.min, `Multipliers lie between ${MULTIPLIER_BOUNDS.min} and ${MULTIPLIER_BOUNDS.max}.`)
        .max(MULTIPLIER_BOUNDS.max, `Multipliers lie between ${MULTIPLIER_BOUNDS.min} and ${MULTIPLIER_BOUNDS.max}.`),
    ]),
  ) as Record<MultiplierKey, z.ZodCoercedNumber>),
});
