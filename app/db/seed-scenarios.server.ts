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

const livingRoom: ScenarioInput = {
  water: { volumeL: 120, temperatureC: 25, pH: 7.2, khDkh: 5, startNitrate: 15 * NO3_TO_N },
  fish: { feedGPerDay: 1.0, proteinFraction: 0.42, feedsPerDay: 2, fractionEaten: 0.9 },
  plants: [plantGroupFromForm("stem", { id: "stems", name: "Stem plants", startMassG: 15, maxMassG: 45 })],
  filter: { capacityMgTanPerDay: 600, cleaningIntervalDays: 30 },
  maintenance: { waterChangeIntervalDays: 7, waterChangeFraction: 0.25, gravelCleaningFraction: 0.2 },
  tapWater: { nitrate: 10 * NO3_TO_N, khDkh: 6 },
  run: { lengthDays: 180 },
};

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
  ],
  ines: [{ name: "Mosses and floaters", input: presetInput("fern-hollow") }],
  theo: [
    { name: "As kept now", input: { ...presetInput("crowded-reach"), tapWater: { nitrate: 30 * NO3_TO_N, khDkh: 10 } } },
    {
      name: "Half the change water from RO",
      input: { ...presetInput("crowded-reach"), tapWater: { nitrate: 30 * NO3_TO_N, khDkh: 10, roShare: 0.5 } },
    },
  ],
  teacher: [
    { name: "A new tank cycling without fish", input: presetInput("first-light-fishless") },
    {
      name: "The same at pH 8 and 28 °C",
      input: { ...presetInput("first-light-fishless"), water: { ...presetInput("first-light-fishless").water, pH: 8, temperatureC: 28 } },
    },
  ],
};

export function seedDemoScenarios(tx: Tx, tankIds: Record<TankKey, number>): void {
  for (const [key, list] of Object.entries(DEMO) as [TankKey, (typeof DEMO)[TankKey]][]) {
    const tank = tx.select().from(tanks).where(eq(tanks.id, tankIds[key])).get()!;
    for (const { name, input } of list) {
      const parsed = ScenarioSchema.parse(input);
      const settings = { ...parsed, targets: { nitrateLow: tank.nitrateTargetLow, nitrateHigh: tank.nitrateTargetHigh } };
      const id = tx
        .insert(scenarios)
        .values({ tankId: tank.id, name, settings, schemaVersion: settings.schemaVersion })
        .returning({ id: scenarios.id })
        .get().id;
      insertRun(tx, id, settingsHash(settings), simulate(settings, REQUEST_RUN_LIMITS));
    }
  }
}
