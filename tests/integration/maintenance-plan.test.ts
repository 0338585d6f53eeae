import { eq } from "drizzle-orm";
import { describe, expect, it } from "vitest";
import { getDb } from "~/db/client.server";
import { journalEntries, maintenancePlans } from "~/db/schema-care";
import { loader as tankLoader } from "~/routes/tanks/detail";
import { action as planAction, loader as planLoader } from "~/routes/tanks/plan";
import { call, get, post } from "../support/routes";
import { createScenario, createTank } from "../support/tanks";
import { userWithCookie } from "../support/users";
import { calendarTitles } from "../support/calendar";

const DAY = 86_400_000;
const today = () => Math.floor(Date.now() / DAY) * DAY;
type Task = { key: string; title: string; when: string; values: Record<string, string> };
const entries = (tankId: number) =>
  getDb().select().from(journalEntries).where(eq(journalEntries.tankId, tankId)).all();

async function keeperWithPlan() {
  const keeper = await userWithCookie();
  const tankId = createTank(keeper.id);
  await createScenario(keeper.id, tankId, {
    maintenance: { waterChangeIntervalDays: 7, waterChangeFraction: 0.3, gravelCleaningFraction: 0.2 },
    filter: { cleaningIntervalDays: 30, cleanedInTapWater: false },
  });
  return { keeper, tankId: String(tankId) };
}

const PLAN = {
  intent: "save",
  water_change_percent: "40",
  water_change_every_days: "14",
  gravel_percent: "10",
  filter_every_days: "45",
};

