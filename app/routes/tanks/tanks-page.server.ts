import { desc, eq, inArray } from "drizzle-orm";
import { z } from "zod";
import type { KeyFigures } from "~models";
import { getDb } from "~/db/client.server";
import { runs, scenarios, tanks } from "~/db/schema";

export const TankNameSchema = z
  .string({ error: "Give the tank a name." })
  .trim()
  .min(1, "Give the tank a name.")
  .max(80, "Keep the name under 80 characters.");

export const TankNotesSchema = z.string().trim().max(2000, "Keep the notes under 2,000 characters.").default("");

/** Newest run's key figures per tank (one query for all the tanks of a list). */
export function latestFiguresByTank(tankIds: number[]): Map<number, { scenarioName: string; keyFigures: KeyFigures }> {
  const out = new Map<number, { scenarioName: string; keyFigures: KeyFigures }>();
  if (tankIds.length === 0) return out;
  const rows = getDb()
    .select({ tankId: scenarios.tankId, scenarioName: scenarios.name, keyFigures: runs.keyFigures })
    .from(runs)
    .innerJoin(scenarios, eq(scenarios.id, runs.scenarioId))
    .innerJoin(tanks, eq(tanks.id, scenarios.tankId))
    .where(inArray(scenarios.tankId, tankIds))
    .orderBy(desc(runs.id))
    .all();
  for (const r of rows) {
    if (!out.has(r.tankId)) out.set(r.tankId, { scenarioName: r.scenarioName, keyFigures: r.keyFigures as KeyFigures });
  }
  return out;
}
