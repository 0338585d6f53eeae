/**
 * "As it happened": the tank's model (a scenario chosen as its description) replayed from the
 * journal's first day to today with the journal's events instead of the scenario's periodic
 * schedule (the engine's explicit event schedule). Entries the model has no process for (fish,
 * notes) are shown on the page but change nothing; a plant group the scenario does not have is
 * reported, not guessed.
 */
import {
  isModelError,
  scenarioBacteriaShare,
  type ModelWarning,
  type Scenario,
  type SimulationResult,
  type TankEventInput,
} from "~models";
import type { JournalEntry } from "~/features/journal/journal.server";
import { doneByEndOf, plannedAfterJournal, type PlanStart } from "~/features/journal/plan-resume.server";
import { simulateOnPool } from "~/features/journal/journal-runs.server";
import type { SearchLever } from "~/features/sweeps/search-levers.server";
import { findLeastChange, type Evaluation } from "~/features/sweeps/target-search.server";
import type { ToxicPeaks } from "~/features/runs/run-warnings";
import { DAY_MS, formatDate, startOfDay } from "~/utils/dates";

const MAX_DAYS = 730;

/** The journal's entries as the engine's events (days from `startMs`), and what could not be used. */
function journalEvents(
  s: Scenario,
  entries: readonly JournalEntry[],
  startMs: number,
): { events: TankEventInput[]; unused: string[] } {
  const events: TankEventInput[] = [];
  const unused: string[] = [];
  const groupOf = (name: string | undefined) => {
    const n = (name ?? "").trim().toLowerCase();
    return s.plants.find((g) => g.id.toLowerCase() === n || g.name.toLowerCase() === n);
  };
  for (const e of entries) {
    const day = (e.doneAt - startMs) / DAY_MS;
    const d = e.details;
    switch (e.kind) {
      case "water_change": {
        const share = d.share ?? Math.min(0.95, (d.litres ?? 0) / s.water.volumeL);
        events.push({
          kind: "waterChange",
          day,
          fraction: share,
          tapNitrate: d.tapNitrateMgN ?? null,
          roShare: d.roShare ?? null,
        });
        break;
      }
      case "filter_cleaned": {
        // model choice, no source: a light rinse takes half the sludge and half the bacteria of a thorough one
        const light = d.thoroughness === "light" ? 0.5 : 1;
        const tap = d.thoroughness === "tap_water";
        events.push({
          kind: "filterCleaning",
          day,
          sludgeFraction: light * s.filter.organicsRemovedFraction,
          bacteriaShare: light * scenarioBacteriaShare(s, tap),
          inTapWater: tap,
        });
        break;
      }
      case "gravel_cleaned":
        events.push({ kind: "gravelCleaning", day, fraction: d.gravelShare ?? 0 });
        break;
      case "plants_added":
      case "plants_removed":
      case "plants_trimmed": {
        const g = groupOf(d.plantGroup);
        if (!g) {
          unused.push(
            `The scenario has no plant group “${d.plantGroup}”: the ${e.kind.replace("_", " ")} entry is not modelled.`,
          );
          break;
        }
        const sign = e.kind === "plants_added" ? 1 : -1;
        events.push({ kind: "plants", day, groupId: g.id, changeG: sign * (d.plantDryG ?? 0) });
        break;
      }
      case "feeding_changed":
        events.push({ kind: "feeding", day, feedGPerDay: d.feedGPerDay ?? 0 });
        break;
      case "ammonia_dosed":
        events.push({ kind: "dose", day, mgNPerL: d.ammoniaMgN ?? 0 });
        break;
      default:
        break;
    }
  }
  return { events, unused };
}

export type Replay = { startMs: number; lengthDays: number; result: SimulationResult; unused: string[] };

/**
 * What the replay runs: the scenario lengthened to the journal's span (from its first day, at
 * most two years, to `now`) and the journal's events; null without entries. Calibration fits
 * to this same run.
 */
