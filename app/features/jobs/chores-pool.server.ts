/**
 * The chores pool: one worker thread (piscina) for a request's heavy synchronous work that is not
 * a model run — reading an uploaded readings or journal CSV (about 100 ms for a full 1 MB file),
 * writing a full journal, readings or replay as CSV (about 40–150 ms), building a full journal
 * replay's chart (about 60 ms) and drawing a share picture (about 50 ms) — so none of them
 * stalls other people's pages.
 *
 * A pool of its own rather than the engine pool: the engine pool's fair queue is for model runs
 * (lanes, owners, low priority), and an upload would wait there behind someone's sweep; chores
 * are short, so one thread at normal priority, first come first served, answers them quickly.
 * See docs/decisions/0006-single-runs.md.
 *
 * From the TypeScript sources (vitest, `npm run dev`) there is no built worker, and chores run
 * in-process. What comes back from the worker is checked with zod before it is used.
 */
import { builtWorkerUrl } from "~/features/jobs/built-worker.server";
import Piscina from "piscina";
import { z } from "zod";
import { runChore, type ChoreResult, type ChoreTask } from "~/features/jobs/chore-tasks.server";
import { ENTRY_KINDS, THOROUGHNESS, type EntryKind } from "~/features/journal/journal-entries";
import type { ReplayChartData, ReplayChartInput } from "~/features/journal/replay-chart.server";
import { MEASURE_KEYS } from "~/features/readings/readings.server";
import { CHART_EVENT_KINDS } from "~/utils/chart-data";

const Problem = z.object({ line: z.number(), message: z.string() });
const Measures = z.object(
  Object.fromEntries(MEASURE_KEYS.map((k) => [k, z.number().nullable()])) as Record<
    (typeof MEASURE_KEYS)[number],
    z.ZodNullable<z.ZodNumber>
  >,
);
const Failure = z.object({ ok: z.literal(false), message: z.string(), problems: z.array(Problem), more: z.number() });
const maybeNumber = z.number().nullable().optional();
const JournalRow = z.object({
  doneAt: z.number(),
  kind: z.enum(Object.keys(ENTRY_KINDS) as [EntryKind, ...EntryKind[]]),
  details: z
    .object({
      share: maybeNumber,
      litres: maybeNumber,
      tapNitrateMgN: maybeNumber,
      roShare: maybeNumber,
      thoroughness: z.enum(Object.keys(THOROUGHNESS) as [keyof typeof THOROUGHNESS]).optional(),
      gravelShare: z.number().optional(),
      plantGroup: z.string().optional(),
      plantDryG: z.number().optional(),
      feedGPerDay: z.number().optional(),
      fishCount: z.number().optional(),
      ammoniaMgN: z.number().optional(),
    })
    .strict(),
  note: z.string(),
  line: z.number(),
});
const Packed = z.string();
const ReplayChart = z.object({
  labels: z.object({
    volume: z.string(),
    temperature: z.string(),
    nitrate: z.string(),
    nitrite: z.string(),
    ammonia: z.string(),
    kh: z.string(),
  }),
  guides: z.object({
    nitrateBand: z.object({ low: z.number(), high: z.number() }).optional(),
    freeAmmoniaCaution: z.number().optional(),
    nitriteCaution: z.number().optional(),
    oxygenCaution: z.number().optional(),
  }),
  events: z.array(
    z.object({
      day: z.number(),
      kind: z.enum(CHART_EVENT_KINDS),
      detail: z.string(),
    }),
  ),
  eventsTotal: z.number(),
  samplesTotal: z.number(),
  packedSeries: z.object({
    t: Packed,
    tan: Packed,
    nh3: Packed,
    no2: Packed,
    no3: Packed,
    plants: z.array(z.object({ id: z.string(), name: z.string(), massG: Packed })),
    o2: Packed.optional(),
    tanLongTerm: Packed.optional(),
    tanShortTerm: Packed.optional(),
  }),
});
const ChoreResultSchema = z.discriminatedUnion("kind", [
  z.object({
    kind: z.literal("journalCsv"),
    parsed: z.union([z.object({ ok: z.literal(true), entries: z.array(JournalRow) }), Failure]),
  }),
  z.object({
    kind: z.literal("readingsCsv"),
    parsed: z.union([
      z.object({
        ok: z.literal(true),
        rows: z.array(Measures.extend({ takenAt: z.number(), note: z.string(), line: z.number() })),
        skipped: z.array(Problem),
        ignoredColumns: z.array(z.string()),
        delimiter: z.enum([",", ";", "\t"]),
      }),
      Failure,
    ]),
  }),
  z.object({ kind: z.literal("png"), png: z.instanceof(Uint8Array) }),
  z.object({ kind: z.literal("csvText"), text: z.string() }),
  z.object({ kind: z.literal("replayChart"), chart: ReplayChart }),
]);

