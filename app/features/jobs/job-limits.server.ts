/**
 * What bounds a job (issue 10: nobody ties up the server): the limits of one engine run inside
 * a job, the per-person and per-server caps, and the refusals and keeper-facing failures a job
 * answers with. The registry that applies them is app/features/jobs/jobs.server.ts.
 */
import type { Role } from "~/db/schema";

/** Limits for a run inside a job: like a request's, a bad point fails fast. */
export const JOB_RUN_LIMITS = { maxWallMs: 3000, maxSteps: 300_000 };

/** Limits that keep one person from tying up the server. */
export const JOB_LIMITS = {
  /** Jobs one person may have running at once. */
  runningPerUser: 1,
  /** Sweep points by role. */
  sweepPoints: { keeper: 50, educator: 100, admin: 100 } satisfies Record<Role, number>,
  /** Jobs running at once across everyone, per pool worker (more wait in line). */
  runningPerWorker: 4,
  /** Jobs waiting in line across everyone; past that a start answers 503. */
  maxWaiting: 200,
  /** How long a finished job's result stays readable. */
  keepFinishedMs: 15 * 60_000,
  /** Finished jobs kept per person (the oldest go first). */
  keptPerUser: 5,
} as const;

/** A job refused before it started: 429 (your own limit) or 503 (the line is full). */
export class JobRefused extends Error {
  constructor(
    message: string,
    readonly status: 429 | 503,
  ) {
    super(message);
  }
}

/**
 * An error whose message is meant for the keeper (e.g. "no readings fall within the run"): the
 * job fails with it, and it is not logged as a server fault.
 */
export class KeeperError extends Error {
  override name = "KeeperError";
}
