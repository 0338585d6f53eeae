/**
 * Who may run the model now, and where the run goes (docs/decisions/0006-single-runs.md).
 *
 * - Saves, imports, copies and re-runs of a stale stored run (even one a page view asks for), and
 *   previews, have rate limits per person (app/rate-limits.server.ts); the journal's and the
 *   lesson presentation's runs, which store nothing, have none ("view").
 * - One person has at most RUNS_IN_FLIGHT_PER_PERSON runs going at once; more answer 429 (a page
 *   view first waits a few seconds for one of them to end).
 * - A run that looks short (isQuickRun) gets INLINE_BUDGET_MS on the request thread; if it is
 *   not done by then it stops and goes to the worker pool. Everything else goes to the pool at
 *   once. So the request thread never spends more than a few tens of milliseconds on one run,
 *   whatever the settings, while the typical 5–15 ms run keeps its fast path.
 */
import {
  isModelError,
  ModelError,
  simulate,
  type Scenario,
  type SimulateOptions,
  type SimulationResult,
} from "~models";
import { getEnginePool } from "~/features/jobs/engine-pool.server";
import { giveBack, LIMITS, resetLimit, take, waitText } from "~/rate-limits.server";
import { toStorable, type StorableRun } from "~/features/runs/run-packing.server";

/** Bounds for runs started by a request: a bad parameter set fails fast instead of hanging. */
export const REQUEST_RUN_LIMITS = { maxWallMs: 3000, maxSteps: 300_000 } satisfies SimulateOptions;
/** Request-thread time a run that looks short may take before it moves to a worker. */
const INLINE_BUDGET_MS = 25;
export const RUNS_IN_FLIGHT_PER_PERSON = LIMITS.runsInFlightPerPerson.points;

/** Who asks for a run, and why: "save" and "preview" have rate limits, "view" does not. */
export type RunRequest = { userId: number; purpose: "save" | "preview" | "view" };

/** A run refused before it started: 429 and what to do. */
export class RunRefused extends Error {
  readonly status = 429;
  override name = "RunRefused";
}

/**
 * Whether a run is short enough to try on the request thread: up to about a year at daily
 * points without modelled meals usually takes 5–15 ms. The budget still stops it if not.
 */
function isQuickRun(scenario: Scenario): boolean {
  const samples = scenario.run.lengthDays / scenario.run.outputIntervalDays;
  return scenario.run.lengthDays <= 400 && samples <= 1000 && !scenario.fish.pulsedFeeding;
}

/**
 * One of a person's runs in flight, for runs that do not go through runForRequest (the
 * journal's replay and forecast): returns the function that gives it back, or throws RunRefused.
 */
export function takeRunSlot(userId: number): Promise<() => void> {
  return admit({ userId, purpose: "view" });
}

async function admit(request: RunRequest): Promise<() => void> {
  if (request.purpose !== "view") {
    const limit = request.purpose === "save" ? "savesPerPerson" : "previewsPerPerson";
    const wait = await take(limit, `user:${request.userId}`);
    if (wait > 0) {
      const what = request.purpose === "save" ? "saves and runs" : "previews";
      throw new RunRefused(
        `Too many ${what}: at most ${LIMITS[limit].points} a minute. Try again in ${waitText(wait)}.`,
      );
    }
  }
  // Counted in the database, so two app processes cannot each run two of one person's runs.
  const key = `user:${request.userId}`;
  if (!(await takeInFlight(key, request.purpose === "view" ? VIEW_SLOT_WAIT_MS : 0))) {
    throw new RunRefused(
      `You already have ${RUNS_IN_FLIGHT_PER_PERSON} model runs going. Wait for them to finish, then try again.`,
    );
  }
  return () => void giveBack("runsInFlightPerPerson", key);
}

/**
 * A page view waits this long for one of the person's run slots before it says "runs going":
 * the runs of a page they just left (a reload, a link followed mid-load, a what-if slider let
 * go) still finish on the server for a second or two, and the next page should wait for them
 * rather than show a refusal. Saves and previews answer at once, as their forms say what to do.
 */
const VIEW_SLOT_WAIT_MS = 5_000;
const SLOT_POLL_MS = 100;

/** Takes a run slot for `key`, trying again for up to `waitMs`; false when none came free. */
async function takeInFlight(key: string, waitMs: number): Promise<boolean> {
  const deadline = Date.now() + waitMs;
  for (;;) {
    if ((await take("runsInFlightPerPerson", key)) === 0) return true;
    if (Date.now() + SLOT_POLL_MS > deadline) return false;
    await new Promise((resolve) => setTimeout(resolve, SLOT_POLL_MS));
  }
}

type Placed = { kind: "result"; result: SimulationResult } | { kind: "stored"; run: StorableRun };

async function place(scenario: Scenario, request: RunRequest, forStorage: boolean): Promise<Placed> {
  const pool = getEnginePool();
  if (pool.mode === "threads" && isQuickRun(scenario)) {
    try {
      return { kind: "result", result: simulate(scenario, { ...REQUEST_RUN_LIMITS, maxWallMs: INLINE_BUDGET_MS }) };
    } catch (error) {
      // Over the budget: it goes to a worker with the full bounds. Any other error is the answer.
      if (!(isModelError(error) && error.code === "WALL_TIME")) throw error;
    }
  }
  // Without worker threads (tests, `npm run dev`) the pool is an in-process stand-in.
  const task = { kind: forStorage ? "store" : "simulate", scenario, limits: REQUEST_RUN_LIMITS } as const;
  const answer = await pool.run(task, { lane: "interactive", owner: `user:${request.userId}` });
  if (answer.kind !== "simulate" && answer.kind !== "store")
    throw new Error(`The engine pool answered a ${answer.kind} task to a run`);
  if (answer.error)
    throw new ModelError(answer.error.code, answer.error.message, {
      day: answer.error.day,
      detail: answer.error.detail,
    });
  return answer.kind === "store" ? { kind: "stored", run: answer.run! } : { kind: "result", result: answer.result! };
}

/** Runs the model for a request (see the top of this file). Throws ModelError or RunRefused. */
export async function runForRequest(scenario: Scenario, request: RunRequest): Promise<SimulationResult> {
  const release = await admit(request);
  try {
    const placed = await place(scenario, request, false);
    if (placed.kind !== "result") throw new Error("A run for a request came back packed");
    return placed.result;
  } finally {
    release();
  }
}

/** The same, for a run about to be stored: long series come back packed. */
export async function runForStorage(scenario: Scenario, request: RunRequest): Promise<StorableRun> {
  const release = await admit(request);
  try {
    const placed = await place(scenario, request, true);
    return placed.kind === "stored" ? placed.run : await toStorable(placed.result);
  } finally {
    release();
  }
}

/** Forgets the runs in flight (tests). */
export function resetRunGate(): void {
  resetLimit("runsInFlightPerPerson");
}
