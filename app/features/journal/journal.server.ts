/**
 * The journal's rows: listing, adding (one or all of a file's rows in one transaction), editing
 * and deleting, always within the owner's tank (the caller has checked the tank is theirs).
 */
import { and, asc, count, desc, eq, inArray, lt, max, sql } from "drizzle-orm";
import { LRUCache } from "lru-cache";
import { getDb, type Db } from "~/db/client.server";
import { journalEntries } from "~/db/schema-care";
import {
  ENTRY_FIELDS,
  MAX_JOURNAL_NOTE,
  readEntryFields,
  FILE_UNITS,
  type EntryDetails,
  type FieldUnits,
  type EntryInput,
  type EntryKind,
} from "~/features/journal/journal-entries";
import { checkTakenAt } from "~/features/readings/readings.server";
import { checkNewJournalEntries } from "~/quotas.server";
import { parseDateTime } from "~/utils/dates";

export type JournalEntry = {
  id: number;
  doneAt: number;
  kind: EntryKind;
  details: EntryDetails;
  note: string;
};

const fromRow = (r: typeof journalEntries.$inferSelect): JournalEntry => ({
  id: r.id,
  doneAt: r.doneAt.getTime(),
  kind: r.kind as EntryKind,
  details: r.details as EntryDetails,
  note: r.note,
});

/** Entries oldest first. */
export function listJournal(tankId: number): JournalEntry[] {
  return getDb()
    .select()
    .from(journalEntries)
    .where(eq(journalEntries.tankId, tankId))
    .orderBy(asc(journalEntries.doneAt), asc(journalEntries.id))
    .all()
    .map(fromRow);
}

/**
 * Entries oldest first, kept per journal version: every write to a journal bumps its tank's
 * journal_version (a trigger, drizzle/0014), so the key is never stale and each app process
 * keeps its own. A full journal (20,000 entries) takes some 50 ms to read, and the journal,
 * calibration and tank-list replays read it whole; at most 60,000 entries are kept.
 */
const keptJournals = new LRUCache<string, readonly JournalEntry[]>({
  maxSize: 60_000,
  sizeCalculation: (entries) => Math.max(1, entries.length),
});

/** `listJournal` for a tank row read in this request (its journal_version names the entries). */
export function journalOf(tank: { id: number; journalVersion: number }): readonly JournalEntry[] {
  const key = `${tank.id}:${tank.journalVersion}`;
  let entries = keptJournals.get(key);
  if (!entries) {
    entries = Object.freeze(listJournal(tank.id));
    keptJournals.set(key, entries);
  }
  return entries;
}

/** How many entries the tank's journal holds. */
export function countJournal(tankId: number): number {
  return getDb().select({ n: count() }).from(journalEntries).where(eq(journalEntries.tankId, tankId)).get()?.n ?? 0;
}

/** `limit` entries newest first, after skipping the `offset` newest: one page of the journal's table. */
export function newestJournalEntries(tankId: number, offset: number, limit: number): JournalEntry[] {
  return getDb()
    .select()
    .from(journalEntries)
    .where(eq(journalEntries.tankId, tankId))
    .orderBy(desc(journalEntries.doneAt), desc(journalEntries.id))
    .limit(limit)
    .offset(offset)
    .all()
    .map(fromRow);
}

/** When the journal's first entry was done, or null for an empty journal (one index read). */
export function firstEntryAt(tankId: number): number | null {
  const row = getDb()
    .select({ doneAt: journalEntries.doneAt })
    .from(journalEntries)
    .where(eq(journalEntries.tankId, tankId))
    .orderBy(asc(journalEntries.doneAt))
    .limit(1)
    .get();
  return row ? row.doneAt.getTime() : null;
}

/**
 * The newest entry of each kind a planned task resumes from (a water change, a filter cleaning,
 * each plant group's trim) dated before `before`, oldest first: what the calendar feed needs, without reading a journal
 * of 20,000 entries on every poll of an address anyone holding it may ask for (about 0.2 s).
 */
