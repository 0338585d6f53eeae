/**
 * Readings as CSV: reading an uploaded file (header mapping, units, every bad row with its line
 * number and reason, duplicates), and writing the export and the template.
 *
 * Files: UTF-8 with or without a byte-order mark, LF or CRLF line ends, comma, semicolon or tab
 * separated (semicolon files may use a decimal comma, as spreadsheets in many languages write
 * them). The header row names the columns, case-insensitively, with the unit in the name where
 * it matters — `nitrate_no3_mg_l` (as nitrate) or `nitrate_n_mg_l` (as N), `tan_nh3_mg_l`,
 * `tan_nh4_mg_l`, `tan_n_mg_l`, `nitrite_no2_mg_l`, `nitrite_n_mg_l`, `kh_dkh`,
 * `kh_mg_l_caco3`, `temperature_c`, `temperature_f`, `ph`, `note` — or without a unit
 * (`nitrate`, `kh`, …), which then takes the unit chosen on the upload form. Times are a
 * `datetime` column (ISO 8601: 2026-03-01 or 2026-03-01T08:30) or `date` and `time` columns.
 * The export and the template use the same names, so an exported file uploads again unchanged.
 */
import {
  readHeader,
  type CsvColumn,
  type CsvProblem,
  type Target,
} from "~/features/readings/readings-csv-columns.server";
import {
  checkTakenAt,
  MEASURE_KEYS,
  MEASURES,
  readMeasure,
  type MeasureKey,
  type MeasureUnits,
  type ReadingInput,
} from "~/features/readings/readings.server";
import { formatDateTime, parseDateOnly, parseDateTime, parseTimeOfDay } from "~/utils/dates";
import { unneutraliseCell } from "~/utils/csv";
import { csvFailure, detectDelimiter, readLines, type CsvFailure, type Line } from "~/utils/csv-read.server";

export type { CsvProblem } from "~/features/readings/readings-csv-columns.server";

export const MAX_CSV_BYTES = 1024 * 1024;
export const MAX_CSV_ROWS = 5000;
export const MAX_NOTE_LENGTH = 500;

const EMPTY = "The file is empty. Download the template to see the columns we read.";

type ParsedRow = ReadingInput & { line: number };

type CsvParseResult =
  | {
      ok: true;
      rows: ParsedRow[];
      /** Rows not added because they are already stored, or repeat an earlier line exactly. */
      skipped: CsvProblem[];
      ignoredColumns: string[];
      delimiter: "," | ";" | "\t";
    }
  | CsvFailure;

/** When a row was taken, from a "datetime" column or "date" and "time" columns, with its problems. */
function readWhen(cell: (kind: Target["kind"]) => string | undefined, now: number, problems: string[]): number | null {
  let takenAt: number | null = null;
  const dt = cell("datetime");
  const d = cell("date");
  const tm = cell("time");
  if (dt !== undefined) {
    if (dt === "") problems.push("the date and time are missing");
    else if ((takenAt = parseDateTime(dt)) === null)
      problems.push(`“${dt}” is not a date and time: write it as 2026-03-01 or 2026-03-01T08:30`);
  } else if (d !== undefined) {
    if (d === "") problems.push("the date is missing");
    else if (tm) {
      const day = parseDateOnly(d);
      const time = parseTimeOfDay(tm);
      if (day === null) problems.push(`“${d}” is not a date: write it as 2026-03-01`);
      if (time === null) problems.push(`“${tm}” is not a time of day: write it as 08:30`);
      if (day !== null && time !== null) takenAt = day + time;
    } else if ((takenAt = parseDateTime(d)) === null) problems.push(`“${d}” is not a date: write it as 2026-03-01`);
  }
  if (takenAt !== null) {
    const when = checkTakenAt(takenAt, now);
    if (when) problems.push(when.replace(/^The/, "the").replace(/\.$/, ""));
  }
  return takenAt;
}

type RowContext = {
  columns: (CsvColumn | null)[];
  width: number;
  units: MeasureUnits;
  decimalComma: boolean;
  now: number;
};

