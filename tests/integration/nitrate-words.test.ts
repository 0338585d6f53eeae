/**
 * Sentences that state an amount of nitrate follow the reader's units (issue 12, item 12): a
 * preset's story and the drinking-water caution say mg/L NO3-N to someone who reads nitrate as N.
 * Factor NO3 → N = 14.007 / 62.004 (IUPAC standard atomic weights N 14.007, O 15.999;
 * docs/sources.md §0).
 */
import { eq } from "drizzle-orm";
import { describe, expect, it } from "vitest";
import { getDb } from "~/db/client.server";
import { users } from "~/db/schema";
import { loader as newLoader } from "~/routes/scenarios/new";
import { loader as resultsLoader } from "~/routes/scenarios/results";
import { call, get } from "../support/routes";
import { createScenario, createTank } from "../support/tanks";
import { userWithCookie } from "../support/users";

const N_PER_NO3 = 14.007 / 62.004;

async function reader(nitrateUnit: "NO3" | "N") {
  const keeper = await userWithCookie();
  getDb().update(users).set({ nitrateUnit }).where(eq(users.id, keeper.id)).run();
  return { keeper, tankId: createTank(keeper.id) };
}

describe("nitrate in words", () => {
  it("a preset's story says its tap water's nitrate in the reader's units", async () => {
    for (const [unit, words] of [
      ["NO3", "40 mg/L NO3"],
      // 40 mg/L NO3 × 14.007 / 62.004 = 9.036 mg/L NO3-N
      ["N", `${Number((40 * N_PER_NO3).toPrecision(3))} mg/L NO3-N`],
    ] as const) {
      const { keeper, tankId } = await reader(unit);
      const page = await call(newLoader, get(`/tanks/${tankId}/scenarios/new`, keeper.cookie), {
        tankId: String(tankId),
      });
      const story = page.data.presets.find((p: { id: string }) => p.id === "hard-spring")!.description as string;
      expect(story).toContain(`carries nitrate, ${words}:`);
      if (unit === "N") expect(story).not.toMatch(/mg\/L( as)? NO3\b(?!-N)/);
    }
  });

  it("the drinking-water caution states the WHO limit in the reader's units", async () => {
    // WHO Guidelines for Drinking-water Quality (4th ed.): nitrate 50 mg/L as NO3.
    for (const [unit, limit] of [
      ["NO3", 50],
      ["N", 50 * N_PER_NO3],
    ] as const) {
      const { keeper, tankId } = await reader(unit);
      const scenarioId = await createScenario(keeper.id, tankId, {
        tapWater: { nitrate: 60 * N_PER_NO3 },
        run: { lengthDays: 20 },
      });
      const params = { tankId: String(tankId), scenarioId: String(scenarioId) };
      const page = await call(resultsLoader, get(`/tanks/${tankId}/scenarios/${scenarioId}`, keeper.cookie), params);
      expect(page.data.results.tapNitrateAboveDrinkingLimit).toBe(true);
      expect(page.data.results.tapNitrateLimitDisplay).toBeCloseTo(limit, 3);
    }
  });
});
