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
import { parse } from "csv-parse/sync";
import { fromCanonical } from "~models/units";
import { toCsv, unneutraliseCell, type CsvCell } from "~/utils/csv";
import { formatDateTime, parseDateOnly, parseDateTime, parseTimeOfDay } from "~/utils/dates";
import {
  checkTakenAt,
  MEASURE_KEYS,
  MEASURES,
  readMeasure,
  type MeasureKey,
  type MeasureUnits,
  type ReadingInput,
  type ReadingRow,
} from "~/features/readings/readings.server";

export const MAX_CSV_BYTES = 1024 * 1024;
export const MAX_CSV_ROWS = 5000;
export const MAX_NOTE_LENGTH = 500;
/** Problems listed at most (the count says how many more). */
const MAX_LISTED = 200;

export type CsvProblem = { line: number; message: string };

type Target =
  | { kind: "datetime" }
  | { kind: "date" }
  | { kind: "time" }
  | { kind: "note" }
  | { kind: "measure"; key: MeasureKey; unit: string | null };

export type CsvColumn = { header: string; target: Target };

export type ParsedRow = ReadingInput & { line: number };

export type CsvParseResult =
  | {
      ok: true;
      rows: ParsedRow[];
      /** Rows not added because they are already stored, or repeat an earlier line exactly. */
      skipped: CsvProblem[];
      ignoredColumns: string[];
      delimiter: "," | ";" | "\t";
    }
  | { ok: false; message: string; problems: CsvProblem[]; more: number };

const TIME_NAMES = new Set(["datetime", "date_time", "taken_at", "timestamp", "time_stamp", "when"]);
const NOTE_NAMES = new Set(["note", "notes", "comment", "comments", "remarks"]);

/** Header text → what the column holds, or null for a column we do not read. */
export function mapHeader(header: string): Target | null {
  const tokens: string[] = header.toLowerCase().match(/[a-z0-9]+/g) ?? [];
  const first = tokens[0];
  if (first === undefined) return null;
  const joined = tokens.join("_");
  if (TIME_NAMES.has(joined)) return { kind: "datetime" };
  if (joined === "date") return { kind: "date" };
  if (joined === "time") return { kind: "time" };
  if (NOTE_NAMES.has(joined)) return { kind: "note" };
  const has = (...t: string[]) => t.some((x) => tokens.includes(x));
  if (["tan", "ammonia", "ammonium", "nh3", "nh4"].includes(first)) {
    const unit = has("n", "nh3n", "nh4n", "tann")
      ? "asN"
      : has("nh4", "ammonium")
        ? "asNH4"
        : has("nh3")
          ? "asNH3"
          : null;
    return { kind: "measure", key: "tan", unit };
  }
  if (["nitrite", "no2"].includes(first))
    return { kind: "measure", key: "nitrite", unit: has("n", "no2n") ? "asN" : has("no2") ? "asNO2" : null };
  if (["nitrate", "no3"].includes(first))
    return { kind: "measure", key: "nitrate", unit: has("n", "no3n") ? "asN" : has("no3") ? "asNO3" : null };
  if (first === "ph" && tokens.length === 1) return { kind: "measure", key: "ph", unit: null };
  if (first === "kh" || first === "alkalinity") {
    return { kind: "measure", key: "kh", unit: has("caco3", "ppm") ? "mgCaCO3" : has("dkh", "dh", "d") ? "dKH" : null };
  }
  if (first === "temperature" || first === "temp") {
    return {
      kind: "measure",
      key: "temperatureC",
      unit: has("f", "fahrenheit") ? "F" : has("c", "celsius") ? "C" : null,
    };
  }
  return null;
}

