/**
 * A new scenario made from another with some settings changed (fitted multipliers, a target the
 * finder found): it keeps the source's day 0 on the calendar, so the tank's readings line up
 * with it the same way, and remembers where it came from.
 */
import { eq } from "drizzle-orm";
import type { Scenario } from "~models";
import { scenarios } from "~/db/schema";
import { insertScenarioWithRun, write } from "~/features/scenarios/scenario-api.server";
import { runEngineForStorage, withTankTargets } from "~/features/runs/simulation.server";
import type { TankRow } from "~/features/tanks/tanks.server";

/**
 * Runs `settings` (with the tank's targets) and stores them as a new scenario with its run and
 * start date in one transaction; returns the new id. Throws ModelError, RunRefused or
 * QuotaExceeded (the route's edge answers them).
 */
export async function saveScenarioVariant(
  tank: TankRow,
  sourceId: number,
  startMs: number | null,
  name: string,
  settings: Scenario,
): Promise<number> {
  const scenario = withTankTargets(settings, tank);
  const result = await runEngineForStorage(scenario, { userId: tank.ownerId, purpose: "save" });
  return write((tx) => {
    const id = insertScenarioWithRun(tx, tank.id, name, scenario, result, sourceId);
    if (startMs === null) return id;
    tx.update(scenarios)
      .set({ startDate: new Date(startMs) })
      .where(eq(scenarios.id, id))
      .run();
    return id;
  });
}
