/**
 * The journal's model runs (the replay, the forecast and its search) go through the engine
 * pool's interactive lane like other runs a page waits for, so a long journal never holds the
 * request thread and one person's runs take turns with everyone else's.
 */
import { ModelError, type Scenario, type SimulationResult, type TankEventInput } from "~models";
import { getEnginePool } from "~/features/jobs/engine-pool.server";
import { REQUEST_RUN_LIMITS } from "~/features/runs/simulation.server";

/** One run with the journal's events on the pool; throws ModelError as simulate() does. */
export async function simulateOnPool(
  scenario: Scenario,
  events: TankEventInput[],
  owner: string,
): Promise<SimulationResult> {
  const answer = await getEnginePool().run(
    { kind: "simulate", scenario, limits: { ...REQUEST_RUN_LIMITS, events } },
    { lane: "interactive", owner },
  );
  if (answer.kind !== "simulate") throw new Error(`The engine pool answered a ${answer.kind} task to a run`);
  if (answer.error)
    throw new ModelError(answer.error.code, answer.error.message, {
      day: answer.error.day,
      detail: answer.error.detail,
    });
  return answer.result!;
}
