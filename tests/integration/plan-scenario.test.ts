/**
 * A tank with two scenarios and a plan made over the second: the tank page, the journal page
 * and the reminder mail list the same planned tasks — the plan's scenario's, not whichever
 * scenario happens to be listed first. The tank is our own worked example.
 */
import { describe, expect, it } from "vitest";
import { reminderMail } from "~/features/reminders/reminder-mail.server";
import type { ReminderRow } from "~/features/reminders/reminder-schedule.server";
import { savePlan } from "~/features/tanks/maintenance-plan.server";
import { upcomingView } from "~/routes/tanks/upcoming-view.server";
import { loader as pageLoader } from "~/routes/journal/journal";
import { plantGroupFromForm } from "../../models/index";
import { call, get } from "../support/routes";
import { createScenario, createTank } from "../support/tanks";
import { userWithCookie } from "../support/users";

const group = (id: string, name: string, everyDays: number) =>
  plantGroupFromForm("stem", {
    id,
    name,
    startMassG: 10,
    maxMassG: 40,
    trim: { rule: "everyDays", everyDays, trimToFraction: 0.5, fullAtFraction: 0.9 },
  });

describe("the plan's scenario", () => {
  it("gives the tank page, the journal page and the reminder mail the same tasks", async () => {
    const keeper = await userWithCookie();
    const tankId = createTank(keeper.id);
    await createScenario(
      keeper.id,
      tankId,
      {
        plants: [group("carpet", "Carpet plants", 3)],
        maintenance: { waterChangeIntervalDays: 7, waterChangeFraction: 0.3 },
      },
      "First idea",
    );
    const second = await createScenario(
      keeper.id,
      tankId,
      {
        plants: [group("stems", "Stem plants", 5)],
        maintenance: { waterChangeIntervalDays: 7, waterChangeFraction: 0.3 },
      },
      "How it really is",
    );
    savePlan(tankId, second, {
      waterChangeFraction: 0.4,
      waterChangeIntervalDays: 4,
      gravelCleaningFraction: 0,
      filterCleaningIntervalDays: 0,
      trims: { stems: 5 },
    });
    const onTankPage = upcomingView(tankId).map((t) => t.title);
    expect(onTankPage).toContain("Trim plants (Stem plants)");
    expect(onTankPage).toContain("Water change (40 %)");
    const id = String(tankId);
    const journal = await call(pageLoader, get(`/tanks/${id}/journal`, keeper.cookie), { tankId: id });
    expect(journal.data.scenarioId).toBe(second);
    const mail = await reminderMail({ id: 1, tankId, userId: keeper.id, mode: "digest" } as ReminderRow, Date.now());
    expect(mail?.text).toMatch(/Trim plants \(Stem plants\)/);
    expect(mail?.text).toMatch(/Water change \(40 %\)/);
    expect(mail?.text).not.toMatch(/Carpet plants/);
    // The journal page's upcoming list, in the same order and titles as the tank page's.
    expect(journal.data.upcoming.map((t: { title: string }) => t.title)).toEqual(
      onTankPage.slice(0, journal.data.upcoming.length),
    );
  });
});
