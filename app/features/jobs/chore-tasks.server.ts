/**
 * Heavy synchronous chores of a request, as messages for the chores worker thread
 * (server/chores-worker.ts): reading an uploaded readings or journal CSV and drawing a share picture.
 * Pure (no database, no HTTP), so they run the same in a worker or in-process.
 */
import { parseJournalCsv } from "~/features/journal/journal-csv.server";
import { parseReadingsCsv } from "~/features/readings/readings-csv.server";
import { svgToPng } from "~/features/sharing/preview-png.server";

export type ChoreTask =
  | { kind: "readingsCsv"; args: Parameters<typeof parseReadingsCsv> }
  | { kind: "journalCsv"; args: Parameters<typeof parseJournalCsv> }
  | { kind: "png"; svg: string; fontFamily: string };

export type ChoreResult =
  | { kind: "readingsCsv"; parsed: ReturnType<typeof parseReadingsCsv> }
  | { kind: "journalCsv"; parsed: ReturnType<typeof parseJournalCsv> }
  | { kind: "png"; png: Uint8Array };

export function runChore(task: ChoreTask): ChoreResult {
  if (task.kind === "readingsCsv") return { kind: "readingsCsv", parsed: parseReadingsCsv(...task.args) };
  if (task.kind === "journalCsv") return { kind: "journalCsv", parsed: parseJournalCsv(...task.args) };
  return { kind: "png", png: svgToPng(task.svg, task.fontFamily) };
}
