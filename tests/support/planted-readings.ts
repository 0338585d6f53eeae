/**
 * Test readings the engine itself made for the planted tank (tests/support/planted-scenario.ts)
 * with feed load ×1.25, every four days from day 2 to day 58 of a run dated from 1 January 2026:
 * our own worked example, for the calibration tests to fit back.
 */
import { getDb } from "~/db/client.server";
import { readings } from "~/db/schema";
import { runEngineTask } from "~/features/jobs/engine-tasks.server";
import { ScenarioSchema } from "../../models/index";
import { PLANTED } from "./planted-scenario";
import { startScenarioOn } from "./tanks";

const DAY = 86_400_000;
export const PLANTED_START_MS = Date.UTC(2026, 0, 1);
/** The true multiplier the readings were made with. */
const PLANTED_TRUE_FEED_LOAD = 1.25;

type Options = {
  /** Store the TAN readings too (nitrate only otherwise). */
  tan?: boolean;
  /** mg N/L added to nitrate from day 30 on: a jump nothing logged explains. */
  unloggedJumpMgN?: number;
};

/** Dates the scenario from PLANTED_START_MS and stores the tank's readings; returns their model days. */
export function storePlantedReadings(
  tankId: number,
  scenarioId: number,
  { tan = true, unloggedJumpMgN = 0 }: Options = {},
) {
  startScenarioOn(scenarioId, PLANTED_START_MS);
  const days = Array.from({ length: 15 }, (_v, i) => 2 + 4 * i);
  const truth = ScenarioSchema.parse({ ...PLANTED, multipliers: { feedLoad: PLANTED_TRUE_FEED_LOAD } });
  const r = runEngineTask({ kind: "sample", scenario: truth, days, limits: {} });
  if (r.kind !== "sample" || !r.samples) throw new Error("no samples");
  const samples = r.samples;
  getDb()
    .insert(readings)
    .values(
      days.map((d, i) => ({
        tankId,
        takenAt: new Date(PLANTED_START_MS + d * DAY),
        nitrate: samples.no3[i] + (d >= 30 ? unloggedJumpMgN : 0),
        tan: tan ? samples.tan[i] : null,
      })),
    )
    .run();
  return days;
}
