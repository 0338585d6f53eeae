/**
 * The maintenance plan's JSON API (GET/PUT/DELETE /api/tanks/:tankId/plan): a round trip, the
 * page's messages by field path, 404 for another keeper, and a plan set through the API is what
 * the plan page, the calendar feed and the journal's forecast follow.
 */
import { eq } from "drizzle-orm";
import { describe, expect, it } from "vitest";
import { getDb } from "~/db/client.server";
import { maintenancePlans } from "~/db/schema-care";
import { action as planApi, loader as planApiGet } from "~/routes/api/tank-plan";
import { action as journalAction, loader as journalLoader } from "~/routes/journal/journal";
import { loader as planLoader } from "~/routes/tanks/plan";
import { call, get, post, postJson } from "../support/routes";
import { createScenario, createTank } from "../support/tanks";
import { userWithCookie } from "../support/users";
import { calendarTitles } from "../support/calendar";
import { day } from "../support/journal";

const storedPlans = (tankId: string) =>
  getDb()
    .select()
    .from(maintenancePlans)
    .where(eq(maintenancePlans.tankId, Number(tankId)))
    .all();

async function keeperWithTank(settings: Record<string, unknown>) {
  const keeper = await userWithCookie();
  const tankId = String(createTank(keeper.id));
  await createScenario(keeper.id, Number(tankId), settings);
  return { keeper, tankId };
}

const WEEKLY = {
  maintenance: { waterChangeIntervalDays: 7, waterChangeFraction: 0.3, gravelCleaningFraction: 0.2 },
  filter: { cleaningIntervalDays: 30, cleanedInTapWater: false },
};
const FORTNIGHTLY = {
  water_change_percent: 40,
  water_change_every_days: 14,
  gravel_percent: 10,
  filter_every_days: 45,
};

const apiGet = (tankId: string, cookie: string) =>
  call(planApiGet, get(`/api/tanks/${tankId}/plan`, cookie), { tankId });
const apiPut = (tankId: string, body: unknown, cookie: string) =>
  call(planApi, postJson(`/api/tanks/${tankId}/plan`, body, cookie, "PUT"), { tankId });
const apiDelete = (tankId: string, cookie: string) =>
  call(planApi, postJson(`/api/tanks/${tankId}/plan`, {}, cookie, "DELETE"), { tankId });

