/**
 * The check before a calibration (which multipliers the readings can tell) runs on the same
 * schedule as the fit: the journal replayed "as it happened" when the tank has a journal (the
 * fit's default), the scenario's periodic schedule when that is chosen.
 */
import { describe, expect, it } from "vitest";
import { getDb } from "~/db/client.server";
import { readings } from "~/db/schema";
import { journalEntries } from "~/db/schema-care";
import { loader as calibrateLoader } from "~/routes/calibrate/calibrate";
import { action as calibrationsApi } from "~/routes/api/scenario-calibrations";
import { cancelJob, clearJobs } from "~/features/jobs/jobs.server";
import { kitUnit } from "~models/nitrogen/calibrate";
import { call, get, postJson } from "../support/routes";
import { createScenario, createTank, startScenarioOn } from "../support/tanks";
import { userWithCookie } from "../support/users";

const DAY = 86_400_000;
// Card values stored as the readings form stores them: through the one units table, to mg N/L.
const NH3 = kitUnit("tan", "asNH3").mgNPerUnit;
const NO3 = kitUnit("no3", "asNO3").mgNPerUnit;

/** A tank whose journal (a 50 % change, then an ammonia dose) differs from its scenario's weekly schedule, with card readings. */
async function tankWithJournal() {
  const user = await userWithCookie();
  const tankId = createTank(user.id);
  // A cycled tank, no plants, weekly 30 % changes on paper (our own worked example).
  const scenarioId = await createScenario(user.id, tankId, {
    water: { volumeL: 100 },
    fish: { feedGPerDay: 0.5 },
    plants: [],
    maintenance: { waterChangeIntervalDays: 7, waterChangeFraction: 0.3 },
    tapWater: { nitrate: 0, roShare: 0 },
    run: { lengthDays: 30 },
  });
  const start = Math.floor(Date.now() / DAY) * DAY - 25 * DAY;
  startScenarioOn(scenarioId, start);
  // What was really done: a note on day 0 (the replay starts there), a 50 % change on day 3,
  // and 3 mg N/L of ammonia dosed on day 10 — which the periodic schedule does not have.
  getDb()
    .insert(journalEntries)
    .values([
      { tankId, doneAt: new Date(start + 9 * 3_600_000), kind: "note", details: {} },
      { tankId, doneAt: new Date(start + 3 * DAY), kind: "water_change", details: { share: 0.5 } },
      { tankId, doneAt: new Date(start + 10 * DAY), kind: "ammonia_dosed", details: { ammoniaMgN: 3 } },
    ])
    .run();
  // Readings from colour cards (NH3 0/0.25/0.5/…/4, NO3 …/20/40): TAN falls from the dose over two days.
  const card: [day: number, nh3: number, no3: number][] = [
    [10.1, 4, 20],
    [10.3, 4, 20],
    [10.6, 2, 20],
    [11, 2, 20],
    [11.5, 2, 20],
    [12, 0.5, 20],
    [13, 0, 40],
    [15, 0, 40],
    [20, 0.25, 40],
  ];
  getDb()
    .insert(readings)
    .values(
      card.map(([d, nh3, no3]) => ({
        tankId,
        takenAt: new Date(start + d * DAY),
        tan: nh3 * NH3,
        nitrate: no3 * NO3,
      })),
    )
    .run();
  return { user, tankId, scenarioId };
}

describe("calibration's check of what the readings can tell", () => {
  it("follows the journal when the journal differs from the periodic schedule (an ammonia dose the schedule never has)", async () => {
    const { user, tankId, scenarioId } = await tankWithJournal();
    const id = { tankId: String(tankId), scenarioId: String(scenarioId) };
    const base = `/tanks/${tankId}/scenarios/${scenarioId}/calibrate`;
    const capacity = (page: { data: { multipliers: { key: string; assessment: unknown }[] } }) =>
      page.data.multipliers.find((m) => m.key === "nitrifierCapacity")!.assessment as {
        determinable: boolean;
        reason: string;
      };

    // Checked on the periodic schedule, the TAN readings are a near-flat trace the filter's
    // capacity barely moves: its range stays wide. On the journal the dose's decay is set by the
    // filter's capacity, so the readings tell it (a priori identifiability, Raue et al. 2009).
    const periodic = await call(calibrateLoader, get(`${base}?schedule=periodic`, user.cookie), id);
    expect(periodic.data.schedule).toBe("periodic");
    expect(capacity(periodic)).toMatchObject({ determinable: false });
    expect(periodic.data.checkedAgainst).toBe("the scenario's periodic schedule");

    // The page's default is the fit's default: the journal as it happened, and the check follows it.
    const page = await call(calibrateLoader, get(base, user.cookie), id);
    expect(page.data.schedule).toBe("journal");
    expect(page.data.checkedAgainst).toBe("the tank's journal, as it happened");
    expect(capacity(page)).toMatchObject({ determinable: true, reason: "determined" });
    const explicit = await call(calibrateLoader, get(`${base}?schedule=journal`, user.cookie), id);
    expect(capacity(explicit)).toEqual(capacity(page));
  });

  it("is what the API fits on too: the journal by default when there is one, the schedule when asked; a journal asked of an empty journal is a 400 by the field", async () => {
    const { user, scenarioId } = await tankWithJournal();
    const start = (body: unknown) =>
      call(calibrationsApi, postJson(`/api/scenarios/${scenarioId}/calibrations`, body, user.cookie), {
        scenarioId: String(scenarioId),
      });
    const byDefault = await start({ fit: ["feedLoad"] });
    expect(byDefault.status).toBe(202);
    expect(byDefault.data.job.params.schedule).toBe("journal");
    cancelJob(user.id, byDefault.data.job.id);
    clearJobs();
    const periodic = await start({ fit: ["feedLoad"], schedule: "periodic" });
    expect(periodic.status).toBe(202);
    expect(periodic.data.job.params.schedule).toBe("periodic");
    clearJobs();
    const bad = await start({ fit: ["feedLoad"], schedule: "weekly" });
    expect(bad.status).toBe(400);
    expect(bad.data.issues[0].path).toBe("schedule");

    const other = await userWithCookie();
    const bare = await createScenario(other.id, createTank(other.id), { run: { lengthDays: 30 } });
    const empty = await call(
      calibrationsApi,
      postJson(`/api/scenarios/${bare}/calibrations`, { fit: ["feedLoad"], schedule: "journal" }, other.cookie),
      { scenarioId: String(bare) },
    );
    expect(empty.status).toBe(400);
    expect(empty.data.issues).toEqual([
      { path: "schedule", message: "This tank's journal is empty: log what you did first." },
    ]);
    const emptyDefault = await call(
      calibrationsApi,
      postJson(`/api/scenarios/${bare}/calibrations`, { fit: ["feedLoad"] }, other.cookie),
      { scenarioId: String(bare) },
    );
    expect(emptyDefault.status).toBe(202);
    expect(emptyDefault.data.job.params.schedule).toBe("periodic");
    clearJobs();
  });
});
