/**
 * Running again the jobs of an app process that stopped (killed, crashed, or stopped normally):
 * every process, at start and then every HEARTBEAT_MS, claims the orphaned rows
 * (job-claims.server.ts), rebuilds each job's work from its row, and runs it from the start on
 * its own pool and line (decision 0009).
 *
 * A row keeps what rebuilds its job: the scenario's id and the form's input (checked again with
 * the same zod schemas as the form), and a fingerprint of what it ran on. A scenario deleted
 * meanwhile, input no longer allowed (a lower point cap), or a scenario, tank, journal, readings
 * or units changed since the start fail the job with a message instead: running it again would
 * answer another question than the one asked.
 */
import { and, eq } from "drizzle-orm";
import { z } from "zod";
import type { Scenario } from "~models";
import { getDb } from "~/db/client.server";
import { scenarios, tanks, users } from "~/db/schema";
import { calibrationJob } from "~/features/calibration/calibration.server";
import { CalibrateInputSchema } from "~/features/calibration/calibration-input.server";
import { scenarioBases } from "~/features/calibration/calibration-basis.server";
import { claimOrphans } from "~/features/jobs/job-claims.server";
import { JOB_KIND_NAMES, type JobKind } from "~/features/jobs/job-json";
import { failJobRow, HEARTBEAT_MS, type JobRow } from "~/features/jobs/job-rows.server";
import { resumeJob, type Job, type JobSpec } from "~/features/jobs/jobs.server";
import { modelStartMs } from "~/features/readings/readings.server";
import { readStoredSettings, withTankTargets } from "~/features/runs/simulation.server";
import { sweepInputSchema, sweepJob, sweepLevers } from "~/features/sweeps/sweeps.server";
import { TargetInputSchema, targetSearchJob } from "~/features/sweeps/target-finder.server";
import type { ScenarioRow, TankRow } from "~/features/tanks/tanks.server";
import { displayUnitsFor } from "~/utils/display-units";

/** A job that cannot be run again; its message is the job's error. */
class NotRestartable extends Error {}

/** What every kind's params hold (each kind adds its form's input). */
const ParamsSchema = z.looseObject({ scenarioId: z.number().int().positive(), fingerprint: z.string() });
const CalibrationParamsSchema = z.looseObject({ schedule: z.enum(["periodic", "journal"]) });

type Owner = typeof users.$inferSelect;
type Place = { tank: TankRow; row: ScenarioRow; settings: Scenario };
type Rebuild = (job: JobRow, params: Record<string, unknown>, owner: Owner, place: Place) => JobSpec;

/** The form's input again, through the form's own schema (a refusal's first message says why). */
function checked<T>(job: JobRow, parsed: z.ZodSafeParseResult<T>): T {
  if (parsed.success) return parsed.data;
  throw new NotRestartable(
    `This ${JOB_KIND_NAMES[job.kind]} could not be restarted after the server running it stopped: ${parsed.error.issues[0]?.message ?? "its settings are no longer allowed"} Start it again.`,
  );
}

/** Each kind's work rebuilt from its row (a new kind must say how, or the type check fails). */
const REBUILD: Record<JobKind, Rebuild> = {
  sweep: (job, params, owner, { tank, row, settings }) => {
    const units = displayUnitsFor(owner);
    const scenario = withTankTargets(settings, tank);
    const input = checked(job, sweepInputSchema(sweepLevers(scenario), units, owner.role).safeParse(params.input));
    return sweepJob(owner, row.id, scenario, input, units) as JobSpec;
  },
  target: (job, params, owner, { tank, row, settings }) => {
    const input = checked(job, TargetInputSchema.safeParse(params.input));
    return targetSearchJob(owner, row.id, withTankTargets(settings, tank), input, displayUnitsFor(owner)) as JobSpec;
  },
  calibration: (job, params, owner, { tank, row, settings }) => {
    const units = displayUnitsFor(owner);
    const input = checked(job, CalibrateInputSchema.safeParse({ fit: params.fit, kits: params.kits }));
    const { schedule } = checked(job, CalibrationParamsSchema.safeParse(params));
    // The journal replayed as it was when the job was asked for (its length runs to that day).
    const { replay, basisFor } = scenarioBases(tank, settings, modelStartMs(row), job.startedAt);
    if (schedule === "journal" && !replay) throw changed(job);
    return calibrationJob(owner, row, tank.id, basisFor(schedule), input.fit, units, input.kits) as JobSpec;
  },
};

const changed = (job: JobRow) =>
  new NotRestartable(
    `The scenario changed after this ${JOB_KIND_NAMES[job.kind]} started (its settings, tank, journal, readings or your units), so it was not restarted after the server running it stopped. Start it again.`,
  );

/** The job's work, rebuilt from its row; throws NotRestartable with the reason it cannot be. */
function rebuild(job: JobRow): JobSpec {
  const params = checked(job, ParamsSchema.safeParse(job.params));
  const owner = getDb().select().from(users).where(eq(users.id, job.userId)).get();
  const place = getDb()
    .select({ row: scenarios, tank: tanks })
    .from(scenarios)
    .innerJoin(tanks, eq(tanks.id, scenarios.tankId))
    .where(and(eq(scenarios.id, params.scenarioId), eq(tanks.ownerId, job.userId)))
    .get();
  if (!owner || !place) {
    throw new NotRestartable(
      `The scenario this ${JOB_KIND_NAMES[job.kind]} ran on was deleted, so it could not be restarted after the server running it stopped.`,
    );
  }
  const settings = readStoredSettings(place.row.settings);
  if (!settings) throw changed(job);
  const spec = REBUILD[job.kind](job, params, owner, { ...place, settings });
  if ((spec.start.params as { fingerprint?: string }).fingerprint !== params.fingerprint) throw changed(job);
  return spec;
}

/**
 * Claims the orphaned jobs and runs them again here, oldest first; one that cannot be rebuilt
 * fails with the reason. `now` is the clock the claim judges heartbeats by (tests move it on).
 */
export function resumeOrphans(now = Date.now()): Job[] {
  const resumed: Job[] = [];
  for (const row of claimOrphans(now)) {
    try {
      resumed.push(resumeJob(row, rebuild(row)));
    } catch (error) {
      if (!(error instanceof NotRestartable)) console.error("[fernwater] job could not be restarted", error);
      failJobRow(
        row.id,
        error instanceof NotRestartable
          ? error.message
          : `This ${JOB_KIND_NAMES[row.kind]} could not be restarted after the server running it stopped. Start it again.`,
      );
    }
  }
  return resumed;
}

/** Takes up orphaned jobs now and every HEARTBEAT_MS; returns what stops it. */
export function startJobResumer(log: (line: string) => void): () => void {
  const tick = () => {
    try {
      const resumed = resumeOrphans();
      if (resumed.length) log(`[fernwater] restarted ${resumed.length} job(s) of a server process that stopped`);
    } catch (error) {
      log(`[fernwater] taking up stopped jobs failed: ${error instanceof Error ? error.message : String(error)}`);
    }
  };
  tick();
  const timer = setInterval(tick, HEARTBEAT_MS);
  timer.unref();
  return () => clearInterval(timer);
}
