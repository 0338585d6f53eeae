/** The scenario: schema (in sections), migrations of older files, parsing and the form's field list. */
export { SCHEMA_VERSION, ScenarioSchema } from "./schema";
export type { PlantGroup, Scenario, ScenarioInput } from "./schema";
export { PlantGroupSchema } from "./tank-sections";

export { MultipliersSchema } from "./care-sections";
export type { Quantity } from "./field-kit";
export { migrateScenario } from "./migrations";

export { describeScenarioIssues, parseScenario } from "./parse";
export { listScenarioFields } from "./fields";
export type { ScenarioField } from "./fields";
export {
  applyChanges,
  PLANT_MASS,
  scenarioSetting,
  scenarioSettings,
  setScenarioValue,
  settingField,
} from "./settings";
export type { Setting, SettingChange, SettingPath } from "./settings";
