/**
 * Through the API and the calibration page: readings the model cannot follow get "no good fit",
 * not a determined multiplier. The readings are made by the engine (feed load ×1.25, our own
 * worked example), then nitrate jumps by 10 mg N/L from day 30 on — something added to the tank
 * that neither the scenario nor a journal knows of. The page then does not save the fit's
 * multipliers as a new scenario (it does for a good fit).
 */
import { afterEach, describe, expect, it } from "vitest";
import { clearJobs } from "~/features/jobs/jobs.server";
import type { CalibrationJson } from "~/features/calibration/calibration-json";
import { action as calibrationsApi } from "~/routes/api/scenario-calibrations";
import { action as calibrateAction } from "~/routes/calibrate/calibrate";
import { getDb } from "~/db/client.server";
import { scenarios } from "~/db/schema";
import { eq } from "drizzle-orm";
import { pollJob } from "../support/jobs";
import { call, post, postJson } from "../support/routes";
import { PLANTED } from "../support/planted-scenario";
import { storePlantedReadings } from "../support/planted-readings";
import { createScenario, createTank } from "../support/tanks";
import { userWithCookie } from "../support/users";

afterEach(() => clearJobs());

async function tankWithReadings(jumpMgN: number) {
  const user = await userWithCookie();
  const tankId = createTank(user.id);
  const scenarioId = await createScenario(user.id, tankId, PLANTED);
  storePlantedReadings(tankId, scenarioId, { tan: false, unloggedJumpMgN: jumpMgN });
  return { user, tankId: String(tankId), scenarioId: String(scenarioId) };
}

async function fitFeedLoad(jumpMgN: number) {
  const { user, tankId, scenarioId } = await tankWithReadings(jumpMgN);
  const started = await call(
    calibrationsApi,
    postJson(
      `/api/scenarios/${scenarioId}/calibrations`,
      { fit: ["feedLoad"], kits: { no3: { kind: "exact" } } },
      user.cookie,
    ),
    { scenarioId },
  );
  expect(started.status).toBe(202);
  const { job } = await pollJob(started.data.job.id, user.cookie);
  expect(job.status).toBe("done");
  const result = job.result as CalibrationJson;
  /** "Save the fitted multipliers as a new scenario", posted from the page of this fit. */
  const save = () =>
    call(
      calibrateAction,
      post(
        `/tanks/${tankId}/scenarios/${scenarioId}/calibrate?job=${started.data.job.id}`,
        {
          intent: "save",
          name: "calibrated",
          ...Object.fromEntries(result.multipliers.map((m) => [m.key, m.value])),
        },
        user.cookie,
      ),
      { tankId, scenarioId },
    );
  const scenarioCount = () =>
    getDb()
      .select()
      .from(scenarios)
      .where(eq(scenarios.tankId, Number(tankId)))
      .all().length;
  return { result, save, scenarioCount };
}

describe("the calibration API on readings the model cannot follow", () => {
  it("without the jump: a good fit, feed load determined (the control)", async () => {
    const { result: r, save, scenarioCount } = await fitFeedLoad(0);
    expect(r.fitQuality).toEqual({ good: true, reason: null, text: null });
    expect(r.multipliers.find((m) => m.key === "feedLoad")!.determined).toBe(true);
    const saved = await save();
    expect(saved.status).toBe(302);
    expect(scenarioCount()).toBe(2);
  }, 60_000);

  it("with the jump: no good fit, feed load not determined, and the report says where the readings leave the model", async () => {
    const { result: r, save, scenarioCount } = await fitFeedLoad(10);
    expect(r.fitQuality?.good).toBe(false);
    const feed = r.multipliers.find((m) => m.key === "feedLoad")!;
    expect(feed.determined).toBe(false);
    expect(feed.reason).toBe("poorFit");
    expect(r.fitQuality?.text).toMatch(/^No good fit/);
    // Multipliers the readings do not support are not saved as a scenario from that fit's page.
    const refused = await save();
    expect(refused.status).toBe(400);
    expect(refused.data.errors[""]).toMatch(/not trustworthy/);
    expect(scenarioCount()).toBe(1);
  }, 60_000);
});
