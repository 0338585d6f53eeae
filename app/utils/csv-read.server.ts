/**
 * Reading an uploaded CSV file, shared by every upload (readings, journal): the separator
 * (comma, semicolon or tab), the non-empty records with the line each starts on (a quoted cell
 * may span lines), and the shape of a refusal with line-numbered problems. Each feature reads
 * its own columns; all or nothing is the caller's transaction.
 */
import { parse } from "csv-parse/sync";

export type CsvProblem = { line: number; message: string };

/** Problems listed at most (the count says how many more). */
const MAX_LISTED = 200;

export function detectDelimiter(text: string): "," | ";" | "\t" {
  const firstLine = text.split(/\r?\n/).find((l) => l.trim() !== "") ?? "";
  const outside = firstLine.replace(/"[^"]*"/g, "");
  const n = (c: string) => outside.split(c).length - 1;
  if (n("\t") > n(",") && n("\t") > n(";")) return "\t";
  return n(";") > n(",") ? ";" : ",";
}

/** A refused file: nothing stored, the reason, and the problems by line (the first 200; `more` counts the rest). */
export type CsvFailure = { ok: false; message: string; problems: CsvProblem[]; more: number };

export const csvFailure = (message: string, problems: CsvProblem[] = []): CsvFailure => ({
  ok: false,
  message,
  problems: problems.slice(0, MAX_LISTED),
  more: Math.max(0, problems.length - MAX_LISTED),
});

/** One record of the file, and the line it starts on (a quoted note may span lines). */
export type Line = { cells: string[]; line: number };

/** The file's non-empty records, or why it cannot be read as CSV. */
export function readLines(body: string, delimiter: string): Line[] | CsvFailure {
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
    return csvFailure(`Nothing was stored: the file could not be read as CSV at line ${line}.`, [
      { line, message: reason },
    ]);
  }
  return records
    .filter((r) => r.record.some((c) => c !== ""))
    .map((r) => ({
      cells: r.record,
      line: r.info.lines - r.record.reduce((n, c) => n + (c.match(/\n/g)?.length ?? 0), 0),
    }));
}
