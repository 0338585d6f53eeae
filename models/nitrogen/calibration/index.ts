/**
 * Calibration: fitting the model's multipliers to a keeper's readings, and saying what the
 * readings can and cannot tell (docs/engine.md, "Calibration"). Imports mathjs, so — like
 * models/units.ts — it is not re-exported from models/index.ts (the browser bundle stays small).
 */
export { MULTIPLIER_KEYS, MULTIPLIER_NAMES, DETERMINED_FACTOR } from "./advice";
export type { MultiplierKey, Verdict } from "./advice";
export { assessReadings, DESIGN_NOISE } from "./assess";
export type { Assessment } from "./assess";
export { calibrateMultipliers, kitsFor } from "./fit";
export type { CalibrateOptions, CalibrationResult, FittedMultiplier, ObserveRequest, Predict } from "./fit";
export {
  DEFAULT_CARDS,
  describeKit,
  inferKit,
  KIT_UNITS,
  KitSchema,
  readingInterval,
  SPECIES,
  STEP_CHOICES,
  kitUnit,
} from "./kits";
export type { Kit, Kits, KitUnit, ReadingInterval, Species } from "./kits";
export { levenbergMarquardt } from "./least-squares";
export type { LeastSquaresFit, LeastSquaresOptions } from "./least-squares";
export { negLogLikelihood, noiseLevel, observationsOf, pseudoResiduals, residualScales, TAU_MIN } from "./likelihood";
export type { CalibrationReading, Observation } from "./likelihood";
export { MULTIPLIER_BOUNDS, withMultipliers } from "./multipliers";
export { observe } from "./observe";
export type { ModelSamples, Observed } from "./observe";
