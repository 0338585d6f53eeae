/** Following a job through its API, as the sweep and calibration pages do. */
import { expect } from "vitest";
import type { JobJson } from "~/features/jobs/jobs.server";
import { loader as jobApi } from "~/routes/api/job";
import { call, get } from "./routes";

/** Polls the job API like the page does, recording each progress count, until the job stops running. */
export async function pollJob(id: string, cookie: string): Promise<{ job: JobJson; seen: number[] }> {
  const seen: number[] = [];
  for (let i = 0; i < 4000; i++) {
    const r = await call(jobApi, get(`/api/jobs/${id}`, cookie), { jobId: id });
    expect(r.status).toBe(200);
    seen.push(r.data.job.done);
    if (r.data.job.status !== "running") return { job: r.data.job, seen };
    await new Promise((res) => setTimeout(res, 3));
  }
  throw new Error("the job did not end");
}
