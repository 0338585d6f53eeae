/**
 * An initial-value problem as the engine sees it: named state components, a right-hand side
 * and per-component tolerances. Nothing here knows about tanks; the nitrogen model builds one.
 */
export interface OdeProblem {
  /** Number of state components. */
  readonly dim: number;
  /** A name per component (for messages and debugging). */
  readonly names: readonly string[];
  /**
   * dy/dt at time t (days). Must return a fresh array of length `dim` and must not modify `y`.
   * Units: each component's unit per day.
   */
  rhs(t: number, y: readonly number[]): number[];
  /** Absolute tolerance per component, in that component's unit. */
  readonly absoluteTolerance: readonly number[];
  /** Relative tolerance (scalar or per component). */
  readonly relativeTolerance: number | readonly number[];
}

/** An upward crossing to watch for: the event fires when y[index] rises to `threshold`. */
export interface Watch {
  readonly index: number;
  readonly threshold: number;
}
