/**
 * The journal page's server side: the entries for the table, the "as it happened" chart of the
 * chosen scenario with the readings over it (replay-view.server.ts), and the page's three
 * actions (add, delete, upload).
 */
import { LRUCache } from "lru-cache";
import { data } from "react-router";
import type { Scenario } from "~models";
import { describeEntry, ENTRY_KINDS, type FieldUnits } from "~/features/journal/journal-entries";
import { MAX_JOURNAL_CSV_BYTES } from "~/features/journal/journal-csv.server";
import { parseJournalCsvOffThread } from "~/features/jobs/chores-pool.server";
import {
  hasCalendarFeed,
  makeCalendarFeed,
  revokeCalendarFeed,
  upcomingTasks,
} from "~/features/journal/calendar-feed.server";
import { dayText, forecastCautions, forecastSentence } from "~/features/journal/forecast-text.server";
import { forecastJournal, replayJournal, type Forecast } from "~/features/journal/journal-replay.server";
import { saveJournalFindings } from "~/features/journal/journal-findings.server";
import {
  addEntries,
  countJournal,
  firstEntryAt,
  deleteEntry,
  journalOf,
  newestJournalEntries,
  readEntry,
} from "~/features/journal/journal.server";
import { QuotaExceeded } from "~/quotas.server";
import { journalScenario } from "~/features/journal/journal-scenario.server";
import { replayView } from "~/features/journal/replay-view.server";
import { settingsHash } from "~/features/runs/simulation.server";
import { planStart } from "~/features/tanks/maintenance-plan.server";
import type { PlanStart } from "~/features/journal/plan-resume.server";
import { listScenarios, type TankRow } from "~/features/tanks/tanks.server";
import { readUpload, UploadError } from "~/http/uploads.server";
import { takeUploadTurn, UploadRefused } from "~/http/upload-turns.server";
import { runProblem } from "~/http/pages.server";
import { formatDate, formatDateTime, startOfDay } from "~/utils/dates";
import type { CsvProblem } from "~/utils/csv-read.server";
import type { DisplayUnits } from "~/utils/display-units";

/**
 * Entries shown on one page of the table, newest first. A journal holds up to 20,000 entries a
 * tank: all of them in one page took about 0.2 s to read and 11 MB of page data to render on the
 * request thread, so a few reloads stalled everyone (issue 10, freeze the server).
 */
const JOURNAL_PAGE_SIZE = 100;

/** The table's page from `?page=` (1 = the newest entries); anything unreadable is page 1. */
function journalPageNumber(value: string | null): number {
  const n = Number(value);
  return Number.isInteger(n) && n >= 1 && n <= 1_000_000 ? n : 1;
}

/**
 * What the page works out from the whole journal: the replay, the forecast and the next three
 * weeks' tasks. Kept by the tank's journal version (SQLite triggers bump it on every write of an
 * entry, migration 0014), the settings and the day, so a reload reads no entry: with 20,000
 * entries the reading alone took about 0.1 s of the request thread. Answers only; a refused run
 * is asked again next time.
 */
type JournalModel = {
  replay: Awaited<ReturnType<typeof replayJournal>>;
  forecast: Forecast | null;
  upcoming: ReturnType<typeof upcomingTasks>;
};
const keptModels = new LRUCache<string, JournalModel>({ max: 200, ttl: 10 * 60_000 });

/** `onPlan`: the replay is on the tank's plan, so its findings are kept for the tank list (journal-findings.server.ts). */
async function journalModel(tank: TankRow, settings: Scenario, start: PlanStart, now: number, onPlan: boolean) {
  const key = `${tank.id}:${tank.journalVersion}:${settingsHash(settings)}:${start.from}:${start.ms}:${startOfDay(now)}`;
  const kept = keptModels.get(key);
  if (kept) return { ...kept, problem: null };
  const entries = journalOf(tank);
  const upcoming = upcomingTasks(settings, entries, start, now, 21);
  const replay = await replayJournal(settings, entries, now, tank.ownerId);
  if (replay && onPlan) saveJournalFindings(tank, settings, replay, now);
  let forecast: Forecast | null = null;
  try {
    forecast = replay ? await forecastJournal(settings, entries, now, tank.ownerId, start) : null;
  } catch (error) {
    // The replay stands without its forecast.
    const problem = runProblem(error);
    if (!problem) throw error;
    return { replay, forecast, upcoming, problem };
  }
  keptModels.set(key, { replay, forecast, upcoming });
  return { replay, forecast, upcoming, problem: null };
}

