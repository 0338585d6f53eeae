/**
 * The planned schedule after the journal: the tank's timetable (its scenario's, or the edited
 * plan's), each kind of task resumed at its own last logged entry — the next water change an
 * interval after the last logged change, the next filter cleaning an interval after the last
 * logged cleaning, a group's next trim after its last logged trim. One function, so the
 * forecast, the upcoming list, the calendar feed and the reminder mail plan the same days
 * (a maintenance interval counts from when the task was last done: common practice, no source).
 *
 * A task whose due day has passed with no entry is overdue: it is planned once, today, marked
 * with the day it fell due (however many intervals were missed), and the timetable resumes an
 * interval after today, as if it were done today — what marking it done today would plan (a
 * model choice). It never drops off because its day is in the past.
 *
 * A kind never logged counts from a fixed day, the plan's start (`PlanStart`, a model choice):
 * its first one is due an interval after that day, then follows the same rule, overdue once that
 * day has passed. Counted from today instead, it would recede a day every day and never come due.
 */
import { plannedEvents, type Scenario } from "~models";
import type { JournalEntry } from "~/features/journal/journal.server";
import { DAY_MS, startOfDay } from "~/utils/dates";

type TankEvent = ReturnType<typeof plannedEvents>[number];

/**
 * A planned event; `overdueSince` (a day of the run) when it fell due before today and is planned
 * today; `firstOne` on the first planned of a kind the journal has none of (its day counts from
 * the plan's start).
 */
export type PlannedEvent = TankEvent & { overdueSince?: number; firstOne?: true };

/**
 * The day a kind never logged counts from (a model choice: the day the keeper's records of the
 * plan begin): the later of the journal's first entry and the day the tank's edited plan was
 * first saved (later edits keep it) — before the journal began nothing tells whether a task was
 * done, and before the plan was saved its timetable was not the keeper's; with neither, the
 * scenario's start.
 */
export type PlanStart = { ms: number; from: "journal" | "plan" | "scenario" };

/**
 * The end of `now`'s day: the planner counts in whole days, so an entry dated today counts as done
 * today whatever its hour (a keeper's wall-clock time may be ahead of the server's), and one dated
 * after today is not done yet. The calendar's query and the forecast use the same bound.
 */
export const doneByEndOf = (now: number) => startOfDay(now) + DAY_MS;

const sameGroup = (g: { id: string; name: string }, name: string | undefined) =>
  [g.id, g.name].some((n) => n.toLowerCase() === (name ?? "").trim().toLowerCase());

/**
 * The planned events on days [0, `toDay`) of a run whose day 0 is `originMs` (a start of day):
 * each kind resumed at the day (start of day) of its last entry dated today or before; a kind the
 * journal has none of starts from the day of `start` (its first one an interval after it). An overdue
 * task is planned on today's day, once, with `overdueSince`. Events before day 0 are not
 * returned.
 */
export function plannedAfterJournal(
  s: Scenario,
  entries: readonly JournalEntry[],
  originMs: number,
  now: number,
  toDay: number,
  start: PlanStart,
): PlannedEvent[] {
  const today = (startOfDay(now) - originMs) / DAY_MS;
  const startDay = (startOfDay(start.ms) - originMs) / DAY_MS;
  const done = entries.filter((e) => e.doneAt < doneByEndOf(now));
  const lastDay = (match: (e: JournalEntry) => boolean) => {
    const last = done.filter(match).at(-1);
    return last === undefined ? null : (startOfDay(last.doneAt) - originMs) / DAY_MS;
  };
  // A timetable's doses start on its first day; resumed after a logged dose, that day is the logged one.
  const of = (mine: (e: TankEvent) => boolean, last: number | null): PlannedEvent[] => {
    const after = (from: number) => plannedEvents(s, toDay, from).filter((e) => mine(e) && e.day > from);
    const fromLast: PlannedEvent[] =
      last === null
        ? plannedEvents(s, toDay, startDay)
            .filter((e) => mine(e) && e.day >= startDay)
            .map((e, k) => (k === 0 ? { ...e, firstOne: true as const } : e))
        : after(last);
    const missed = fromLast.find((e) => e.day < today);
    const planned: PlannedEvent[] = missed
      ? [{ ...missed, day: today, overdueSince: missed.day }, ...after(today)]
      : fromLast;
    return planned.filter((e) => e.day >= 0 && e.day < toDay);
  };
  const kind = (k: TankEvent["kind"]) => (e: TankEvent) => e.kind === k;
  const trims = s.plants.flatMap((g) =>
    of(
      (e) => e.kind === "trim" && e.groupId === g.id,
      lastDay((e) => e.kind === "plants_trimmed" && sameGroup(g, e.details.plantGroup)),
    ),
  );
  return [
    ...of(
      kind("waterChange"),
      lastDay((e) => e.kind === "water_change"),
    ),
    ...of(
      kind("filterCleaning"),
      lastDay((e) => e.kind === "filter_cleaned"),
    ),
    ...of(
      kind("dose"),
      lastDay((e) => e.kind === "ammonia_dosed"),
    ),
    ...trims,
  ].sort((a, b) => a.day - b.day);
}