export function replayInputs(s: Scenario, entries: readonly JournalEntry[], now = Date.now()) {
  if (entries.length === 0) return null;
  const startMs = startOfDay(Math.max(entries[0].doneAt, now - MAX_DAYS * DAY_MS));
  const lengthDays = Math.min(MAX_DAYS, Math.max(1, Math.ceil((now - startMs) / DAY_MS)));
  const { events, unused } = journalEvents(
    s,
    entries.filter((e) => e.doneAt >= startMs),
    startMs,
  );
  // The replay covers at most the last two years; older entries are said, not dropped silently.
  const older = entries.filter((e) => e.doneAt < startMs).length;
  if (older > 0)
    unused.unshift(
      `${older === 1 ? "One entry" : `${older.toLocaleString("en")} entries`} from before ${formatDate(startMs)} ${older === 1 ? "is" : "are"} left out: the replay covers the last two years.`,
    );
  const scenario: Scenario = {
    ...s,
    run: { ...s.run, lengthDays, outputIntervalDays: Math.min(s.run.outputIntervalDays, 0.25) },
  };
  return { startMs, lengthDays, scenario, events, unused };
}

/**
 * The replay from the journal's first day to `now` (at least one day, at most two years), or
 * null without entries; run on the engine pool for the tank's owner (the request bounds).
 */
export async function replayJournal(
  s: Scenario,
  entries: readonly JournalEntry[],
  now = Date.now(),
  ownerId: number | null = null,
): Promise<Replay | null> {
  const inputs = replayInputs(s, entries, now);
  if (!inputs) return null;
  const { startMs, lengthDays, scenario, events, unused } = inputs;
  const result = await simulateOnPool(scenario, events, ownerId);
  return { startMs, lengthDays, result, unused };
}

/**
 * What the forecast run crosses from today on (free ammonia, nitrite, the ammonia criteria, KH,
 * oxygen): the toxic peaks in the days ahead and the engine's warnings dated today or later.
 * Days count from `startMs`.
 */
type ForecastCautions = {
  startMs: number;
  peaks: ToxicPeaks;
  warnings: ModelWarning[];
};

export type Forecast = (
  | { kind: "below"; horizonDays: number }
  | {
      kind: "crosses";
      crossMs: number;
      /** Nitrate is over the target already at the start of the forecast (today), not crossing later. */
      alreadyAbove: boolean;
      /** When the extra change is tried: two days before the crossing, or today when that is sooner. */
      changeByMs: number;
      high: number;
      /** The highest nitrate (mg N/L) before the next planned change, with no extra change. */
      peak: number;
      fix: { share: number; byMs: number; untilMs: number } | null;
    }
) & {
  ahead: ForecastCautions;
  /** Overdue tasks the forecast assumes are done today (its sentence says so), with the day each fell due. */
  overdue: OverdueTask[];
};

export type OverdueTask = { kind: TankEventInput["kind"]; group: string | null; sinceMs: number };

/** The forecast run's cautions from `today` on (its series are six-hourly; the warnings' days are the engine's). */
function cautionsAhead(r: SimulationResult, today: number, startMs: number): ForecastCautions {
  const peak = (values: readonly number[]) => {
    let best = { value: 0, day: today };
    r.series.t.forEach((t, k) => {
      if (t >= today && values[k] > best.value) best = { value: values[k], day: t };
    });
    return best;
  };
  return {
    startMs,
    peaks: { peakFreeNh3: peak(r.series.nh3), peakNitrite: peak(r.series.no2) },
    warnings: r.warnings.filter((w) => w.day !== null && w.day >= today),
  };
}

const FORECAST_DAYS = 60;

/** The extra water change's share as the target finder's lever: whole percent, 1 to 90. */
const EXTRA_CHANGE_LEVER: SearchLever = {
  id: "waterChangeFraction",
  lo: 1,
  hi: 90,
  moreChange: "up",
  integer: true,
  tolerance: 1,
  scale: "linear",
  current: 0,
  changes: () => [],
  show: (v) => `${v} %`,
  advice: (v) => `a ${v} % change`,
};

/**
 * From today forward under the planned schedule (the scenario's timetable, each kind resumed at
 * its own last logged entry, as the calendar shows it: plan-resume.server.ts): when nitrate crosses the upper target, and — found by the target
 * finder's search (least change that meets the goal) — the smallest extra water change two days
 * before that keeps it under until the next planned change (or for a week). A kind never logged
 * counts from `start` as the list counts it (by default the journal's first entry: no edited plan).
 */
