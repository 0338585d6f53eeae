/**
 * What a calibration runs against — the fit and the check before it alike: the scenario's
 * periodic schedule from its start date, or the tank's journal replayed "as it happened" (its
 * events in place of the schedule, from the journal's first day). Both must use the same
 * basis, or the check would say what readings tell about a tank the fit never sees.
 */
import type { Scenario, TankEventInput } from "~models";
import { replayInputs } from "~/features/journal/journal-replay.server";
import { journalOf } from "~/features/journal/journal.server";
import { withTankTargets } from "~/features/runs/simulation.server";
import type { Observed, ObserveRequest } from "~models/nitrogen/calibrate";
import type { EngineTask, EngineTaskResult } from "~/features/jobs/engine-tasks.server";
import { JOB_RUN_LIMITS } from "~/features/jobs/job-limits.server";

export type FitSchedule = { kind: "periodic" } | { kind: "journal"; events: TankEventInput[] };

/** The scenario to run (the replay's, lengthened to the journal, on the journal), its day 0, and the schedule. */
export type FitBasis = { scenario: Scenario; startMs: number; schedule: FitSchedule };

const periodicBasis = (scenario: Scenario, startMs: number): FitBasis => ({
  scenario,
  startMs,
  schedule: { kind: "periodic" },
});

/** The journal's replay (journal-replay.server.ts replayInputs) as a basis. */
const journalBasis = (replay: { scenario: Scenario; startMs: number; events: TankEventInput[] }): FitBasis => ({
  scenario: replay.scenario,
  startMs: replay.startMs,
  schedule: { kind: "journal", events: replay.events },
});

export const SCHEDULE_TEXT = {
  periodic: "the scenario's periodic schedule",
  journal: "the tank's journal, as it happened",
} as const;

/** One model run read at the readings' days, on the basis's schedule. */
export const observeTask = (days: number[], req: ObserveRequest, schedule: FitSchedule): EngineTask => ({
  kind: "observe",
  scenario: req.scenario,
  days,
  pinnedTrimDays: req.pinnedTrimDays,
  limits: JOB_RUN_LIMITS,
  events: schedule.kind === "journal" ? schedule.events : undefined,
});

export const observedOf = (r: EngineTaskResult): Observed | null => (r.kind === "observe" ? r.observed : null);

/**
 * A scenario's bases, for the calibration page and the API alike: the journal's replay (null
 * when the tank's journal is empty), and the basis for a choice — the journal when chosen, the
 * default when there is one, else the periodic schedule from `startMs`. The replay runs to
 * `now` (a restarted job passes the day it was asked for).
 */
export function scenarioBases(
  tank: { id: number; journalVersion: number; nitrateTargetLow: number; nitrateTargetHigh: number },
  settings: Scenario,
  startMs: number,
  now = Date.now(),
) {
  const withTargets = withTankTargets(settings, tank);
  const replay = replayInputs(withTargets, journalOf(tank), now);
  const basisFor = (choice: string | null | undefined): FitBasis =>
    replay && (choice ?? "journal") === "journal" ? journalBasis(replay) : periodicBasis(withTargets, startMs);
  return { replay, basisFor };
}
