/**
 * Fernwater engine: public API. Plain TypeScript, no framework, no I/O; safe for the server,
 * a worker, tests and the command line. Unit conversions live in "models/units" (separate so
 * the browser bundle does not pull in mathjs).
 */
export { ModelError, isModelError } from "./core/errors";
export type { ModelErrorCode } from "./core/errors";
export type { EventRecord } from "./core/events";

export {
  ScenarioSchema,
  SCHEMA_VERSION,
  migrateScenario,
  parseScenario,
  describeScenarioIssues,
  listScenarioFields,
  applyChanges,
  PLANT_MASS,
  scenarioSetting,
  scenarioSettings,
  setScenarioValue,
  settingField,
} from "./nitrogen/scenario";
export type { Scenario, ScenarioInput, Quantity, ScenarioField, Setting, SettingChange } from "./nitrogen/scenario";

export { simulate, ENGINE_VERSION } from "./nitrogen/simulate";
export type { SimulateOptions, SimulationResult, SimulationStats, Series, KeyFigures } from "./nitrogen/simulate";

export type { NitrogenBudget } from "./nitrogen/budget";
export type { ModelWarning } from "./nitrogen/result";
export { OXYGEN } from "./nitrogen/parameters";

export type { TankEventInput } from "./nitrogen/tank-events";
export { plannedEvents, scenarioBacteriaShare } from "./nitrogen/planned-events";

export { ammoniaCriteria } from "./nitrogen/criteria";

export { PRESETS, GROWTH_FORM_DEFAULTS, getPreset, plantGroupFromForm } from "./nitrogen/presets";

export { GROWTH_FORMS, listParameters } from "./nitrogen/parameters";

export { OUTCOMES, sweep } from "./nitrogen/sweep";
export type { SweepPoint } from "./nitrogen/sweep";

export {
  ammoniumPKa,
  freeAmmoniaFraction,
  oxygenSaturation,
  tanFromFeed,
  N_FRACTION,
  ALK_MG_CACO3_PER_MG_N_NITRIFIED,
  ALK_MG_CACO3_PER_MG_N_DENITRIFIED,
  ANAMMOX,
  EATEN_N_SPLIT,
} from "./nitrogen/chemistry";