/** The column name the export and template use for a measure in a unit. */
export function columnName(key: MeasureKey, units: MeasureUnits): string {
  switch (key) {
    case "tan":
      return { asN: "tan_n_mg_l", asNH3: "tan_nh3_mg_l", asNH4: "tan_nh4_mg_l" }[units.tan];
    case "nitrite":
      return { asN: "nitrite_n_mg_l", asNO2: "nitrite_no2_mg_l" }[units.nitrite];
    case "nitrate":
      return { asN: "nitrate_n_mg_l", asNO3: "nitrate_no3_mg_l" }[units.nitrate];
    case "ph":
      return "ph";
    case "kh":
      return { dKH: "kh_dkh", mgCaCO3: "kh_mg_l_caco3" }[units.kh];
    case "temperatureC":
      return { C: "temperature_c", F: "temperature_f" }[units.temperatureC];
  }
}

function detectDelimiter(text: string): "," | ";" | "\t" {
  const firstLine = text.split(/\r?\n/).find((l) => l.trim() !== "") ?? "";
  const outside = firstLine.replace(/"[^"]*"/g, "");
  const n = (c: string) => outside.split(c).length - 1;
  if (n("\t") > n(",") && n("\t") > n(";")) return "\t";
  return n(";") > n(",") ? ";" : ",";
}

const fail = (message: string, problems: CsvProblem[] = []): CsvParseResult => ({
  ok: false,
  message,
  problems: problems.slice(0, MAX_LISTED),
  more: Math.max(0, problems.length - MAX_LISTED),
});

/**
 * Reads an uploaded readings file. `units` are the units chosen on the form, for columns whose
 * name gives none; `stored` maps the tank's stored reading times (ms) to their ids.
 */
