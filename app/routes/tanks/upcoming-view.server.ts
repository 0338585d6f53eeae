/** The upcoming planned tasks as the tank and plan pages show them (dates in words). */
import { upcomingPlanned } from "~/features/tanks/maintenance-plan.server";
import { weekdayText } from "~/utils/dates";

/** `now`: the viewer's wall clock (keeperNow), so "today" is their day, not the server's. */
export function upcomingView(tankId: number, now = Date.now()) {
  return upcomingPlanned(tankId, now).map((t) => ({
    key: t.key,
    title: t.title,
    when: weekdayText(t.atMs),
    overdue: t.overdue,
    values: t.values,
  }));
}
