/**
 * What a poll of /api/jobs/:id answers, written out so browser code (the progress bar, the
 * sweep and calibration pages) can use it without importing the server's job registry.
 */

export type JobKind = "sweep" | "calibration" | "target";

/** Each kind in words ("a sweep" is `a ${JOB_KIND_NAMES.sweep}`). */
export const JOB_KIND_NAMES: Record<JobKind, string> = {
  sweep: "sweep",
  calibration: "calibration",
  target: "target search",
};
export type JobStatus = "waiting" | "running" | "done" | "failed" | "cancelled";

export type JobJson<R = unknown, P = unknown> = {
  id: string;
  kind: JobKind;
  label: string;
  /** What the job was started with (the page redraws its form from it). */
  params: unknown;
  status: JobStatus;
  /** Jobs ahead of this one in line while it waits (0 otherwise). */
  ahead: number;
  done: number;
  total: number;
  partial: P | null;
  result: R | null;
  error: string | null;
  startedAt: string;
  finishedAt: string | null;
  elapsedMs: number;
  /** Set when the job is being, or was, run again because the server process running it stopped. */
  note: string | null;
};
