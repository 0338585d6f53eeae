/**
 * Tanks and scenarios as their owner sees them. Every lookup is scoped to the owner: another
 * person's tank or scenario answers 404 (notFound), so its existence does not leak.
 */
import { and, asc, eq, inArray, sql } from "drizzle-orm";
import { getDb, type Db } from "~/db/client.server";
import { scenarios, tanks } from "~/db/schema";
import { notFound } from "~/permissions.server";

export type TankRow = typeof tanks.$inferSelect;
export type ScenarioRow = typeof scenarios.$inferSelect;

/** Route params are strings; anything but a positive integer id is simply "not found" (with `message`). */
export function parseId(raw: string | undefined, message?: string): number {
  if (!raw || !/^\d{1,12}$/.test(raw)) notFound(message);
  const id = Number(raw);
  if (!Number.isSafeInteger(id) || id <= 0) notFound(message);
  return id;
}

// Every tank and scenario page looks these up: prepared once per database, not rebuilt per request.
const statements = new WeakMap<Db, ReturnType<typeof prepare>>();
function prepare(db: Db) {
  return {
    ownedTank: db
      .select()
      .from(tanks)
      .where(and(eq(tanks.id, sql.placeholder("tankId")), eq(tanks.ownerId, sql.placeholder("userId"))))
      .prepare(),
    scenarioInTank: db
      .select()
      .from(scenarios)
      .where(and(eq(scenarios.id, sql.placeholder("scenarioId")), eq(scenarios.tankId, sql.placeholder("tankId"))))
      .prepare(),
  };
}
function prepared() {
  const db = getDb();
  let s = statements.get(db);
  if (!s) statements.set(db, (s = prepare(db)));
  return s;
}

export function requireOwnedTank(userId: number, tankIdParam: string | undefined): TankRow {
  const message = "There is no such tank among yours.";
  const tank = prepared().ownedTank.get({ tankId: parseId(tankIdParam, message), userId });
  if (!tank) notFound(message);
  return tank;
}

export function requireOwnedScenario(
  userId: number,
  tankIdParam: string | undefined,
  scenarioIdParam: string | undefined,
): { tank: TankRow; scenario: ScenarioRow } {
  const tank = requireOwnedTank(userId, tankIdParam);
  const message = "There is no such scenario in this tank.";
  const scenario = prepared().scenarioInTank.get({ scenarioId: parseId(scenarioIdParam, message), tankId: tank.id });
  if (!scenario) notFound(message);
  return { tank, scenario };
}

/** A scenario by id alone, for the API (owner checked through its tank). */
export function requireOwnedScenarioById(
  userId: number,
  scenarioIdParam: string | undefined,
): { tank: TankRow; scenario: ScenarioRow } {
  const message = "There is no such scenario among yours.";
  const scenarioId = parseId(scenarioIdParam, message);
  const row = getDb()
    .select({ scenario: scenarios, tank: tanks })
    .from(scenarios)
    .innerJoin(tanks, eq(tanks.id, scenarios.tankId))
    .where(and(eq(scenarios.id, scenarioId), eq(tanks.ownerId, userId)))
    .get();
  if (!row) notFound(message);
  return row;
}

export function listScenarios(tankId: number): ScenarioRow[] {
  return getDb()
    .select()
    .from(scenarios)
    .where(eq(scenarios.tankId, tankId))
    .orderBy(asc(scenarios.createdAt), asc(scenarios.id))
    .all();
}

/** The scenarios of each of `tankIds`' tanks, oldest first as `listScenarios` lists them, in one query. */
export function listScenariosOf(tankIds: readonly number[]): Map<number, ScenarioRow[]> {
  const out = new Map<number, ScenarioRow[]>();
  if (tankIds.length === 0) return out;
  const rows = getDb()
    .select()
    .from(scenarios)
    .where(inArray(scenarios.tankId, [...tankIds]))
    .orderBy(asc(scenarios.createdAt), asc(scenarios.id))
    .all();
  for (const row of rows) out.set(row.tankId, [...(out.get(row.tankId) ?? []), row]);
  return out;
}
