/**
 * Tanks and scenarios as their owner sees them. Every lookup is scoped to the owner: another
 * person's tank or scenario answers 404 (notFound), so its existence does not leak.
 */
import { and, asc, eq } from "drizzle-orm";
import { getDb } from "~/db/client.server";
import { scenarios, tanks } from "~/db/schema";
import { notFound } from "~/permissions.server";

export type TankRow = typeof tanks.$inferSelect;
export type ScenarioRow = typeof scenarios.$inferSelect;

/** Route params are strings; anything but a positive integer id is simply "not found". */
export function parseId(raw: string | undefined): number {
  if (!raw || !/^\d{1,12}$/.test(raw)) notFound();
  const id = Number(raw);
  if (!Number.isSafeInteger(id) || id <= 0) notFound();
  return id;
}

export function requireOwnedTank(userId: number, tankIdParam: string | undefined): TankRow {
  const tankId = parseId(tankIdParam);
  const tank = getDb()
    .select()
    .from(tanks)
    .where(and(eq(tanks.id, tankId), eq(tanks.ownerId, userId)))
    .get();
  if (!tank) notFound("There is no such tank among yours.");
  return tank;
}

export function requireOwnedScenario(
  userId: number,
  tankIdParam: string | undefined,
  scenarioIdParam: string | undefined,
): { tank: TankRow; scenario: ScenarioRow } {
  const tank = requireOwnedTank(userId, tankIdParam);
  const scenarioId = parseId(scenarioIdParam);
  const scenario = getDb()
    .select()
    .from(scenarios)
    .where(and(eq(scenarios.id, scenarioId), eq(scenarios.tankId, tank.id)))
    .get();
  if (!scenario) notFound("There is no such scenario in this tank.");
  return { tank, scenario };
}

/** A scenario by id alone, for the API (owner checked through its tank). */
export function requireOwnedScenarioById(userId: number, scenarioIdParam: string | undefined): { tank: TankRow; scenario: ScenarioRow } {
  const scenarioId = parseId(scenarioIdParam);
  const row = getDb()
    .select({ scenario: scenarios, tank: tanks })
    .from(scenarios)
    .innerJoin(tanks, eq(tanks.id, scenarios.tankId))
    .where(and(eq(scenarios.id, scenarioId), eq(tanks.ownerId, userId)))
    .get();
  if (!row) notFound("There is no such scenario among yours.");
  return row;
}

export function listScenarios(tankId: number): ScenarioRow[] {
  return getDb().select().from(scenarios).where(eq(scenarios.tankId, tankId)).orderBy(asc(scenarios.createdAt), asc(scenarios.id)).all();
}
