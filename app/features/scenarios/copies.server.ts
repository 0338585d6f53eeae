/**
 * Copying a scenario into someone's own tanks: "Copy to my tanks" on a share page and a
 * student's lesson copy. The engine runs first (outside the transaction: better-sqlite3 is
 * synchronous), then the new tank if any, the scenario, its run and the caller's own rows are
 * written in one transaction, so nothing is ever half-copied.
 */
import type { Scenario } from "~models";
import { getDb } from "~/db/client.server";
import { tanks } from "~/db/schema";
import { checkNewTank } from "~/quotas.server";
import { insertScenarioWithRun, write } from "~/features/scenarios/scenario-api.server";
import { runEngineForStorage, withTankTargets } from "~/features/runs/simulation.server";
import type { TankRow } from "~/features/tanks/tanks.server";

type Tx = Parameters<Parameters<ReturnType<typeof getDb>["transaction"]>[0]>[0];

export type CopyDestination = { tank: TankRow } | { newTank: { name: string; notes: string } };

/**
 * Copies `settings` into the destination. A new tank takes the nitrate band the settings were
 * made with, so the copy's chart and key figures match what the person saw.
 * Throws ModelError when the engine cannot run the settings, RunRefused or QuotaExceeded.
 */
export async function copyScenarioInto(
  ownerId: number,
  destination: CopyDestination,
  name: string,
  settings: Scenario,
  copiedFromId: number | null,
  also?: (tx: Tx, ids: { tankId: number; scenarioId: number }) => void,
): Promise<{ tankId: number; scenarioId: number }> {
  const band =
    "tank" in destination
      ? destination.tank
      : { nitrateTargetLow: settings.targets.nitrateLow, nitrateTargetHigh: settings.targets.nitrateHigh };
  const scenario = withTankTargets(settings, band);
  const result = await runEngineForStorage(scenario, { userId: ownerId, purpose: "save" });
  return write((tx) => {
    if (!("tank" in destination)) checkNewTank(tx, ownerId);
    const tankId =
      "tank" in destination
        ? destination.tank.id
        : tx
            .insert(tanks)
            .values({ ownerId, name: destination.newTank.name, notes: destination.newTank.notes, ...band })
            .returning({ id: tanks.id })
            .get().id;
    const scenarioId = insertScenarioWithRun(tx, tankId, name, scenario, result, copiedFromId);
    also?.(tx, { tankId, scenarioId });
    return { tankId, scenarioId };
  });
}
