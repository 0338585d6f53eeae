/**
 * The planned schedule after the journal: the tank's timetable (its scenario's, or the edited
 * plan's), each kind of task resumed at its own last logged entry — the next water change an
 * interval after the last logged change, the next filter cleaning an interval after the last
 * logged cleaning, a group's next trim after its last logged trim. One function, so the
 * forecast, the upcoming list, the calendar feed and the reminder mail plan the same days
 * (a maintenance interval counts from when the task was last done: common practice, no source).
 */
import { plannedEvents, type Scenario } from "~models";
import type { JournalEntry } from "~/features/journal/journal.server";
import { DAY_MS, startOfDay } from "~/utils/dates";

type TankEvent = ReturnType<typeof plannedEvents>[number];

const sameGroup = (g: { id: string; name: string }, name: string | undefined) =>
  [g.id, g.name].some((n) => n.toLowerCase() === (name ?? "").trim().toLowerCase());

/**
 * The planned events on days [0, `toDay`) of a run whose day 0 is `originMs`: each kind resumed
 * at the day (start of day) of its last entry done by `now`, or at `noneDay` when the journal has
 * none of that kind. Events before day 0 are not returned; the caller drops those before today.
 */
export function plannedAfterJournal(
  s: Scenario,
  entries: readonly JournalEntry[],
  originMs: number,
  now: number,
  toDay: number,
  noneDay: number,
): TankEvent[] {
  const done = entries.filter((e) => e.doneAt <= now);
  const lastDay = (match: (e: JournalEntry) => boolean) => {
    const last = done.filter(match).at(-1);
    return last === undefined ? null : (startOfDay(last.doneAt) - originMs) / DAY_MS;
  };
  // A timetable's doses start on its first day; resumed after a logged dose, that day is the logged one.
  const of = (kind: TankEvent["kind"], last: number | null) =>
    plannedEvents(s, toDay, last ?? noneDay).filter(
      (e) => e.kind === kind && e.day >= 0 && e.day < toDay && (last === null || e.day > last),
    );
  const trims = s.plants.flatMap((g) =>
    of(
      "trim",
      lastDay((e) => e.kind === "plants_trimmed" && sameGroup(g, e.details.plantGroup)),
    ).filter((e) => e.kind === "trim" && e.groupId === g.id),
  );
  return [
    ...of(
      "waterChange",
      lastDay((e) => e.kind === "water_change"),
    ),
    ...of(
      "filterCleaning",
      lastDay((e) => e.kind === "filter_cleaned"),
    ),
    ...of(
      "dose",
      lastDay((e) => e.kind === "ammonia_dosed"),
    ),
    ...trims,
  ].sort((a, b) => a.day - b.day);
}