export async function forecastJournal(
  s: Scenario,
  entries: readonly JournalEntry[],
  now = Date.now(),
  ownerId: number | null = null,
  start: PlanStart | null = null,
): Promise<Forecast | null> {
  if (entries.length === 0) return null;
  const startMs = startOfDay(Math.max(entries[0].doneAt, now - MAX_DAYS * DAY_MS));
  const today = Math.max(1, Math.ceil((now - startMs) / DAY_MS));
  const total = Math.min(MAX_DAYS, today + FORECAST_DAYS);
  const { events } = journalEvents(
    s,
    // Entries dated today count as done, whatever their hour, as the planner counts them.
    entries.filter((e) => e.doneAt >= startMs && e.doneAt < doneByEndOf(now)),
    startMs,
  );
  // The plan as the calendar and the reminders show it: each kind resumed at its own last entry.
  // From the start of today, as the calendar counts: a task due today is in the forecast, and a
  // kind never logged counts from the plan's start, as the list counts it.
  // An overdue task is planned today, once (plan-resume.server.ts): assumed done today, never skipped.
  const todayStart = (startOfDay(now) - startMs) / DAY_MS;
  const resumed = plannedAfterJournal(
    s,
    entries,
    startMs,
    now,
    total,
    start ?? { ms: entries[0].doneAt, from: "journal" },
  ).filter((e) => e.day >= todayStart);
  const overdue: OverdueTask[] = resumed.flatMap((e) =>
    e.overdueSince === undefined
      ? []
      : [
          {
            kind: e.kind,
            group: e.kind === "trim" ? (s.plants.find((g) => g.id === e.groupId)?.name ?? e.groupId) : null,
            sinceMs: startMs + Math.floor(e.overdueSince) * DAY_MS,
          },
        ],
  );
  const planned: TankEventInput[] = resumed.map(({ overdueSince: _since, ...e }) => e);
  const scenario: Scenario = { ...s, run: { ...s.run, lengthDays: total, outputIntervalDays: 0.25 } };
  // Each run of the forecast and its search on the engine pool, as the page's other runs.
  const run = (extra: TankEventInput[]) => simulateOnPool(scenario, [...events, ...planned, ...extra], ownerId);
  const high = s.targets.nitrateHigh;
  const inWindow = (r: SimulationResult, from: number, to: number) =>
    r.series.no3.filter((_v, k) => r.series.t[k] >= from && r.series.t[k] <= to);
  const base = await run([]);
  const k = base.series.t.findIndex((t, i) => t >= today && base.series.no3[i] > high);
  const ahead = cautionsAhead(base, today, startMs);
  if (k < 0) return { kind: "below", horizonDays: total - today, ahead, overdue };
  const crossDay = base.series.t[k];
  const alreadyAbove = k === base.series.t.findIndex((t) => t >= today);
  const fixDay = Math.max(today, Math.floor(crossDay) - 2);
  // Until the next planned change, or a week when none is planned (model choice, no source).
  const nextPlanned =
    planned.find((e) => e.kind === "waterChange" && e.day > fixDay)?.day ?? Math.min(total, fixDay + 7);
  const peak = Math.max(...inWindow(base, fixDay, nextPlanned));
  const outcome = await findLeastChange(EXTRA_CHANGE_LEVER, async (percent): Promise<Evaluation> => {
    try {
      const r = await run([{ kind: "waterChange", day: fixDay, fraction: percent / 100 }]);
      const most = Math.max(...inWindow(r, fixDay, nextPlanned));
      return { value: percent, nitrate: most, nh3: null, meets: most <= high, error: null };
    } catch (error) {
      if (!isModelError(error)) throw error;
      return { value: percent, nitrate: null, nh3: null, meets: false, error: error.message };
    }
  });
  const fix =
    outcome.status === "met"
      ? { share: outcome.value / 100, byMs: startMs + fixDay * DAY_MS, untilMs: startMs + nextPlanned * DAY_MS }
      : null;
  const changeByMs = startMs + fixDay * DAY_MS;
  return {
    kind: "crosses",
    crossMs: startMs + crossDay * DAY_MS,
    alreadyAbove,
    changeByMs,
    high,
    peak,
    fix,
    ahead,
    overdue,
  };
}
