/**
 * This process's jobs and its line (app/features/jobs/jobs.server.ts is what routes call): the
 * jobs it runs or holds waiting, the order they start in (by when they were asked for, so a
 * restarted job keeps its place), how many may run at once (per pool worker), and the heartbeat
 * that tells other processes these jobs are alive.
 */
import { getEnginePool } from "~/features/jobs/engine-pool.server";
import { JOB_LIMITS } from "~/features/jobs/job-limits.server";
import { beat, HEARTBEAT_MS, type Job, readJobRow, waitingAhead } from "~/features/jobs/job-rows.server";
import { beginner, type JobContext } from "~/features/jobs/job-work.server";

/** This process's jobs that are running or waiting (finished ones live in the table only). */
const jobs = new Map<string, Job>();
/** Jobs waiting to run here, in the order they were asked for, with what starts them. */
const line: { job: Job; begin: () => void }[] = [];

/** This process's job with this id, or undefined. */
export function localJob(id: string): Job | undefined {
  return jobs.get(id);
}

/** Whether a new job must wait: every running place is taken, or others already wait. */
export function mustWait(): boolean {
  return runningHere() >= capacity() || line.length > 0;
}

/**
 * Registers `job` here and either begins its work now or puts it in line by when it was asked
 * for; then starts whatever waiting jobs fit.
 */
export function admit<R, P>(job: Job<R, P>, work: (ctx: JobContext<P>) => Promise<R>, wait: boolean): void {
  const begin = launch(job, work);
  if (!wait) return begin();
  const i = line.findIndex((w) => w.job.startedAt > job.startedAt);
  if (i < 0) line.push({ job: job as Job, begin });
  else line.splice(i, 0, { job: job as Job, begin });
  admitWaiting();
}

/** Takes a waiting job out of the line and out of this process (it was cancelled). */
export function leaveLine(job: Job): void {
  jobs.delete(job.id);
  const i = line.findIndex((w) => w.job === job);
  if (i >= 0) line.splice(i, 1);
}

/** Empties this process's jobs and line (a stop or a test) and returns the jobs it held. */
export function dropLocalJobs(): Job[] {
  const held = [...jobs.values()];
  jobs.clear();
  line.splice(0);
  return held;
}

/** How many jobs are ahead of this one in line (0 when it is next, or running). */
export function jobsAhead(job: Job): number {
  if (job.status !== "waiting") return 0;
  if (jobs.get(job.id) === job)
    return Math.max(
      0,
      line.findIndex((w) => w.job === job),
    );
  const row = readJobRow(job.id);
  return row ? waitingAhead(row) : 0;
}

function capacity(): number {
  return JOB_LIMITS.runningPerWorker * getEnginePool().size;
}

function runningHere(): number {
  let n = 0;
  for (const j of jobs.values()) if (j.status === "running") n++;
  return n;
}

/** Starts waiting jobs while there is room, oldest first (skipping any cancelled through another process). */
function admitWaiting(): void {
  let running = runningHere();
  while (running < capacity() && line.length) {
    const next = line.shift()!;
    if (next.job.status !== "waiting") continue;
    const row = readJobRow(next.job.id);
    if (!row || row.status !== "waiting") {
      next.job.status = row?.status ?? "cancelled";
      next.job.finishedAt = row?.finishedAt ?? Date.now();
      jobs.delete(next.job.id);
      continue;
    }
    running++;
    next.begin();
  }
}

/** Registers a job of this process and returns what begins its work (now, or when its turn comes). */
function launch<R, P>(job: Job<R, P>, work: (ctx: JobContext<P>) => Promise<R>): () => void {
  jobs.set(job.id, job as Job);
  keepBeating();
  return beginner(
    job,
    work,
    // Writes only while the job is still this process's (not released by a stop, nor cleared).
    () => jobs.get(job.id) === (job as Job),
    () => {
      jobs.delete(job.id);
      admitWaiting();
    },
  );
}

let heartbeat: NodeJS.Timeout | null = null;
/** Keeps this process's jobs alive in the table while it has any (see job-rows.server.ts). */
function keepBeating(): void {
  if (jobs.size && !heartbeat) {
    heartbeat = setInterval(() => {
      if (!jobs.size) {
        clearInterval(heartbeat!);
        heartbeat = null;
        return;
      }
      beat([...jobs.keys()]);
    }, HEARTBEAT_MS);
    heartbeat.unref();
  }
}