export function parseReadingsCsv(
  text: string,
  options: { units: MeasureUnits; stored: ReadonlyMap<number, number>; now?: number },
): CsvParseResult {
  const body = text.replace(/^\uFEFF/, "");
  if (body.trim() === "") return fail("The file is empty. Download the template to see the columns we read.");
  const delimiter = detectDelimiter(body);
  let records: { record: string[]; info: { lines: number } }[];
  try {
    records = parse(body, {
      delimiter,
      info: true,
      skip_empty_lines: true,
      relax_column_count: true,
      trim: true,
    }) as unknown as typeof records;
  } catch (error) {
    const e = error as { code?: string; lines?: number; message?: string };
    const line = e.lines ?? 0;
    const reason =
      e.code === "CSV_QUOTE_NOT_CLOSED"
        ? "a double quote opens a cell that is never closed"
        : e.code === "CSV_INVALID_CLOSING_QUOTE"
          ? "a double quote sits in the middle of a cell (put the whole cell in quotes and double the quote inside)"
          : "this line is not valid CSV";
    return fail(`Nothing was stored: the file could not be read as CSV at line ${line}.`, [{ line, message: reason }]);
  }
  // A record may span lines (a quoted note with a line break): report the line it starts on.
  const lineOf = (r: (typeof records)[number]) =>
    r.info.lines - r.record.reduce((n, c) => n + (c.match(/\n/g)?.length ?? 0), 0);
  const nonEmpty = records.filter((r) => r.record.some((c) => c !== ""));
  const [headerRecord, ...dataRecords] = nonEmpty;
  if (!headerRecord) return fail("The file is empty. Download the template to see the columns we read.");
  if (dataRecords.length > MAX_CSV_ROWS) {
    return fail(
      `The file has ${dataRecords.length.toLocaleString("en")} rows; upload at most ${MAX_CSV_ROWS.toLocaleString("en")} at a time (split it into smaller files). Nothing was stored.`,
    );
  }

  // Header row.
  const headerLine = lineOf(headerRecord);
  const columns: (CsvColumn | null)[] = headerRecord.record.map((h) => {
    const target = mapHeader(h);
    return target ? { header: h, target } : null;
  });
  const ignoredColumns = headerRecord.record.filter((h, i) => h !== "" && !columns[i]);
  const headerProblems: CsvProblem[] = [];
  const seen = new Map<string, string>();
  for (const c of columns) {
    if (!c) continue;
    const id = c.target.kind === "measure" ? c.target.key : c.target.kind;
    const before = seen.get(id);
    if (before)
      headerProblems.push({
        line: headerLine,
        message: `the columns “${before}” and “${c.header}” hold the same thing: keep one.`,
      });
    seen.set(id, c.header);
  }
  const kinds = new Set(columns.filter(Boolean).map((c) => c!.target.kind));
  if (!kinds.has("datetime") && !kinds.has("date")) {
    headerProblems.push({
      line: headerLine,
      message: `the header row needs a “datetime” column (or “date” and “time”). It has: ${headerRecord.record.map((h) => `“${h}”`).join(", ")}.`,
    });
  }
  if (kinds.has("datetime") && (kinds.has("date") || kinds.has("time"))) {
    headerProblems.push({
      line: headerLine,
      message: "use either a “datetime” column or “date” and “time” columns, not both.",
    });
  }
  if (!kinds.has("measure")) {
    headerProblems.push({
      line: headerLine,
      message:
        "the header row names no test result we read (for example nitrate_no3_mg_l, tan_nh3_mg_l, nitrite_no2_mg_l, ph, kh_dkh, temperature_c).",
    });
  }
  if (headerProblems.length) return fail("Nothing was stored: the header row needs attention.", headerProblems);
  if (dataRecords.length === 0) {
    return fail(
      "The file has a header row but no readings under it: nothing was stored. Add one row per test below the header (the template shows how).",
    );
  }

  // Data rows.
  const now = options.now ?? Date.now();
  const decimalComma = delimiter === ";";
  const problems: CsvProblem[] = [];
  const skipped: CsvProblem[] = [];
  const rows: ParsedRow[] = [];
  const byTime = new Map<number, ParsedRow>();
  const width = headerRecord.record.length;
  for (const r of dataRecords) {
    const line = lineOf(r);
    const cells = r.record;
    const rowProblems: string[] = [];
    if (cells.length > width && cells.slice(width).some((c) => c !== "")) {
      rowProblems.push(
        `it has ${cells.length} cells where the header has ${width}${decimalComma ? "" : " (a comma inside a note or a decimal comma? Put that cell in double quotes)"}`,
      );
    }
    const cell = (kind: Target["kind"]) => {
      const i = columns.findIndex((c) => c?.target.kind === kind);
      return i >= 0 ? (cells[i] ?? "") : undefined;
    };
    // When.
    let takenAt: number | null = null;
    const dt = cell("datetime");
    const d = cell("date");
    const tm = cell("time");
    if (dt !== undefined) {
      if (dt === "") rowProblems.push("the date and time are missing");
      else if ((takenAt = parseDateTime(dt)) === null)
        rowProblems.push(`“${dt}” is not a date and time: write it as 2026-03-01 or 2026-03-01T08:30`);
    } else if (d !== undefined) {
      if (d === "") rowProblems.push("the date is missing");
      else if (tm) {
        const day = parseDateOnly(d);
        const time = parseTimeOfDay(tm);
        if (day === null) rowProblems.push(`“${d}” is not a date: write it as 2026-03-01`);
        if (time === null) rowProblems.push(`“${tm}” is not a time of day: write it as 08:30`);
        if (day !== null && time !== null) takenAt = day + time;
      } else if ((takenAt = parseDateTime(d)) === null)
        rowProblems.push(`“${d}” is not a date: write it as 2026-03-01`);
    }
    if (takenAt !== null) {
      const when = checkTakenAt(takenAt, now);
      if (when) rowProblems.push(when.replace(/^The/, "the").replace(/\.$/, ""));
    }
    // What.
    const values = Object.fromEntries(MEASURE_KEYS.map((k) => [k, null])) as Record<MeasureKey, number | null>;
    columns.forEach((c, i) => {
      if (!c || c.target.kind !== "measure") return;
      const { key, unit } = c.target;
      const units = unit ? ({ ...options.units, [key]: unit } as MeasureUnits) : options.units;
      const read = readMeasure(key, cells[i], units, decimalComma);
      if ("error" in read) rowProblems.push(`${read.error.replace(/\.$/, "")} (column “${c.header}”, “${cells[i]}”)`);
      else values[key] = read.value;
    });
    // An exported note that looked like a formula carries a neutralising quote: take it off.
    const note = unneutraliseCell(cell("note") ?? "");
    if (note.length > MAX_NOTE_LENGTH) rowProblems.push(`the note is longer than ${MAX_NOTE_LENGTH} characters`);
    if (rowProblems.length === 0 && MEASURE_KEYS.every((k) => values[k] === null)) {
      rowProblems.push(
        `it has no test result (${MEASURE_KEYS.map((k) => MEASURES[k].label.split(" ")[0]).join(", ")})`,
      );
    }
    if (rowProblems.length) {
      problems.push({ line, message: `${rowProblems.join("; ")}.` });
      continue;
    }
    const row: ParsedRow = { ...values, takenAt: takenAt!, note, line };
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
    if (options.stored.has(row.takenAt)) {
      skipped.push({
        line,
        message: `a reading at ${formatDateTime(row.takenAt)} is already stored; not added again.`,
      });
      continue;
    }
    rows.push(row);
  }
  if (problems.length) {
    const n = problems.length;
    return fail(
      `Nothing was stored: ${n === 1 ? "one row needs" : `${n.toLocaleString("en")} rows need`} attention. Correct ${n === 1 ? "it" : "them"} and upload the file again.`,
      problems,
    );
  }
  return { ok: true, rows, skipped, ignoredColumns, delimiter };
}

