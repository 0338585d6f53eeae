import type { Route } from "./+types/job";
import { apiError, apiRoute, json } from "~/http/api.server";
import { cancelJob, findJob, jobJson } from "~/features/jobs/jobs.server";
import { requireApiUser } from "~/permissions.server";

const NOT_FOUND = "There is no such job among yours (a finished job is kept for 15 minutes).";

/** GET /api/jobs/:jobId: a sweep's, calibration's or target search's progress, and its result when done. */
export const loader = apiRoute(async ({ request, params }: Route.LoaderArgs) => {
  const user = await requireApiUser(request);
  const job = findJob(user.id, params.jobId ?? "");
  if (!job) return apiError(404, NOT_FOUND);
  return json({ job: jobJson(job) });
});

/** DELETE /api/jobs/:jobId: cancel between engine runs (a finished job stays as it was). */
export const action = apiRoute(async ({ request, params }: Route.ActionArgs) => {
  if (request.method !== "DELETE") return apiError(405, "Use DELETE to cancel a job.");
  const user = await requireApiUser(request);
  const job = cancelJob(user.id, params.jobId ?? "");
  if (!job) return apiError(404, NOT_FOUND);
  return json({ job: jobJson(job) });
});
