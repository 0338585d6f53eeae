/** The upcoming planned tasks as the tank and plan pages show them (dates in words). */
import { upcomingPlanned } from "~/features/tanks/maintenance-plan.server";

/** A planned day in words: days are wall-clock dates read as UTC (app/utils/time-zones.ts). */
const dayText = (ms: number) =>
  new Date(ms).toLocaleDateString("en-GB", { weekday: "short", day: "numeric", month: "long", timeZone: "UTC" });

/** `now`: the viewer's wall clock (keeperNow), so "today" is their day, not the server's. */
export function upcomingView(tankId: number, now = Date.now()) {
  return upcomingPlanned(tankId, now).map((t) => ({
    key: t.key,
    title: t.title,
    when: dayText(t.atMs),
    overdue: t.overdue,
    values: t.values,
  }));
}
