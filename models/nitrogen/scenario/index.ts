/** The scenario: schema (in sections), migrations of older files, parsing and the form's field list. */
export { SCHEMA_VERSION, ScenarioSchema } from "./schema";
export type { PlantGroup, Scenario, ScenarioInput } from "./schema";
export { FishSchema, PlantGroupSchema, SURFACE_AGITATION, TrimSchema, WaterSchema } from "./tank-sections";
export type { SurfaceAgitation } from "./tank-sections";
export {
  FilterSchema,
  FishlessCyclingSchema,
  LowOxygenSchema,
  MaintenanceSchema,
  MultipliersSchema,
  RunSchema,
  TapWaterSchema,
  TargetsSchema,
} from "./care-sections";
export type { FieldMeta, Quantity } from "./field-kit";
export { MIGRATIONS, ScenarioVersionError, migrateScenario } from "./migrations";
export type { Migration } from "./migrations";
export { describeScenarioIssues, parseScenario } from "./parse";
export { listScenarioFields } from "./fields";
export type { ScenarioField } from "./fields";
export { applyChanges, PLANT_MASS, scenarioSetting, scenarioSettings, setScenarioValue, settingField } from "./settings";
export type { Setting, SettingChange, SettingPath } from "./settings";
