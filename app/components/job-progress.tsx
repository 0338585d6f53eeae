/**
 * Progress of a server job (sweep, calibration, target search): polls /api/jobs/:id with a
 * fetcher while the job runs, draws a progress bar that moves as engine runs finish, and a
 * cancel button that works with or without JavaScript (without it, the page refreshes itself
 * while the job runs).
 */
import { useEffect } from "react";
import { useFetcher } from "react-router";
import { ProgressBar } from "~/components/ui/progress-bar";
import type { JobJson } from "~/features/jobs/job-json";

/** How often a running job is asked for its progress, ms. */
const POLL_MS = 300;

/** Whether a job may still change: running, or waiting in line to run. */
export function jobActive(job: Pick<JobJson, "status"> | null | undefined): boolean {
  return job?.status === "running" || job?.status === "waiting";
}

/** The job as last heard of: the loader's copy, then each poll's answer. */
export function useJob(initial: JobJson | null): JobJson | null {
  const fetcher = useFetcher<{ job: JobJson }>();
  const polled = fetcher.data?.job;
  const job =
    polled && initial && polled.id === initial.id && (jobActive(initial) || !jobActive(polled)) ? polled : initial;
  const { load, state } = fetcher;
  const running = jobActive(job);
  const id = job?.id;
  const done = job?.done;
  useEffect(() => {
    if (!running || !id || state !== "idle") return;
    const timer = setTimeout(() => load(`/api/jobs/${id}`), POLL_MS);
    return () => clearTimeout(timer);
  }, [running, id, done, state, load, polled]);
  return job;
}

const STATUS_TEXT: Record<JobJson["status"], string> = {
  waiting: "Waiting",
  running: "Running",
  done: "Done",
  failed: "Stopped",
  cancelled: "Cancelled",
};

/**
 * The bar, the count and the cancel button. `noun` counts the steps ("runs"); the cancel form
 * posts `intent=cancel` and `jobId` to the page's own action.
 */
export function JobProgress({ job, noun = "engine runs" }: { job: JobJson; noun?: string }) {
  const cancel = useFetcher();
  const running = jobActive(job);
  const seconds = (job.elapsedMs / 1000).toFixed(1);
  return (
    <div className="space-y-2" aria-live="polite">
      {/* Without JavaScript nothing polls: the page reloads itself until the job ends. */}
      {running ? (
        <noscript>
          <meta httpEquiv="refresh" content="2" />
        </noscript>
      ) : null}
      <div className="flex flex-wrap items-center gap-3">
        <span id={`job-${job.id}-label`} className="text-sm font-semibold">
          {job.status === "waiting"
            ? `Waiting, ${job.ahead} ahead: other people's runs go first, then this one starts by itself`
            : `${STATUS_TEXT[job.status]}: ${job.done} of ${job.total} ${noun}`}
        </span>
        <span className="text-xs text-stone-600">{seconds} s</span>
        {running ? (
          <cancel.Form method="post">
            <input type="hidden" name="intent" value="cancel" />
            <input type="hidden" name="jobId" value={job.id} />
            <button type="submit" className="btn-secondary py-1" disabled={cancel.state !== "idle"}>
              {cancel.state === "idle" ? "Cancel" : "Cancelling…"}
            </button>
          </cancel.Form>
        ) : null}
      </div>
      <ProgressBar
        id={`job-${job.id}`}
        max={Math.max(1, job.total)}
        value={job.done}
        labelledBy={`job-${job.id}-label`}
        valueText={`${job.done} of ${job.total} ${noun}`}
      />
      {job.note && job.status !== "cancelled" ? <p className="text-sm text-stone-700">{job.note}</p> : null}
      {job.status === "failed" && job.error ? (
        <p className="text-sm font-semibold text-red-800" role="alert">
          {job.error}
        </p>
      ) : null}
      {job.status === "cancelled" ? (
        <p className="text-sm text-stone-700">
          Cancelled after {job.done} {noun}.
        </p>
      ) : null}
    </div>
  );
}
