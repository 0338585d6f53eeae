/**
 * Fernwater engine: public API. Plain TypeScript, no framework, no I/O; safe for the server,
 * a worker, tests and the command line. Unit conversions live in "models/units" (separate so
 * the browser bundle does not pull in mathjs).
 */
export { ModelError, isModelError } from "./core/errors";
export type { ModelErrorCode } from "./core/errors";
export type { EventKind, EventRecord } from "./core/events";

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
export type {
  Scenario,
  ScenarioInput,
  PlantGroup,
  Quantity,
  FieldMeta,
  ScenarioField,
  SurfaceAgitation,
  Setting,
  SettingChange,
  SettingPath,
} from "./nitrogen/scenario";

export { simulate, ENGINE_VERSION } from "./nitrogen/simulate";
export type { SimulateOptions, SimulationResult, SimulationStats, Series, KeyFigures, Peak } from "./nitrogen/simulate";
export type { RawSeries } from "./nitrogen/recorder";
export type { NitrogenBudget } from "./nitrogen/budget";
export type { Stocks } from "./nitrogen/stocks";
export type { ModelWarning, WarningCode } from "./nitrogen/result";
export { ammoniaCriteria } from "./nitrogen/criteria";
export type { AmmoniaCriteria } from "./nitrogen/criteria";
export type { ZoneCapacity } from "./nitrogen/low-oxygen-zones";

export { PRESETS, GROWTH_FORM_DEFAULTS, getPreset, plantGroupFromForm } from "./nitrogen/presets";
export type { Preset } from "./nitrogen/presets";
export { GROWTH_FORMS, OXYGEN, listParameters } from "./nitrogen/parameters";
export type { GrowthForm } from "./nitrogen/parameters";

export { OUTCOMES, sweep } from "./nitrogen/sweep";
export type { SweepOutcome, SweepPoint } from "./nitrogen/sweep";

export {
  ammoniumPKa,
  freeAmmoniaFraction,
  oxygenSaturation,
  tanFromFeed,
  phFromKh,
  N_FRACTION,
  ALK_MG_CACO3_PER_MG_N_NITRIFIED,
  ALK_MG_CACO3_PER_MG_N_DENITRIFIED,
  ANAMMOX,
  EATEN_N_SPLIT,
} from "./nitrogen/chemistry";
