import { ModelError } from "./errors";
/**
 * Discrete events: jumps applied to the state between integration segments
 * (water changes, filter cleanings, trims, doses, meals). The simulate loop splits time at
 * every scheduled event and keeps the samples just before and just after it.
 */

/** What happened, for the result's event list. `day` in days from the start. */
export interface EventRecord {
  readonly day: number;
  readonly kind: EventKind;
  /** One short sentence for people, e.g. "25 % of the water changed; 310 mg N out, 28 mg N in". */
  readonly detail: string;
}

type EventKind =
  | "waterChange"
  | "filterCleaning"
  | "gravelCleaning"
  | "trim"
  | "plantsAdded"
  | "dose"
  | "dosingStopped"
  | "feeding"
  | "feedingChanged";

/**
 * What an event does: the state just after it (a new array; the state before is never changed)
 * and the records to list (none if nothing happened, e.g. a trim with nothing to trim).
 */
export interface EventOutcome {
  readonly y: readonly number[];
  readonly records: readonly EventRecord[];
}

/**
 * A scheduled jump: `apply` maps the state at time `t` to the state just after the event.
 * `order` breaks ties between events at the same time (lower first).
 */
export interface ScheduledEvent {
  readonly t: number;
  readonly order: number;
  apply(y: readonly number[], t: number): EventOutcome;
}

/** Times are treated as equal when closer than this (days, ~0.1 ms). */
export const TIME_EPS = 1e-9;

/** Most events one periodic schedule may add (meals 12 a day for two years are 8 760). */
const MAX_EVENTS_PER_SCHEDULE = 20_000;

/**
 * Times first, first + interval, … strictly before `end` (days). Computed by multiplication so
 * long runs do not drift. An interval ≤ 0 gives no times.
 */
export function periodicTimes(interval: number, end: number, first = interval): number[] {
  const out: number[] = [];
  if (!(interval > 0)) return out;
  // A tiny interval would schedule millions of events and exhaust memory before the solver's
  // own bounds could stop it: refuse it here with the typed error.
  if ((end - first) / interval > MAX_EVENTS_PER_SCHEDULE) {
    throw new ModelError(
      "INVALID",
      `Something is scheduled every ${interval} days, which makes more than ${MAX_EVENTS_PER_SCHEDULE} events in the run. Use a longer interval.`,
    );
  }
  for (let k = 0; ; k++) {
    const t = first + k * interval;
    if (t >= end - TIME_EPS) break;
    out.push(t);
  }
  return out;
}

/** Group events at (nearly) the same time, sorted by time then order. */
export function batchEvents(events: readonly ScheduledEvent[]): { t: number; events: ScheduledEvent[] }[] {
  const sorted = [...events].sort((a, b) => a.t - b.t || a.order - b.order);
  const out: { t: number; events: ScheduledEvent[] }[] = [];
  for (const e of sorted) {
    const last = out[out.length - 1];
    if (last && e.t - last.t < TIME_EPS) last.events.push(e);
    else out.push({ t: e.t, events: [e] });
  }
  return out;
}
