import { modeOf } from "./listen-host.mjs";

/**
 * How many app processes to start: WEB_CONCURRENCY when set (a whole number ≥ 1), else one per
 * core in production and one in local mode (a keeper's laptop needs no more).
 */
export function webConcurrency(env, cores) {
  const raw = (env.WEB_CONCURRENCY ?? "").trim();
  if (raw) {
    const n = Number(raw);
    if (!Number.isInteger(n) || n < 1 || n > 64) {
      throw new Error(`WEB_CONCURRENCY must be a whole number from 1 to 64 (got "${raw}")`);
    }
    return n;
  }
  return modeOf(env) === "production" ? Math.max(1, cores) : 1;
}
