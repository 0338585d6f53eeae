/**
 * The columns of a readings CSV file: what a header names (case-insensitively, with the unit in
 * the name where it matters), the name the export and template give each measure in a unit, and
 * the checks on a header row. Shared by reading and writing, so an exported file uploads again.
 */
import { MEASURE_KEYS, type MeasureKey, type MeasureUnits } from "~/features/readings/readings.server";

import type { CsvProblem } from "~/utils/csv-read.server";

export type { CsvProblem } from "~/utils/csv-read.server";

export type Target =
  | { kind: "datetime" }
  | { kind: "date" }
  | { kind: "time" }
  | { kind: "note" }
  | { kind: "measure"; key: MeasureKey; unit: string | null };

export type CsvColumn = { header: string; target: Target };

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
function columnName(key: MeasureKey, units: MeasureUnits): string {
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

const HEADER_EXAMPLES = "nitrate_no3_mg_l, tan_nh3_mg_l, nitrite_no2_mg_l, ph, kh_dkh, temperature_c";

/**
 * The header row's columns (null for one we do not read), the names of the ignored ones, and the
 * header's problems: a column twice, no time, both kinds of time, no test result.
 */
export function readHeader(
  headers: readonly string[],
  line: number,
): { columns: (CsvColumn | null)[]; ignoredColumns: string[]; problems: CsvProblem[] } {
  const columns = headers.map((h) => {
    const target = mapHeader(h);
    return target ? { header: h, target } : null;
  });
  const ignoredColumns = headers.filter((h, i) => h !== "" && !columns[i]);
  const problems: CsvProblem[] = [];
  const seen = new Map<string, string>();
  for (const c of columns) {
    if (!c) continue;
    const id = c.target.kind === "measure" ? c.target.key : c.target.kind;
    const before = seen.get(id);
    if (before)
      problems.push({ line, message: `the columns “${before}” and “${c.header}” hold the same thing: keep one.` });
    seen.set(id, c.header);
  }
  const kinds = new Set(columns.filter(Boolean).map((c) => c!.target.kind));
  if (!kinds.has("datetime") && !kinds.has("date")) {
    problems.push({
      line,
      message: `the header row needs a “datetime” column (or “date” and “time”). It has: ${headers.map((h) => `“${h}”`).join(", ")}.`,
    });
  }
  if (kinds.has("datetime") && (kinds.has("date") || kinds.has("time"))) {
    problems.push({ line, message: "use either a “datetime” column or “date” and “time” columns, not both." });
  }
  if (!kinds.has("measure")) {
    problems.push({ line, message: `the header row names no test result we read (for example ${HEADER_EXAMPLES}).` });
  }
  return { columns, ignoredColumns, problems };
}

/** The header of the export and the template: the time, each measure in `units`, the note. */
export function exportHeader(units: MeasureUnits): string[] {
  return ["datetime", ...MEASURE_KEYS.map((k) => columnName(k, units)), "note"];
}
