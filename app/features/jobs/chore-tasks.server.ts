/**
 * Heavy synchronous chores of a request, as messages for the chores worker thread
 * (server/chores-worker.ts): reading an uploaded readings or journal CSV, writing the journal,
 * the readings or a journal replay as CSV, building a journal replay's chart and drawing a share
 * picture. Pure (no database, no HTTP), so they run the same in a worker or in-process.
 */
import { journalCsv, parseJournalCsv } from "~/features/journal/journal-csv.server";
import { replayChartCsv, replayChartData, type ReplayChartInput } from "~/features/journal/replay-chart.server";
import { readingsCsv } from "~/features/readings/readings-csv-export.server";
import { parseReadingsCsv } from "~/features/readings/readings-csv.server";
import { svgToPng } from "~/features/sharing/preview-png.server";

export type ChoreTask =
  | { kind: "readingsCsv"; args: Parameters<typeof parseReadingsCsv> }
  | { kind: "journalCsv"; args: Parameters<typeof parseJournalCsv> }
  | { kind: "png"; svg: string; fontFamily: string }
  | { kind: "writeJournalCsv"; args: Parameters<typeof journalCsv> }
  | { kind: "writeReadingsCsv"; args: Parameters<typeof readingsCsv> }
  | { kind: "writeReplayCsv"; input: ReplayChartInput }
  | { kind: "replayChart"; input: ReplayChartInput };

export type ChoreResult =
  | { kind: "readingsCsv"; parsed: ReturnType<typeof parseReadingsCsv> }
  | { kind: "journalCsv"; parsed: ReturnType<typeof parseJournalCsv> }
  | { kind: "png"; png: Uint8Array }
  | { kind: "csvText"; text: string }
  | { kind: "replayChart"; chart: ReturnType<typeof replayChartData> };

export function runChore(task: ChoreTask): ChoreResult {
  switch (task.kind) {
    case "readingsCsv":
      return { kind: "readingsCsv", parsed: parseReadingsCsv(...task.args) };
    case "journalCsv":
      return { kind: "journalCsv", parsed: parseJournalCsv(...task.args) };
    case "png":
      return { kind: "png", png: svgToPng(task.svg, task.fontFamily) };
    case "writeJournalCsv":
      return { kind: "csvText", text: journalCsv(...task.args) };
    case "writeReadingsCsv":
      return { kind: "csvText", text: readingsCsv(...task.args) };
    case "writeReplayCsv":
      return { kind: "csvText", text: replayChartCsv(task.input) };
    case "replayChart":
      return { kind: "replayChart", chart: replayChartData(task.input) };
  }
}
