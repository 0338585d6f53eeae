/**
 * Demo journal: what Jonah (our invented keeper) did to "Living-room 120" over the month of his
 * demo readings — a quarter of the water changed on the mornings his "before the water change"
 * readings point to, a light filter rinse, gravel siphoned, a note where he fed extra. Our own
 * invented history, on the readings' timeline (day 0 is 35 days before the seed).
 */
import type { EntryInput } from "~/features/journal/journal-entries";
import type { JournalEntry } from "~/features/journal/journal.server";
import type { Db } from "~/db/client.server";
import { journalEntries } from "~/db/schema-care";
import { DAY_MS, startOfDay } from "~/utils/dates";

type Tx = Parameters<Parameters<Db["transaction"]>[0]>[0];

const change = { share: 0.25, litres: null, tapNitrateMgN: null, roShare: null };

/** Model day (fractional: the time of day), kind, details, note. */
const MONTH: [number, EntryInput["kind"], EntryInput["details"], string][] = [
  [1.3, "water_change", change, ""],
  [7.3, "water_change", change, ""],
  [14.3, "water_change", change, "siphoned the front"],
  [14.35, "gravel_cleaned", { gravelShare: 0.2 }, ""],
  [15.8, "filter_cleaned", { thoroughness: "light" }, "sponge squeezed in tank water"],
  [19.3, "note", {}, "fed a little extra this week"],
  [21.3, "water_change", change, ""],
  [28.3, "water_change", change, ""],
  [26.5, "note", {}, "stems look pale"],
];

/** The demo month's entries, oldest first, on a timeline whose day 0 starts at `start` (ms). */
export function demoJournalEntries(start: number): JournalEntry[] {
  return MONTH.map(([day, kind, details, note], id) => ({
    id,
    doneAt: start + Math.round(day * 24 * 60) * 60_000,
    kind,
    details,
    note,
  })).sort((a, b) => a.doneAt - b.doneAt);
}

export function seedDemoJournal(tx: Tx, tankId: number, now = Date.now()): void {
  const start = startOfDay(now) - 35 * DAY_MS;
  for (const { doneAt, kind, details, note } of demoJournalEntries(start)) {
    tx.insert(journalEntries)
      .values({ tankId, doneAt: new Date(doneAt), kind, details, note })
      .run();
  }
}