export async function journalPageData(
  tank: TankRow,
  scenarioParam: string | null,
  units: DisplayUnits,
  now = Date.now(),
  pageParam: string | null = null,
) {
  // By default the scenario the tank's plan is over, as the tank page and the reminders use.
  const { scenarios, plan, chosen, settings } = journalScenario(tank, scenarioParam);
  let replay: Awaited<ReturnType<typeof replayView>> | null = null;
  let forecast: string | null = null;
  let cautionsAhead: string[] = [];
  let problem: string | null = null;
  let upcoming: { title: string; when: string; overdue: boolean }[] = [];
  // The tank's maintenance plan (if edited) replaces the scenario's timetable for the forecast and
  // the list; the tank's nitrate band is the forecast's target.
  // Where a task kind never logged counts from, the same for the forecast and the list.
  const start = chosen ? planStart(tank.id, chosen, firstEntryAt(tank.id)) : null;
  if (settings && start) {
    try {
      const model = await journalModel(tank, settings, start, now, chosen?.id === plan?.id);
      problem = model.problem;
      upcoming = model.upcoming.map((t) => ({ title: t.title, when: dayText(t.atMs), overdue: t.overdue }));
      const r = model.replay;
      if (r) {
        replay = await replayView(tank.id, r, settings, units, now, chosen!.id);
        forecast = forecastSentence(model.forecast, units);
        cautionsAhead = forecastCautions(model.forecast, units);
      }
    } catch (error) {
      problem = runProblem(error);
      if (!problem) throw error;
    }
  }
  const entryCount = countJournal(tank.id);
  const pages = Math.max(1, Math.ceil(entryCount / JOURNAL_PAGE_SIZE));
  const entryPage = Math.min(journalPageNumber(pageParam), pages);
  return {
    tank: { id: tank.id, name: tank.name },
    scenarios: scenarios.map((s) => ({ id: s.id, name: s.name })),
    scenarioId: chosen?.id ?? null,
    entryCount,
    entryPage,
    entryPages: pages,
    // Only the table's page is read: newest first.
    entries: newestJournalEntries(tank.id, (entryPage - 1) * JOURNAL_PAGE_SIZE, JOURNAL_PAGE_SIZE).map((e) => ({
      id: e.id,
      when: formatDateTime(e.doneAt),
      kind: ENTRY_KINDS[e.kind],
      what: describeEntry(e.kind, e.details, units),
      note: e.note,
    })),
    replay,
    forecast,
    cautionsAhead,
    problem,
    upcoming,
    calendarOn: hasCalendarFeed(tank.id),
    /** The keeper's today, the entry form's date until they change it. */
    today: formatDate(now),
    /** The entry form's amounts are typed in these (the CSV file keeps its columns' own units). */
    units: { nitrate: units.nitrate, ammonia: units.ammonia } satisfies FieldUnits,
  };
}

export type JournalAnswer = {
  intent: string;
  errors?: Record<string, string>;
  values?: Record<string, string>;
  message?: string;
  problems?: CsvProblem[];
  more?: number;
  stored?: number;
  calendarUrl?: string;
};

const refuse = (a: JournalAnswer, status = 400) => data(a, { status });

/** `now` is the keeper's wall clock (keeperNow): an entry dated their today is not in the future. */
export async function journalAction(request: Request, tank: TankRow, units: DisplayUnits, now = Date.now()) {
  const type = request.headers.get("content-type") ?? "";
  if (type.startsWith("multipart/form-data")) {
    try {
      await takeUploadTurn(tank.ownerId);
    } catch (error) {
      if (error instanceof UploadRefused) return refuse({ intent: "upload", message: error.message }, error.status);
      throw error;
    }
    return storeUpload(request, tank, now);
  }
  const form = await request.formData();
  const intent = String(form.get("intent") ?? "");
  if (intent === "delete") {
    const id = Number(form.get("entryId"));
    if (!Number.isInteger(id) || !deleteEntry(tank.id, id))
      return refuse({ intent, message: "That entry is not in this journal." }, 404);
    return { intent, message: "Entry deleted." } satisfies JournalAnswer;
  }
  if (intent === "calendar-on") {
    const scenario = listScenarios(tank.id).find((x) => String(x.id) === String(form.get("scenarioId") ?? ""));
    if (!scenario) return refuse({ intent, message: "Choose the scenario that describes this tank." });
    const token = makeCalendarFeed(tank.id, scenario.id);
    const origin = new URL(request.url).origin;
    return {
      intent,
      message: "Calendar address made. Add it to your phone's calendar as a subscription.",
      calendarUrl: `${origin}/calendar/${token}.ics`,
    } satisfies JournalAnswer;
  }
  if (intent === "calendar-off") {
    revokeCalendarFeed(tank.id);
    return { intent, message: "The calendar address is turned off." } satisfies JournalAnswer;
  }
  if (intent !== "add") return refuse({ intent, message: "Unknown action." });
  const values = Object.fromEntries([...form.entries()].filter(([, v]) => typeof v === "string")) as Record<
    string,
    string
  >;
  const read = readEntry(values, now, units);
  if (!read.ok) return refuse({ intent, errors: read.errors, values });
  try {
    addEntries(tank.id, [read.entry]);
  } catch (error) {
    if (error instanceof QuotaExceeded) return refuse({ intent, message: error.message, values }, 413);
    throw error;
  }
  return { intent, message: `${ENTRY_KINDS[read.entry.kind]} added to the journal.` } satisfies JournalAnswer;
}

/** A journal CSV upload: all its rows or none. */
async function storeUpload(request: Request, tank: TankRow, now: number) {
  let upload;
  try {
    upload = await readUpload(request, MAX_JOURNAL_CSV_BYTES);
  } catch (error) {
    if (error instanceof UploadError) return refuse({ intent: "upload", message: error.message });
    throw error;
  }
  if (!upload.file || upload.file.text.trim() === "")
    return refuse({ intent: "upload", message: "Choose a CSV file to upload." });
  // Parsed on the chores worker thread (app/features/jobs/chores-pool.server.ts): a full file is about 100 ms.
  const parsed = await parseJournalCsvOffThread(upload.file.text, now);
  if (!parsed.ok)
    return refuse({ intent: "upload", message: parsed.message, problems: parsed.problems, more: parsed.more });
  try {
    addEntries(tank.id, parsed.entries);
  } catch (error) {
    if (error instanceof QuotaExceeded) return refuse({ intent: "upload", message: error.message }, 413);
    throw error;
  }
  return { intent: "upload", stored: parsed.entries.length } satisfies JournalAnswer;
}
