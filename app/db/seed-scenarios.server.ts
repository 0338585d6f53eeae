/**
 * Demo scenarios for the seeded club's tanks, built from the engine's presets and our own
 * invented variants, each stored with its run so the demo opens straight onto charts.
 */
import { getPreset, plantGroupFromForm, ScenarioSchema, simulate, type ScenarioInput } from "~models";
import { REQUEST_RUN_LIMITS, settingsHash, insertRun } from "~/features/runs/simulation.server";
import type { Db } from "~/db/client.server";
import { scenarios, tanks } from "~/db/schema";
import { eq } from "drizzle-orm";

type Tx = Parameters<Parameters<Db["transaction"]>[0]>[0];
type TankKey = "jonah" | "ines" | "theo" | "teacher";

const NO3_TO_N = 0.2259;

function presetInput(id: string): ScenarioInput {
  const preset = getPreset(id);
  if (!preset) throw new Error(`missing preset ${id}`);
  return preset.scenario;
}

/** Jonah's tank as he describes it (also the known run behind his demo readings). */
export const livingRoom: ScenarioInput = {
  water: { volumeL: 120, temperatureC: 25, pH: 7.2, khDkh: 5, startNitrate: 15 * NO3_TO_N },
  fish: { feedGPerDay: 1.0, proteinFraction: 0.42, feedsPerDay: 2, fractionEaten: 0.9 },
  plants: [plantGroupFromForm("stem", { id: "stems", name: "Stem plants", startMassG: 15, maxMassG: 45 })],
  filter: { capacityMgTanPerDay: 600, cleaningIntervalDays: 30 },
  maintenance: { waterChangeIntervalDays: 7, waterChangeFraction: 0.25, gravelCleaningFraction: 0.2 },
  tapWater: { nitrate: 10 * NO3_TO_N, khDkh: 6 },
  run: { lengthDays: 180 },
};

/**
 * The answer to "what keeps nitrate within the target?": the target finder, run with the engine
 * on the baseline for the tank's 20 mg/L NO3 ceiling, says feed at most 0.375 g a day (the other
 * levers cannot do it: even 95 % of the water weekly leaves it above). 0.35 g, a round amount under
 * that ceiling, keeps every day of the run inside the band; tests/integration/demo-story.test.ts
 * runs the finder again and checks both.
 */
export const DEMO_TARGET_FEED_G = 0.35;
export const DEMO_TARGET_SCENARIO = "Feeding 0.35 g a day (within the target)";

const DEMO: Record<TankKey, { name: string; input: ScenarioInput }[]> = {
  jonah: [
    { name: "Baseline", input: livingRoom },
    {
      name: "With floating plants",
      input: {
        ...livingRoom,
        plants: [
          ...(livingRoom.plants ?? []),
          plantGroupFromForm("floating", { id: "float", name: "Floating plants", startMassG: 2, maxMassG: 12 }),
        ],
      },
    },
    { name: "Feeding less", input: { ...livingRoom, fish: { ...livingRoom.fish, feedGPerDay: 0.6 } } },
    {
      name: DEMO_TARGET_SCENARIO,
      input: { ...livingRoom, fish: { ...livingRoom.fish, feedGPerDay: DEMO_TARGET_FEED_G } },
    },
  ],
  ines: [{ name: "Mosses and floaters", input: presetInput("fern-hollow") }],
  theo: [
    {
      name: "As kept now",
      input: { ...presetInput("crowded-reach"), tapWater: { nitrate: 30 * NO3_TO_N, khDkh: 10 } },
    },
    {
      name: "Half the change water from RO",
      input: { ...presetInput("crowded-reach"), tapWater: { nitrate: 30 * NO3_TO_N, khDkh: 10, roShare: 0.5 } },
    },
  ],
  teacher: [
    { name: "A new tank cycling without fish", input: presetInput("first-light-fishless") },
    {
      name: "The same at pH 8 and 28 °C",
      input: {
        ...presetInput("first-light-fishless"),
        water: { ...presetInput("first-light-fishless").water, pH: 8, temperatureC: 28 },
      },
    },
  ],
};

export function seedDemoScenarios(tx: Tx, tankIds: Record<TankKey, number>): void {
  for (const [key, list] of Object.entries(DEMO) as [TankKey, (typeof DEMO)[TankKey]][]) {
    const tank = tx.select().from(tanks).where(eq(tanks.id, tankIds[key])).get()!;
    for (const { name, input } of list) {
      const parsed = ScenarioSchema.parse(input);
      const settings = {
        ...parsed,
        targets: { nitrateLow: tank.nitrateTargetLow, nitrateHigh: tank.nitrateTargetHigh },
      };
      const id = tx
        .insert(scenarios)
        .values({ tankId: tank.id, name, settings, schemaVersion: settings.schemaVersion })
        .returning({ id: scenarios.id })
        .get().id;
      insertRun(tx, id, settingsHash(settings), simulate(settings, REQUEST_RUN_LIMITS));
    }
  }
}
