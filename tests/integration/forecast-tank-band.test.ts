/**
 * The journal's forecast follows the keeper's tank: its target is the tank's nitrate band, the
 * one the tank page edits (and every other figure of the tank uses), not the band the scenario
 * was saved with. A keeper who moves the band on the tank page reads the new target in the
 * forecast, on the journal page and in the reminder mail. The tank is our own worked example.
 */
import { describe, expect, it } from "vitest";
import { reminderMail } from "~/features/reminders/reminder-mail.server";
import type { ReminderRow } from "~/features/reminders/reminder-schedule.server";
import { action as tankAction } from "~/routes/tanks/detail";
import { loader as pageLoader } from "~/routes/journal/journal";
import { call, get, post } from "../support/routes";
import { climbingTankWithJournal } from "../support/journal";

describe("the forecast's target", () => {
  it("is the tank's nitrate band as last set on the tank page, on the journal page and in the reminder mail", async () => {
    // Nitrate climbs past either target (tests/support/journal.ts).
    const { keeper, tankId: id } = await climbingTankWithJournal();
    const before = await call(pageLoader, get(`/tanks/${id}/journal`, keeper.cookie), { tankId: id });
    expect(before.data.forecast).toMatch(/upper target of 20 mg\/L NO3 /);
    // The keeper widens the band on the tank page to 10–30 mg/L NO3.
    const saved = await call(
      tankAction,
      post(
        `/tanks/${id}`,
        { intent: "settings", name: "Test tank", notes: "", nitrateLow: "10", nitrateHigh: "30" },
        keeper.cookie,
      ),
      { tankId: id },
    );
    expect(saved.status).toBeLessThan(400);
    const after = await call(pageLoader, get(`/tanks/${id}/journal`, keeper.cookie), { tankId: id });
    expect(after.data.forecast).toMatch(/upper target of 30 mg\/L NO3 .* keeps it below 30 mg\/L NO3/);
    expect(after.data.replay?.guides.nitrateBand?.high).toBeCloseTo(30, 9);
    const row = { id: 1, tankId: Number(id), userId: keeper.id, mode: "digest" } as ReminderRow;
    const mail = await reminderMail(row, Date.now());
    expect(mail?.text).toMatch(/Forecast: Nitrate passes your upper target of 30 mg\/L NO3 /);
  });
});
