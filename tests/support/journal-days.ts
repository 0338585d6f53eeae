/** Days and dates as the journal tests write and read them (UTC days, as the app counts). */
import type { JournalEntry } from "~/features/journal/journal.server";

export const DAY = 86_400_000;

/** The start of today (UTC). */
export const today = () => Math.floor(Date.now() / DAY) * DAY;

/** The date `daysAgo` UTC days before today, as a journal form's date field takes it. */
export const day = (daysAgo: number) => new Date(today() - daysAgo * DAY).toISOString().slice(0, 10);

/** "1 December": a day in words, as the task titles say it. */
export const dayInWords = (daysAgo: number) =>
  new Date(today() - daysAgo * DAY).toLocaleDateString("en-GB", { day: "numeric", month: "long", timeZone: "UTC" });

/** "Fri 4 December": a day ahead, as the upcoming list and the mails date a task. */
export const dayAheadInWords = (daysAhead: number) =>
  new Date(today() + daysAhead * DAY).toLocaleDateString("en-GB", {
    weekday: "short",
    day: "numeric",
    month: "long",
    timeZone: "UTC",
  });

/** Journal entries dated `daysAgo` days before `todayMs`, at 09:00: for the planner's unit tests. */
export const entriesBefore =
  (todayMs: number) =>
  (id: number, daysAgo: number, kind: JournalEntry["kind"], details: JournalEntry["details"]): JournalEntry => ({
    id,
    doneAt: todayMs - daysAgo * DAY + 9 * 3_600_000,
    kind,
    details,
    note: "",
  });
