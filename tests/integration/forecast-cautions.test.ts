/**
 * The journal's forecast says what the days ahead cross, not only nitrate: a planned schedule
 * that lets KH run out brings free ammonia and nitrite above their caution lines weeks from now,
 * and the page and the reminder mail both say so, with dates, in the person's units.
 */
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { checkReminders } from "~/features/reminders/reminder-check.server";
import { action as accountAction } from "~/routes/auth/account";
import { action as journalApiPost } from "~/routes/api/tank-journal";
import { loader as pageLoader } from "~/routes/journal/journal";
import { startMailFake, waitForMail } from "../support/mail";
import { call, get, post, postJson } from "../support/routes";
import { createScenario, createTank } from "../support/tanks";
import { userWithCookie } from "../support/users";
import { day } from "../support/journal";

let stopMail: () => Promise<void>;
beforeAll(async () => {
  stopMail = (await startMailFake()).close;
});
afterAll(async () => {
  await stopMail();
});

// The caution lines: free ammonia 0.02 mg/L NH3, nitrite 0.1 mg/L NO2-N (common practice, no source).
const FREE_NH3_AHEAD =
  /^Free ammonia reaches [\d.]+ mg\/L NH3 on \d{1,2} [A-Z][a-z]+, .* the caution line \(0\.02 mg\/L NH3\)\.$/;

async function softTankWithJournal() {
  const keeper = await userWithCookie();
  const tankId = createTank(keeper.id, "Soft tank");
  // 1 g of food a day in 60 L with 3 dKH and a 10 % change a month: nitrification uses the KH up
  // in two to three weeks (7.14 mg CaCO3 per mg N, US EPA 1993 Nitrogen Control), then TAN builds.
  await createScenario(keeper.id, tankId, {
    water: { volumeL: 60, pH: 8, khDkh: 3, temperatureC: 26, startNitrate: 2 },
    tapWater: { khDkh: 3, nitrate: 0, roShare: 0 },
    fish: { feedGPerDay: 1 },
    maintenance: { waterChangeIntervalDays: 30, waterChangeFraction: 0.1 },
  });
  const logged = await call(
    journalApiPost,
    postJson(
      `/api/tanks/${tankId}/journal`,
      { date: day(2), kind: "water_change", water_changed_percent: 10 },
      keeper.cookie,
    ),
    { tankId: String(tankId) },
  );
  expect(logged.status).toBe(201);
  return { keeper, tankId };
}

describe("cautions in the forecast", () => {
  it("the journal page names what the days ahead cross, with dates", async () => {
    const { keeper, tankId } = await softTankWithJournal();
    const page = await call(pageLoader, get(`/tanks/${tankId}/journal`, keeper.cookie), { tankId: String(tankId) });
    expect(page.status).toBe(200);
    // The two days replayed so far are calm; the danger is ahead.
    expect(page.data.replay.warnings).toEqual([]);
    const ahead: string[] = page.data.cautionsAhead;
    expect(ahead.some((t) => FREE_NH3_AHEAD.test(t))).toBe(true);
    expect(ahead.some((t) => /^KH runs out on \d{1,2} [A-Z][a-z]+ /.test(t))).toBe(true);
    for (const t of ahead) expect(t).not.toMatch(/\bday \d/);
  });

  it("the reminder mail says it under the forecast", async () => {
    const { keeper, tankId } = await softTankWithJournal();
    const subscribed = await call(
      accountAction,
      post("/account", { intent: "reminders", tankId, mode: "weekly", hour: new Date().getUTCHours() }, keeper.cookie),
    );
    expect(subscribed.status).toBe(302);
    await checkReminders("forecast-cautions", Date.now());
    const mail = await waitForMail(keeper.email);
    expect(mail.text).toMatch(/Where fish could be harmed in the days ahead:\n- /);
    expect(mail.text.split("\n").some((line) => FREE_NH3_AHEAD.test(line.replace(/^- /, "")))).toBe(true);
  });
});