/** One data row as a reading, or the sentence saying what is wrong with it. */
function readRow({ cells, line }: Line, ctx: RowContext): { row: ParsedRow } | { problem: string } {
  const problems: string[] = [];
  if (cells.length > ctx.width && cells.slice(ctx.width).some((c) => c !== "")) {
    problems.push(
      `it has ${cells.length} cells where the header has ${ctx.width}${ctx.decimalComma ? "" : " (a comma inside a note or a decimal comma? Put that cell in double quotes)"}`,
    );
  }
  const cell = (kind: Target["kind"]) => {
    const i = ctx.columns.findIndex((c) => c?.target.kind === kind);
    return i >= 0 ? (cells[i] ?? "") : undefined;
  };
  const takenAt = readWhen(cell, ctx.now, problems);
  const values = Object.fromEntries(MEASURE_KEYS.map((k) => [k, null])) as Record<MeasureKey, number | null>;
  ctx.columns.forEach((c, i) => {
    if (!c || c.target.kind !== "measure") return;
    const { key, unit } = c.target;
    const units = unit ? ({ ...ctx.units, [key]: unit } as MeasureUnits) : ctx.units;
    const read = readMeasure(key, cells[i], units, ctx.decimalComma);
    if ("error" in read) problems.push(`${read.error.replace(/\.$/, "")} (column “${c.header}”, “${cells[i]}”)`);
    else values[key] = read.value;
  });
  // An exported note that looked like a formula carries a neutralising quote: take it off.
  const note = unneutraliseCell(cell("note") ?? "");
  if (note.length > MAX_NOTE_LENGTH) problems.push(`the note is longer than ${MAX_NOTE_LENGTH} characters`);
  if (problems.length === 0 && MEASURE_KEYS.every((k) => values[k] === null)) {
    problems.push(`it has no test result (${MEASURE_KEYS.map((k) => MEASURES[k].label.split(" ")[0]).join(", ")})`);
  }
  if (problems.length) return { problem: `${problems.join("; ")}.` };
  return { row: { ...values, takenAt: takenAt!, note, line } };
}

/**
 * Rows to store, without repeats: a row repeating an earlier line exactly, or a reading already
 * stored at its time, is skipped (and listed); a different row at the same time is a problem.
 */
function withoutRepeats(parsed: ParsedRow[], stored: ReadonlyMap<number, number>, problems: CsvProblem[]) {
  const rows: ParsedRow[] = [];
  const skipped: CsvProblem[] = [];
  const byTime = new Map<number, ParsedRow>();
  for (const row of parsed) {
    const { line } = row;
    const earlier = byTime.get(row.takenAt);
    if (earlier) {
      const same = MEASURE_KEYS.every((k) => earlier[k] === row[k]) && earlier.note === row.note;
      if (same) skipped.push({ line, message: `the same reading as line ${earlier.line}; added once.` });
      else
        problems.push({
          line,
          message: `it has the same date and time as line ${earlier.line} (${formatDateTime(row.takenAt)}) but different values: keep one of them.`,
        });
      continue;
    }
    byTime.set(row.takenAt, row);
    if (stored.has(row.takenAt)) {
      skipped.push({
        line,
        message: `a reading at ${formatDateTime(row.takenAt)} is already stored; not added again.`,
      });
      continue;
    }
    rows.push(row);
  }
  return { rows, skipped };
}

/**
 * Reads an uploaded readings file. `units` are the units chosen on the form, for columns whose
 * name gives none; `stored` maps the tank's stored reading times (ms) to their ids.
 */
export function parseReadingsCsv(
  text: string,
  options: { units: MeasureUnits; stored: ReadonlyMap<number, number>; now?: number },
): CsvParseResult {
  const body = text.replace(/^\uFEFF/, "");
  if (body.trim() === "") return csvFailure(EMPTY);
  const delimiter = detectDelimiter(body);
  const lines = readLines(body, delimiter);
  if (!Array.isArray(lines)) return lines;
  const [header, ...data] = lines;
  if (!header) return csvFailure(EMPTY);
  if (data.length > MAX_CSV_ROWS) {
    return csvFailure(
      `The file has ${data.length.toLocaleString("en")} rows; upload at most ${MAX_CSV_ROWS.toLocaleString("en")} at a time (split it into smaller files). Nothing was stored.`,
    );
  }
  const { columns, ignoredColumns, problems: headerProblems } = readHeader(header.cells, header.line);
  if (headerProblems.length) return csvFailure("Nothing was stored: the header row needs attention.", headerProblems);
  if (data.length === 0) {
    return csvFailure(
      "The file has a header row but no readings under it: nothing was stored. Add one row per test below the header (the template shows how).",
    );
  }
  const ctx: RowContext = {
    columns,
    width: header.cells.length,
    units: options.units,
    decimalComma: delimiter === ";",
    now: options.now ?? Date.now(),
  };
  const problems: CsvProblem[] = [];
  const parsed: ParsedRow[] = [];
  for (const line of data) {
    const read = readRow(line, ctx);
    if ("problem" in read) problems.push({ line: line.line, message: read.problem });
    else parsed.push(read.row);
  }
  const { rows, skipped } = withoutRepeats(parsed, options.stored, problems);
  if (problems.length) {
    problems.sort((a, b) => a.line - b.line);
    const n = problems.length;
    return csvFailure(
      `Nothing was stored: ${n === 1 ? "one row needs" : `${n.toLocaleString("en")} rows need`} attention. Correct ${n === 1 ? "it" : "them"} and upload the file again.`,
      problems,
    );
  }
  return { ok: true, rows, skipped, ignoredColumns, delimiter };
}
