/**
 * A second app process on the test's SQLite file (spawned by tests/integration/job-resume.test.ts
 * with its DATABASE_URL): it takes up orphaned jobs (`resumeAt`, the claim's clock) and/or starts
 * sweeps the way the sweep page does, waits until the first has `stopAfterDone` runs done, prints
 * the job ids and its instance name, and stops: `kill` with SIGKILL (a crash: no cleanup) or
 * `release` the way a normal stop does (server/boot.ts); or (`claimLoop`) it only claims, in a loop.
 */
import { eq } from "drizzle-orm";
import { getDb } from "~/db/client.server";
import { users } from "~/db/schema";
import { claimOrphans } from "~/features/jobs/job-claims.server";
import { resumeOrphans } from "~/features/jobs/job-resume.server";
import { releaseLocalJobs, type Job, startJob } from "~/features/jobs/jobs.server";
import { readStoredSettings, withTankTargets } from "~/features/runs/simulation.server";
import { sweepJob, sweepInputSchema, sweepLevers } from "~/features/sweeps/sweeps.server";
import { requireOwnedScenarioById } from "~/features/tanks/tanks.server";
import { INSTANCE } from "~/instance.server";
import { displayUnitsFor } from "~/utils/display-units";

type Plan = {
  start?: { userId: number; scenarioId: number; input: unknown }[];
  resumeAt?: number;
  /** Claim only: say "ready", then claim again and again until a line comes on stdin; print all it took. */
  claimLoop?: boolean;
  stopAfterDone?: number;
  stop?: "kill" | "release";
};

const plan = JSON.parse(process.argv[2]) as Plan;
const sleep = (ms: number) => new Promise((r) => setTimeout(r, ms));

if (plan.claimLoop) {
  let stop = false;
  process.stdin.once("data", () => (stop = true));
  process.stdout.write("ready\n");
  const ids: string[] = [];
  while (!stop) {
    ids.push(...claimOrphans().map((r) => r.id));
    await new Promise((r) => setImmediate(r));
  }
  process.stdout.write(JSON.stringify({ ids, instance: INSTANCE }) + "\n", () => process.exit(0));
} else {
  const started: Job[] = plan.resumeAt ? resumeOrphans(plan.resumeAt) : [];
  for (const s of plan.start ?? []) {
    const user = getDb().select().from(users).where(eq(users.id, s.userId)).get()!;
    const { tank, scenario: row } = requireOwnedScenarioById(user.id, String(s.scenarioId));
    const scenario = withTankTargets(readStoredSettings(row.settings)!, tank);
    const units = displayUnitsFor(user);
    const input = sweepInputSchema(sweepLevers(scenario), units, user.role).parse(s.input);
    started.push(startJob(sweepJob(user, row.id, scenario, input, units)));
    await sleep(3); // distinct start times, so the line's order is unambiguous
  }
  while (started.length && started[0].done < (plan.stopAfterDone ?? 0)) await sleep(1);
  const out = JSON.stringify({ ids: started.map((j) => j.id), done: started[0]?.done ?? 0, instance: INSTANCE }) + "\n";
  if (plan.stop === "release") {
    releaseLocalJobs();
    process.stdout.write(out, () => process.exit(0));
  } else {
    process.stdout.write(out, () => process.kill(process.pid, "SIGKILL"));
  }
}
