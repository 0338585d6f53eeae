/**
 * The journal's model runs (the replay, the forecast and its search) go through the engine
 * pool's interactive lane like other runs a page waits for, so a long journal never holds the
 * request thread and one person's runs take turns with everyone else's.
 *
 * Each run counts against the tank owner's runs in flight (run-gate.server.ts), and a run is
 * kept for a while by its exact inputs: the journal page reruns the replay and about ten
 * forecast runs on every load, so reloads would otherwise keep the pool busy. The engine is
 * deterministic, so equal inputs give an equal result; concurrent asks for the same inputs
 * share one run.
 */
import { createHash } from "node:crypto";
import { LRUCache } from "lru-cache";
import { ModelError, type Scenario, type SimulationResult, type TankEventInput } from "~models";
import { getEnginePool } from "~/features/jobs/engine-pool.server";
import { takeRunSlot } from "~/features/runs/run-gate.server";
import { REQUEST_RUN_LIMITS } from "~/features/runs/simulation.server";

type RunAsked = { ownerId: number | null; scenario: Scenario; events: TankEventInput[] };
/** Up to 200 runs for 10 minutes (a day's replay is a few hundred kB; the forecast's search about ten runs). */
const kept = new LRUCache<string, SimulationResult, RunAsked>({
  max: 200,
  ttl: 10 * 60_000,
  // The first asker's inputs run; later askers with the same key have equal ones.
  fetchMethod: async (_key, _stale, { context: { ownerId, scenario, events } }) => {
    const release = ownerId === null ? () => {} : await takeRunSlot(ownerId);
    try {
      return await runOnPool(scenario, events, ownerId);
    } finally {
      release();
    }
  },
});

async function runOnPool(scenario: Scenario, events: TankEventInput[], ownerId: number | null) {
  const answer = await getEnginePool().run(
    { kind: "simulate", scenario, limits: { ...REQUEST_RUN_LIMITS, events } },
    { lane: "interactive", owner: ownerId === null ? "anyone" : `user:${ownerId}` },
  );
  if (answer.kind !== "simulate") throw new Error(`The engine pool answered a ${answer.kind} task to a run`);
  if (answer.error)
    throw new ModelError(answer.error.code, answer.error.message, {
      day: answer.error.day,
      detail: answer.error.detail,
    });
  return answer.result!;
}

/**
 * One run with the journal's events, for `ownerId` (null: the server's own, e.g. a test);
 * throws ModelError as simulate() does, or RunRefused when the owner has runs enough going.
 */
export async function simulateOnPool(
  scenario: Scenario,
  events: TankEventInput[],
  ownerId: number | null,
): Promise<SimulationResult> {
  const key = createHash("sha256").update(JSON.stringify({ scenario, events })).digest("base64url");
  return (await kept.fetch(key, { context: { ownerId, scenario, events } }))!;
}

/** Forgets the kept runs (tests). */
export function forgetJournalRuns(): void {
  kept.clear();
}