describe("the maintenance plan", () => {
  it("starts as the scenario's timetable, and an edit changes the upcoming list and the calendar feed", async () => {
    const { keeper, tankId } = await keeperWithPlan();
    const before = await call(planLoader, get(`/tanks/${tankId}/plan`, keeper.cookie), { tankId });
    expect(before.data.plan?.values.water_change_percent).toBe("30");
    expect(before.data.plan?.edited).toBe(false);
    // No journal yet: weekly changes from today, days 7 and 14 within three weeks (common practice, no source)
    expect(before.data.upcoming.filter((t: Task) => t.title.startsWith("Water change (30 %)"))).toHaveLength(2);
    const calBefore = await calendarTitles(keeper.cookie, tankId);
    // 90 days: weekly → days 7…84 = 12 changes; monthly cleaning → days 30, 60 = 2 (our own worked example)
    expect(calBefore.filter((t: string) => t.startsWith("Water change (30 %)"))).toHaveLength(12);
    expect(calBefore.filter((t: string) => t.startsWith("Clean the filter"))).toHaveLength(2);

    const saved = await call(planAction, post(`/tanks/${tankId}/plan`, PLAN, keeper.cookie), { tankId });
    expect(saved.status).toBe(302);
    const after = await call(tankLoader, get(`/tanks/${tankId}`, keeper.cookie), { tankId });
    // Every 14 days: only day 14 within three weeks, at 40 %; never logged, so counted from the
    // day the plan was saved (a model choice), and the title says so
    const saveDay = new Date(today()).toLocaleDateString("en-GB", { day: "numeric", month: "long", timeZone: "UTC" });
    expect(after.data.upcoming.map((t: Task) => t.title).filter((t: string) => t.startsWith("Water change"))).toEqual([
      `Water change (40 %) — first one, counted from when the plan was first saved (${saveDay})`,
    ]);
    const calAfter = await calendarTitles(keeper.cookie, tankId);
    // 90 days: every 14 → days 14…84 = 6; every 45 → day 45 only = 1 (our own worked example)
    expect(calAfter.filter((t: string) => t.startsWith("Water change (40 %)"))).toHaveLength(6);
    expect(calAfter.filter((t: string) => t.startsWith("Clean the filter"))).toHaveLength(1);
  });

  it("refuses bad values with a message beside each field and stores nothing", async () => {
    const { keeper, tankId } = await keeperWithPlan();
    const r = await call(
      planAction,
      post(
        `/tanks/${tankId}/plan`,
        { ...PLAN, water_change_percent: "120", water_change_every_days: "2.5", filter_every_days: "" },
        keeper.cookie,
      ),
      { tankId },
    );
    expect(r.status).toBe(400);
    expect(r.data.errors.water_change_percent).toMatch(/between 0 and 95/);
    expect(r.data.errors.water_change_every_days).toMatch(/whole number/);
    expect(r.data.errors.filter_every_days).toMatch(/needed/);
    expect(
      getDb()
        .select()
        .from(maintenancePlans)
        .where(eq(maintenancePlans.tankId, Number(tankId)))
        .all(),
    ).toHaveLength(0);
  });

  it("marks a planned water change done: journal entries with the plan's amounts, dated today; the next one moves on", async () => {
    const { keeper, tankId } = await keeperWithPlan();
    await call(planAction, post(`/tanks/${tankId}/plan`, PLAN, keeper.cookie), { tankId });
    const page = await call(tankLoader, get(`/tanks/${tankId}`, keeper.cookie), { tankId });
    const task = page.data.upcoming.find((t: Task) => t.title.startsWith("Water change"))!;
    expect(task.when).toBe(
      new Date(today() + 14 * DAY).toLocaleDateString("en-GB", {
        weekday: "short",
        day: "numeric",
        month: "long",
        timeZone: "UTC",
      }),
    );
    expect(task.values).toMatchObject({
      kind: "water_change",
      water_changed_percent: "40",
      gravel_cleaned_percent: "10",
    });
    const r = await call(
      planAction,
      post(`/tanks/${tankId}/plan`, { intent: "done", back: "tank", task: task.key, ...task.values }, keeper.cookie),
      { tankId },
    );
    expect(r.status).toBe(302);
    const rows = entries(Number(tankId));
    expect(rows.map((e) => e.kind).sort()).toEqual(["gravel_cleaned", "water_change"]);
    expect(rows.find((e) => e.kind === "water_change")!.details).toMatchObject({ share: 0.4 });
    expect(rows.find((e) => e.kind === "gravel_cleaned")!.details).toMatchObject({ gravelShare: 0.1 });
    for (const e of rows) expect(Math.floor(e.doneAt.getTime() / DAY) * DAY).toBe(today());
    // Done today → the next one is 14 days from today still, and the one after (day 28) is out of the three weeks
    const next = await call(planLoader, get(`/tanks/${tankId}/plan`, keeper.cookie), { tankId });
    const changes = next.data.upcoming.filter((t: Task) => t.title.startsWith("Water change"));
    expect(changes).toHaveLength(1);
    expect(changes[0].key).toContain(String(today() + 14 * DAY));
  });

  it("the next occurrence moves on from the day it was done (done early, the next comes early)", async () => {
    const { keeper, tankId } = await keeperWithPlan();
    await call(planAction, post(`/tanks/${tankId}/plan`, PLAN, keeper.cookie), { tankId });
    const [task] = (
      await call(planLoader, get(`/tanks/${tankId}/plan`, keeper.cookie), { tankId })
    ).data.upcoming.filter((t: Task) => t.title.startsWith("Water change"));
    const fiveDaysAgo = new Date(today() - 5 * DAY).toISOString().slice(0, 10);
    await call(
      planAction,
      post(
        `/tanks/${tankId}/plan`,
        { intent: "done", task: task.key, ...task.values, date: fiveDaysAgo },
        keeper.cookie,
      ),
      { tankId },
    );
    const next = await call(planLoader, get(`/tanks/${tankId}/plan`, keeper.cookie), { tankId });
    const change = next.data.upcoming.find((t: Task) => t.title.startsWith("Water change"))!;
    // Done 5 days ago, every 14 days → due in 9 days (our own worked example)
    expect(change.key).toContain(String(today() + 9 * DAY));
  });

  it("a bad mark-done is refused by field and stores nothing", async () => {
    const { keeper, tankId } = await keeperWithPlan();
    const task = (await call(planLoader, get(`/tanks/${tankId}/plan`, keeper.cookie), { tankId })).data.upcoming[0];
    const r = await call(
      planAction,
      post(
        `/tanks/${tankId}/plan`,
        { intent: "done", task: task.key, ...task.values, water_changed_percent: "300", gravel_cleaned_percent: "abc" },
        keeper.cookie,
      ),
      { tankId },
    );
    expect(r.status).toBe(400);
    expect(r.data.errors.water_changed_percent).toMatch(/between 1 and 95/);
    expect(r.data.errors.gravel_cleaned_percent).toMatch(/number/);
    expect(entries(Number(tankId))).toHaveLength(0);
  });

  it("another keeper gets 404 on the plan page and its actions, and nothing changes", async () => {
    const { tankId } = await keeperWithPlan();
    const other = await userWithCookie();
    const page = await call(planLoader, get(`/tanks/${tankId}/plan`, other.cookie), { tankId });
    const save = await call(planAction, post(`/tanks/${tankId}/plan`, PLAN, other.cookie), { tankId });
    const done = await call(
      planAction,
      post(`/tanks/${tankId}/plan`, { intent: "done", kind: "note", date: "2026-01-01" }, other.cookie),
      { tankId },
    );
    expect([page.status, save.status, done.status]).toEqual([404, 404, 404]);
    expect(entries(Number(tankId))).toHaveLength(0);
    expect(
      getDb()
        .select()
        .from(maintenancePlans)
        .where(eq(maintenancePlans.tankId, Number(tankId)))
        .all(),
    ).toHaveLength(0);
  });
});
