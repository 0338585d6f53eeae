/**
 * Calibration: fitting the model's multipliers to a keeper's readings, and saying what the
 * readings can and cannot tell (docs/engine.md, "Calibration"). Imports mathjs, so — like
 * models/units.ts — it is not re-exported from models/index.ts (the browser bundle stays small).
 */
export { MULTIPLIER_KEYS } from "./advice";
export type { MultiplierKey, Verdict } from "./advice";
export { assessReadings } from "./assess";
export { runsZ } from "./fit-quality";
export { calibrateMultipliers, kitsFor } from "./fit";
export type { CalibrationResult, ObserveRequest, Predict } from "./fit";
export {
  DEFAULT_CARDS,
  describeKit,
  kitStepIn,
  inferKit,
  KIT_UNITS,
  KitSchema,
  readingInterval,
  SPECIES,
  kitUnit,
} from "./kits";
export type { Kit, Kits, Species } from "./kits";
export { levenbergMarquardt } from "./least-squares";
export { negLogLikelihood, observationsOf, pseudoResiduals } from "./likelihood";
export type { CalibrationReading } from "./likelihood";
export { MULTIPLIER_BOUNDS, withMultipliers } from "./multipliers";
export { observe } from "./observe";
export type { Observed } from "./observe";
