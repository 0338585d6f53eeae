/**
 * The journal as CSV, with the readings' conventions (app/features/readings): every bad row
 * named by its line, nothing stored unless every row is good, units in the header names. The
 * columns are the form's field names: `date`, `kind`, then the kind's fields
 * (`water_changed_percent`, `tap_nitrate_no3_mg_l`, `plant_dry_g`, …) and `note`; a column the
 * row's kind does not use is left empty. An exported file uploads again unchanged.
 */
import { checkTakenAt } from "~/features/readings/readings.server";
import {
  ENTRY_FIELDS,
  MAX_JOURNAL_NOTE,
  readEntryFields,
  entryFields,
  type EntryInput,
} from "~/features/journal/journal-entries";
import type { JournalEntry } from "~/features/journal/journal.server";
import { csvFailure, detectDelimiter, readLines, type CsvFailure, type CsvProblem } from "~/utils/csv-read.server";
import { toCsv, unneutraliseCell } from "~/utils/csv";
import { formatDateTime, parseDateTime } from "~/utils/dates";

const HEADER = ["date", "kind", ...ENTRY_FIELDS, "note"] as const;
const MAX_ROWS = 5000;
export const MAX_JOURNAL_CSV_BYTES = 1024 * 1024;

type Parsed = { ok: true; entries: (EntryInput & { line: number })[] } | CsvFailure;

export function journalCsv(entries: readonly JournalEntry[]): string {
  return toCsv([
    [...HEADER],
    ...entries.map((e) => {
      const f = entryFields(e.kind, e.details);
      return [formatDateTime(e.doneAt).replace(" ", "T"), e.kind, ...ENTRY_FIELDS.map((k) => f[k]), e.note];
    }),
  ]);
}

/** Reads a journal file: all its rows as entries, or every problem by line. */
export function parseJournalCsv(text: string, now = Date.now()): Parsed {
  const body = text.replace(/^\uFEFF/, "");
  if (body.trim() === "") return csvFailure("The file is empty. Export the journal to see the columns we read.");
  const lines = readLines(body, detectDelimiter(body));
  if (!Array.isArray(lines)) return lines;
  const [header, ...data] = lines;
  const names = header.cells.map((c) => c.trim().toLowerCase());
  const problems: CsvProblem[] = [];
  const unknown = names.filter((n) => n !== "" && !(HEADER as readonly string[]).includes(n));
  if (unknown.length)
    problems.push({
      line: header.line,
      message: `columns we do not read: ${unknown.map((u) => `“${u}”`).join(", ")} (we read ${HEADER.join(", ")}).`,
    });
  for (const need of ["date", "kind"]) {
    if (!names.includes(need))
      problems.push({ line: header.line, message: `the header row needs a “${need}” column.` });
  }
  const twice = names.filter((n, i) => n !== "" && names.indexOf(n) !== i);
  if (twice.length) problems.push({ line: header.line, message: `the column “${twice[0]}” appears twice: keep one.` });
  if (problems.length) return csvFailure("Nothing was stored: the header row needs attention.", problems);
  if (data.length === 0) return csvFailure("The file has a header row but no entries under it: nothing was stored.");
  if (data.length > MAX_ROWS)
    return csvFailure(`The file has ${data.length} rows; upload at most ${MAX_ROWS} at a time. Nothing was stored.`);
  const entries: (EntryInput & { line: number })[] = [];
  for (const { cells, line } of data) {
    const cell = (name: string) => {
      const i = names.indexOf(name);
      return i >= 0 ? (cells[i] ?? "").trim() : "";
    };
    const why: string[] = [];
    if (cells.length > names.length && cells.slice(names.length).some((c) => c !== ""))
      why.push(`it has ${cells.length} cells where the header has ${names.length}`);
    const date = cell("date");
    const doneAt = date === "" ? null : parseDateTime(date);
    if (date === "") why.push("the date is missing");
    else if (doneAt === null) why.push(`“${date}” is not a date: write it as 2026-03-01 or 2026-03-01T08:30`);
    else {
      const bad = checkTakenAt(doneAt, now);
      if (bad) why.push(bad.replace(/^The/, "the").replace(/\.$/, ""));
    }
    const read = readEntryFields(Object.fromEntries(["kind", ...ENTRY_FIELDS].map((k) => [k, cell(k)])));
    if (!read.ok) for (const [k, m] of Object.entries(read.errors)) why.push(`${m} (column “${k}”)`);
    const note = unneutraliseCell(cell("note"));
    if (note.length > MAX_JOURNAL_NOTE) why.push(`the note is longer than ${MAX_JOURNAL_NOTE} characters`);
    if (why.length || !read.ok || doneAt === null) problems.push({ line, message: `${why.join("; ")}.` });
    else entries.push({ doneAt, kind: read.kind, details: read.details, note, line });
  }
  if (problems.length) {
    const n = problems.length;
    return csvFailure(
      `Nothing was stored: ${n === 1 ? "one row needs" : `${n} rows need`} attention. Correct ${n === 1 ? "it" : "them"} and upload the file again.`,
      problems,
    );
  }
  return { ok: true, entries };
}
