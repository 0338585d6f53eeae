import { eq } from "drizzle-orm";
import { ScenarioSchema, type ScenarioInput } from "../../models";
import { getDb } from "~/db/client.server";
import { scenarios, tanks } from "~/db/schema";
import { saveScenarioWithRun } from "~/features/scenarios/scenario-api.server";

export function createTank(ownerId: number, name = "Test tank"): number {
  return getDb().insert(tanks).values({ ownerId, name }).returning({ id: tanks.id }).get().id;
}

/** A scenario stored with its run, as the setup form would leave it. */
export async function createScenario(
  ownerId: number,
  tankId: number,
  input: ScenarioInput = {},
  name = "Baseline",
): Promise<number> {
  const tank = getDb()
    .select()
    .from(tanks)
    .all()
    .find((t) => t.id === tankId && t.ownerId === ownerId)!;
  return saveScenarioWithRun(tank, "new", name, ScenarioSchema.parse(input));
}

export function countScenarios(): number {
  return getDb().select().from(scenarios).all().length;
}

/** The form fields the setup page would post for a scenario (metric units, percent shares). */
export function setupFormFields(overrides: Record<string, string | number> = {}): Record<string, string | number> {
  return {
    intent: "save",
    name: "Form scenario",
    "water.volumeL": 100,
    "water.temperatureC": 25,
    "water.pH": 7.2,
    "water.khDkh": 5,
    "water.startTan": 0,
    "water.startNitrite": 0,
    "water.startNitrate": 10,
    "water.phFollowsKh": "false",
    "fish.feedGPerDay": 1,
    "fish.proteinFraction": 42,
    "fish.feedsPerDay": 2,
    "fish.fractionEaten": 90,
    "fish.leftoversRemoved": "false",
    "fish.pulsedFeeding": "false",
    "maintenance.waterChangeIntervalDays": 7,
    "maintenance.waterChangeFraction": 25,
    "run.lengthDays": 60,
    "run.outputIntervalDays": 1,
    ...overrides,
  };
}

/** Dates a scenario's day 0, so readings and journal entries at known dates line up with model days. */
export function startScenarioOn(scenarioId: number, startMs: number): void {
  getDb()
    .update(scenarios)
    .set({ startDate: new Date(startMs) })
    .where(eq(scenarios.id, scenarioId))
    .run();
}
