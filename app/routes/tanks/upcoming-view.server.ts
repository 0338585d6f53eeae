/** The upcoming planned tasks as the tank and plan pages show them (dates in words). */
import { upcomingPlanned } from "~/features/tanks/maintenance-plan.server";

const dayText = (ms: number) =>
  new Date(ms).toLocaleDateString("en-GB", { weekday: "short", day: "numeric", month: "long", timeZone: "UTC" });

export function upcomingView(tankId: number, now = Date.now()) {
  return upcomingPlanned(tankId, now).map((t) => ({
    key: t.key,
    title: t.title,
    when: dayText(t.atMs),
    overdue: t.overdue,
    values: t.values,
  }));
}