export function lastTaskEntries(tankId: number, before: number): JournalEntry[] {
  const db = getDb();
  // Only entries dated before `before`, as the planner counts them: a later one must not hide the
  // one the planner resumes from (the calendar would lose an overdue task the tank page shows).
  const mine = (kind: EntryKind) =>
    and(eq(journalEntries.tankId, tankId), eq(journalEntries.kind, kind), lt(journalEntries.doneAt, new Date(before)));
  const newest = (kind: EntryKind) =>
    db
      .select()
      .from(journalEntries)
      .where(mine(kind))
      .orderBy(desc(journalEntries.doneAt), desc(journalEntries.id))
      .limit(1)
      .get();
  // Trims, one per plant group: SQLite takes a bare column's value from the row holding the max().
  const group = sql`lower(trim(coalesce(json_extract(${journalEntries.details}, '$.plantGroup'), '')))`;
  const trims = db
    .select({ id: journalEntries.id, doneAt: max(journalEntries.doneAt) })
    .from(journalEntries)
    .where(mine("plants_trimmed"))
    .groupBy(group)
    .all();
  const trimRows = trims.length
    ? db
        .select()
        .from(journalEntries)
        .where(
          inArray(
            journalEntries.id,
            trims.map((t) => t.id),
          ),
        )
        .all()
    : [];
  return [newest("water_change"), newest("filter_cleaned"), ...trimRows]
    .filter((r) => r !== undefined)
    .map(fromRow)
    .sort((a, b) => a.doneAt - b.doneAt || a.id - b.id);
}

/** One entry of this tank, or null (without reading the whole journal, which may hold 20,000). */
export function journalEntry(tankId: number, id: number): JournalEntry | null {
  const row = getDb()
    .select()
    .from(journalEntries)
    .where(and(eq(journalEntries.tankId, tankId), eq(journalEntries.id, id)))
    .get();
  return row ? fromRow(row) : null;
}

type Tx = Parameters<Parameters<Db["transaction"]>[0]>[0];

/** Adds entries in the caller's transaction (all or none); QuotaExceeded (413) past the journal quotas. */
function insertEntries(tx: Tx, tankId: number, entries: readonly EntryInput[]): number[] {
  checkNewJournalEntries(tx, tankId, entries.length);
  return entries.map(
    (e) =>
      tx
        .insert(journalEntries)
        .values({ tankId, doneAt: new Date(e.doneAt), kind: e.kind, details: e.details, note: e.note })
        .returning({ id: journalEntries.id })
        .get().id,
  );
}

export function addEntries(tankId: number, entries: readonly EntryInput[]): number[] {
  return getDb().transaction((tx) => insertEntries(tx, tankId, entries));
}

/** Replaces an entry of this tank; false if there is none with that id. */
export function updateEntry(tankId: number, id: number, e: EntryInput): boolean {
  const r = getDb()
    .update(journalEntries)
    .set({ doneAt: new Date(e.doneAt), kind: e.kind, details: e.details, note: e.note })
    .where(and(eq(journalEntries.id, id), eq(journalEntries.tankId, tankId)))
    .run();
  return r.changes === 1;
}

export function deleteEntry(tankId: number, id: number): boolean {
  const r = getDb()
    .delete(journalEntries)
    .where(and(eq(journalEntries.id, id), eq(journalEntries.tankId, tankId)))
    .run();
  return r.changes === 1;
}

/**
 * One entry from text fields (a form or an API body): `date`, `kind`, the kind's fields, `note`;
 * amounts in `units` (a person's own on the page's form, the columns' own in the API). Field
 * errors by name, or the entry.
 */
export function readEntry(
  fields: Record<string, unknown>,
  now = Date.now(),
  units: FieldUnits = FILE_UNITS,
): { ok: true; entry: EntryInput } | { ok: false; errors: Record<string, string> } {
  const str = (k: string) => {
    const v = fields[k];
    return typeof v === "string" ? v : typeof v === "number" && Number.isFinite(v) ? String(v) : "";
  };
  const errors: Record<string, string> = {};
  for (const [k, v] of Object.entries(fields)) {
    if (v !== undefined && v !== null && typeof v !== "string" && typeof v !== "number")
      errors[k] = "Must be text or a number";
  }
  const date = str("date");
  const doneAt = parseDateTime(date);
  if (date.trim() === "") errors.date = "The date is needed";
  else if (doneAt === null) errors.date = "Write the date as 2026-03-01 or 2026-03-01T08:30";
  else {
    const bad = checkTakenAt(doneAt, now);
    if (bad) errors.date = bad;
  }
  const note = str("note").trim();
  if (note.length > MAX_JOURNAL_NOTE) errors.note = `At most ${MAX_JOURNAL_NOTE} characters`;
  const read = readEntryFields(Object.fromEntries(["kind", ...ENTRY_FIELDS].map((k) => [k, str(k)])), units);
  if (!read.ok) Object.assign(errors, read.errors);
  if (Object.keys(errors).length || !read.ok || doneAt === null) return { ok: false, errors };
  return { ok: true, entry: { doneAt, kind: read.kind, details: read.details, note } };
}

/** An entry in the API's JSON shape (canonical units, ISO time). */
export function entryJson(e: JournalEntry) {
  return { id: e.id, doneAt: new Date(e.doneAt).toISOString(), kind: e.kind, details: e.details, note: e.note };
}
