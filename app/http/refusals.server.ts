/**
 * The typed errors a request can end in, and the HTTP status each means. Feature code throws
 * them once (the engine's ModelError, RunRefused, QuotaExceeded, JobRefused); only the route edge
 * turns them into an answer — pages through formRefusal/runProblem (app/http/pages.server.ts),
 * the API through apiRoute (app/http/api.server.ts).
 */
import { isModelError } from "~models";
import { JobRefused } from "~/features/jobs/job-limits.server";
import { RunRefused } from "~/features/runs/run-gate.server";
import { QuotaExceeded } from "~/quotas.server";
import { ListingRefused } from "~/http/listing-turns.server";

export type Refusal = {
  /** What went wrong: the model could not run the settings, a limit, a quota, the job line. */
  kind: "model" | "limit" | "quota" | "busy";
  status: 413 | 422 | 429 | 503;
  message: string;
};

/** The refusal a typed error stands for, or null for anything else (a bug: let it through). */
export function refusalOf(error: unknown): Refusal | null {
  if (isModelError(error)) return { kind: "model", status: 422, message: error.message };
  if (error instanceof RunRefused) return { kind: "limit", status: 429, message: error.message };
  if (error instanceof ListingRefused) return { kind: "limit", status: 429, message: error.message };
  if (error instanceof QuotaExceeded) return { kind: "quota", status: 413, message: error.message };
  if (error instanceof JobRefused)
    return { kind: error.status === 429 ? "limit" : "busy", status: error.status, message: error.message };
  return null;
}
