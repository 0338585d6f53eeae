/** Journal set-ups shared by the journal, replay and forecast tests. */
import { expect } from "vitest";
import { action as journalPageAction } from "~/routes/journal/journal";
import { action as journalApiPost } from "~/routes/api/tank-journal";
import { call, post, postJson } from "./routes";
import { createScenario, createTank } from "./tanks";
import { userWithCookie } from "./users";
import { day } from "./journal-days";

export { DAY, day } from "./journal-days";

/** Adds one entry through the journal page's form, as a keeper would; returns the answer. */
export function addThroughPage(tankId: string, cookie: string, fields: Record<string, string>) {
  return call(journalPageAction, post(`/tanks/${tankId}/journal`, { intent: "add", ...fields }, cookie), { tankId });
}

/**
 * A keeper's tank whose nitrate climbs past any target: heavy feeding, no plants and no planned
 * water changes (our own worked example), with a 50 % change logged five days ago.
 */
export async function climbingTankWithJournal() {
  const keeper = await userWithCookie();
  const tankId = String(createTank(keeper.id));
  await createScenario(keeper.id, Number(tankId), {
    water: { volumeL: 100, startNitrate: 3 },
    fish: { feedGPerDay: 0.4 },
    plants: [],
    maintenance: { waterChangeIntervalDays: 0 },
    tapWater: { nitrate: 0, roShare: 0 },
  });
  await addThroughPage(tankId, keeper.cookie, { date: day(5), kind: "water_change", water_changed_percent: "50" });
  return { keeper, tankId };
}

/**
 * A keeper's tank at pH 8.2 and 28 °C with fish and weekly 30 % changes (our own worked example:
 * quiet on water changes alone), and `log` to add entries through the API as an app would.
 */
export async function tankAtPh8(keeperGiven?: Awaited<ReturnType<typeof userWithCookie>>, name?: string) {
  const keeper = keeperGiven ?? (await userWithCookie());
  const tankId = String(createTank(keeper.id, name));
  await createScenario(keeper.id, Number(tankId), {
    water: { volumeL: 100, startNitrate: 5, pH: 8.2, temperatureC: 28 },
    fish: { feedGPerDay: 0.5 },
    maintenance: { waterChangeIntervalDays: 7, waterChangeFraction: 0.3 },
    tapWater: { nitrate: 0, roShare: 0 },
  });
  const log = async (entry: Record<string, unknown>) => {
    const r = await call(journalApiPost, postJson(`/api/tanks/${tankId}/journal`, entry, keeper.cookie), { tankId });
    expect(r.status).toBe(201);
  };
  return { keeper, tankId, log };
}
