/** Journal set-ups shared by the journal, replay and forecast tests. */
import { action as journalPageAction } from "~/routes/journal/journal";
import { call, post } from "./routes";
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