// ---------------------------------------------------------------------------------------------
// Writing

function displayValue(key: MeasureKey, value: number | null, units: MeasureUnits): number | null {
  if (value === null) return null;
  const q = MEASURES[key].quantity;
  const v = q ? fromCanonical(q, value, units[key as Exclude<MeasureKey, "ph">]) : value;
  return Number(v.toPrecision(6));
}

/** Readings as CSV in `units` (text cells that look like formulas are neutralised by toCsv). */
export function readingsCsv(rows: readonly ReadingRow[], units: MeasureUnits): string {
  const header: CsvCell[] = ["datetime", ...MEASURE_KEYS.map((k) => columnName(k, units)), "note"];
  return toCsv([
    header,
    ...rows.map((r) => [
      formatDateTime(r.takenAt.getTime()).replace(" ", "T"),
      ...MEASURE_KEYS.map((k) => displayValue(k, r[k], units)),
      r.note,
    ]),
  ]);
}

/**
 * A template in `units`: the header and three example rows (our own invented numbers) dated the
 * days before `today`, to overwrite with real results.
 */
export function templateCsv(units: MeasureUnits, today: number): string {
  const day = 86_400_000;
  const d0 = today - (today % day);
  const example = (daysAgo: number, canonical: Record<MeasureKey, number | null>, note: string): CsvCell[] => [
    formatDateTime(d0 - daysAgo * day + 8.5 * 3_600_000).replace(" ", "T"),
    ...MEASURE_KEYS.map((k) => {
      const v = displayValue(k, canonical[k], units);
      return v === null ? null : Number(v.toPrecision(3));
    }),
    note,
  ];
  return toCsv([
    ["datetime", ...MEASURE_KEYS.map((k) => columnName(k, units)), "note"],
    example(7, { tan: 0, nitrite: 0, nitrate: 3.39, ph: 7.2, kh: 5, temperatureC: 25 }, "before the water change"),
    example(4, { tan: 0.04, nitrite: 0, nitrate: 2.71, ph: 7.2, kh: 5, temperatureC: 25 }, ""),
    example(1, { tan: null, nitrite: null, nitrate: 3.16, ph: null, kh: null, temperatureC: null }, "nitrate only"),
  ]);
}