let piscina: Piscina<ChoreTask, unknown> | null | undefined;

function pool(): Piscina<ChoreTask, unknown> | null {
  if (piscina === undefined) {
    const url = builtWorkerUrl("chores-worker.js");
    piscina = url
      ? new Piscina<ChoreTask, unknown>({
          filename: url.href,
          minThreads: 1,
          maxThreads: 1,
          concurrentTasksPerWorker: 1,
          idleTimeout: Number.MAX_SAFE_INTEGER,
        })
      : null;
  }
  return piscina;
}

/**
 * Runs a chore on the chores thread (in-process from sources); the answer is validated, and
 * must be of the kind the task gives.
 */
async function chore<K extends ChoreResult["kind"]>(
  task: ChoreTask,
  kind: K,
): Promise<Extract<ChoreResult, { kind: K }>> {
  const workers = pool();
  const raw = workers ? await workers.run(task) : runChore(task);
  const result = ChoreResultSchema.parse(raw) as ChoreResult;
  if (result.kind !== kind) throw new Error("The chores worker answered the wrong task.");
  return result as Extract<ChoreResult, { kind: K }>;
}

type Args<K extends ChoreTask["kind"]> = Extract<ChoreTask, { kind: K; args: unknown }>["args"];

/** parseReadingsCsv (app/features/readings/readings-csv.server.ts) off the request thread. */
export async function parseReadingsCsvOffThread(...args: Args<"readingsCsv">) {
  return (await chore({ kind: "readingsCsv", args }, "readingsCsv")).parsed;
}

/** parseJournalCsv (app/features/journal/journal-csv.server.ts) off the request thread. */
export async function parseJournalCsvOffThread(...args: Args<"journalCsv">) {
  return (await chore({ kind: "journalCsv", args }, "journalCsv")).parsed;
}

/** An SVG as PNG bytes by resvg, off the request thread. */
export async function svgToPngOffThread(svg: string, fontFamily: string): Promise<Buffer> {
  const { png } = await chore({ kind: "png", svg, fontFamily }, "png");
  return Buffer.from(png.buffer, png.byteOffset, png.byteLength);
}

/** journalCsv (app/features/journal/journal-csv.server.ts) off the request thread. */
export async function journalCsvOffThread(...args: Args<"writeJournalCsv">): Promise<string> {
  return (await chore({ kind: "writeJournalCsv", args }, "csvText")).text;
}

/** readingsCsv (app/features/readings/readings-csv-export.server.ts) off the request thread. */
export async function readingsCsvOffThread(...args: Args<"writeReadingsCsv">): Promise<string> {
  return (await chore({ kind: "writeReadingsCsv", args }, "csvText")).text;
}

/** A journal replay's every sample as CSV (replay-chart.server.ts) off the request thread. */
export async function replayCsvOffThread(input: ReplayChartInput): Promise<string> {
  return (await chore({ kind: "writeReplayCsv", input }, "csvText")).text;
}

/** A journal replay's chart for the page (replay-chart.server.ts) off the request thread. */
export async function replayChartOffThread(input: ReplayChartInput): Promise<ReplayChartData> {
  return (await chore({ kind: "replayChart", input }, "replayChart")).chart;
}
