/**
 * The one error type the engine throws. `code` says what went wrong; `message` says, in a
 * keeper's words, what to check.
 */
export type ModelErrorCode =
  /** The solver needed more steps than allowed (a rate far outside the usual range). */
  | "MAX_STEPS"
  /** The run took longer than the wall-time bound. */
  | "WALL_TIME"
  /** A value became NaN, infinite or clearly negative. */
  | "NON_FINITE"
  /** The scenario or options are not valid. */
  | "INVALID";

export class ModelError extends Error {
  readonly code: ModelErrorCode;
  /** Simulated day at which the problem appeared, if known. */
  readonly day: number | null;
  /** Field paths or other detail useful to a developer (not shown to keepers by default). */
  readonly detail: readonly string[];

  constructor(
    code: ModelErrorCode,
    message: string,
    options: { day?: number | null; detail?: readonly string[] } = {},
  ) {
    super(message);
    this.name = "ModelError";
    this.code = code;
    this.day = options.day ?? null;
    this.detail = options.detail ?? [];
  }
}

export function isModelError(e: unknown): e is ModelError {
  return e instanceof ModelError;
}