describe("the maintenance plan's API", () => {
  it("round trip: the scenario's timetable, a plan put, read back, and deleted back to the timetable", async () => {
    const { keeper, tankId } = await keeperWithTank(WEEKLY);
    const first = await apiGet(tankId, keeper.cookie);
    expect(first.status).toBe(200);
    expect(first.data.source).toBe("scenario");
    // 30 % weekly, 20 % of the detritus, monthly filter: the scenario's own timetable (our own worked example)
    expect(first.data.fields).toMatchObject({
      water_change_percent: 30,
      water_change_every_days: 7,
      gravel_percent: 20,
      filter_every_days: 30,
    });

    // PUT what GET gave, changed: the answer and a fresh GET say so.
    const put = await apiPut(tankId, { ...first.data.fields, ...FORTNIGHTLY }, keeper.cookie);
    expect(put.status).toBe(200);
    expect(put.data.source).toBe("plan");
    const again = await apiGet(tankId, keeper.cookie);
    expect(again.data.source).toBe("plan");
    expect(again.data.fields).toMatchObject(FORTNIGHTLY);
    // 40 % → a share of 0.4, 10 % → 0.1 (percent, common practice, no source)
    expect(again.data.plan.waterChangeFraction).toBeCloseTo(0.4, 12);
    expect(again.data.plan.gravelCleaningFraction).toBeCloseTo(0.1, 12);
    // The same plan PUT back as text is the same plan.
    const asText = Object.fromEntries(Object.entries(again.data.fields).map(([k, v]) => [k, String(v)]));
    expect((await apiPut(tankId, asText, keeper.cookie)).data.plan).toEqual(again.data.plan);

    const del = await apiDelete(tankId, keeper.cookie);
    expect(del.status).toBe(200);
    expect(del.data.source).toBe("scenario");
    expect(del.data.fields).toEqual(first.data.fields);
    expect(storedPlans(tankId)).toHaveLength(0);
  });

  it("a bad body answers 400 with each field's path and the page's message, and stores nothing", async () => {
    const { keeper, tankId } = await keeperWithTank(WEEKLY);
    const r = await apiPut(
      tankId,
      {
        ...FORTNIGHTLY,
        water_change_percent: 120,
        water_change_every_days: 2.5,
        filter_every_days: undefined,
        gravel: 5,
      },
      keeper.cookie,
    );
    expect(r.status).toBe(400);
    const byPath = Object.fromEntries(r.data.issues.map((i: { path: string; message: string }) => [i.path, i.message]));
    // The page's own messages (tests/integration/maintenance-plan.test.ts checks them on the form)
    expect(byPath.water_change_percent).toBe("Water changed must be between 0 and 95");
    expect(byPath.water_change_every_days).toBe("Days between water changes must be a whole number between 0 and 365");
    expect(byPath.filter_every_days).toBe("Days between filter cleanings is needed");
    expect(byPath.gravel).toBe("Unknown field.");
    expect((await apiPut(tankId, [FORTNIGHTLY], keeper.cookie)).status).toBe(400);
    expect(storedPlans(tankId)).toHaveLength(0);
  });

  it("another keeper gets 404 on every method, and the owner's plan stays", async () => {
    const { keeper, tankId } = await keeperWithTank(WEEKLY);
    await apiPut(tankId, FORTNIGHTLY, keeper.cookie);
    const other = await userWithCookie();
    const answers = [
      (await apiGet(tankId, other.cookie)).status,
      (await apiPut(tankId, { ...FORTNIGHTLY, water_change_percent: 50 }, other.cookie)).status,
      (await apiDelete(tankId, other.cookie)).status,
    ];
    expect(answers).toEqual([404, 404, 404]);
    expect((await apiGet(tankId, keeper.cookie)).data.fields).toMatchObject(FORTNIGHTLY);
  });

  it("a plan set through the API is what the page and the calendar feed follow", async () => {
    const { keeper, tankId } = await keeperWithTank(WEEKLY);
    await apiPut(tankId, FORTNIGHTLY, keeper.cookie);
    const page = await call(planLoader, get(`/tanks/${tankId}/plan`, keeper.cookie), { tankId });
    expect(page.data.plan.edited).toBe(true);
    expect(page.data.plan.values.water_change_every_days).toBe("14");
    const titles = await calendarTitles(keeper.cookie, tankId);
    // 90 days: every 14 → days 14…84 = 6 changes at 40 %; every 45 → day 45 only (our own worked example)
    expect(titles.filter((t) => t.startsWith("Water change (40 %)"))).toHaveLength(6);
    expect(titles.filter((t) => t.startsWith("Water change (30 %)"))).toHaveLength(0);
    expect(titles.filter((t) => t.startsWith("Clean the filter"))).toHaveLength(1);
  });

  it("a plan set through the API is what the journal's forecast follows", async () => {
    // Heavy feeding, no plants, no nitrate in the tap water: only water changes take nitrate out
    // (our own worked example, as tests/integration/journal.test.ts "the forecast").
    const { keeper, tankId } = await keeperWithTank({
      water: { volumeL: 100, startNitrate: 3 },
      fish: { feedGPerDay: 0.4 },
      plants: [],
      maintenance: { waterChangeIntervalDays: 3, waterChangeFraction: 0.6 },
      tapWater: { nitrate: 0, roShare: 0 },
    });
    await call(
      journalAction,
      post(
        `/tanks/${tankId}/journal`,
        { intent: "add", date: day(5), kind: "water_change", water_changed_percent: "50" },
        keeper.cookie,
      ),
      { tankId },
    );
    const forecast = async () =>
      (await call(journalLoader, get(`/tanks/${tankId}/journal`, keeper.cookie), { tankId })).data.forecast as string;
    const before = await forecast();
    // 60 % every 3 days holds the nitrate this feeding makes well under the target.
    expect(before).toMatch(/^Under your planned schedule nitrate stays below your upper target/);
    // Without any water change, nitrate must climb past the upper target within the forecast's 60 days.
    const put = await apiPut(
      tankId,
      { water_change_percent: 0, water_change_every_days: 0, gravel_percent: 0, filter_every_days: 0 },
      keeper.cookie,
    );
    expect(put.status).toBe(200);
    const after = await forecast();
    expect(after).toMatch(/^Nitrate passes your upper target/);
    expect(after).not.toEqual(before);
    // Back to the scenario's frequent changes: the forecast is the first one again.
    await apiDelete(tankId, keeper.cookie);
    expect(await forecast()).toEqual(before);
  });
});
