/**
 * Settings you can change: the one vocabulary the what-if panel, sweeps, the target finder and
 * the setup form share. Each numeric field of the scenario is a setting under its dotted path
 * ("fish.feedGPerDay"), with the label, unit and bounds the field kit records; plus "plantMass",
 * which scales every plant group's start mass and its "most the tank holds" together (sweeping
 * the start mass alone with the maximum fixed is not monotone: a group near its maximum takes up
 * little — docs/engine.md). Values are canonical.
 */
import type { Quantity } from "./field-kit";
import { listScenarioFields, type ScenarioField } from "./fields";
import type { Scenario } from "./schema";

/** A path into the scenario, e.g. ["plants", 0, "startMassG"]. */
export type SettingPath = readonly (string | number)[];

/** One setting set to one canonical value. */
export type SettingChange = { path: SettingPath; value: number };

/** A setting of one scenario, with its bounds and value there. */
export interface Setting {
  /** The field's dotted path ("maintenance.waterChangeFraction"), or "plantMass". */
  id: string;
  label: string;
  hint: string;
  quantity: Quantity;
  /** Canonical unit, as the field kit names it ("g/day", "mg N/L", "" for a fraction). */
  unit: string;
  min: number;
  max: number;
  integer: boolean;
  /** The scenario's value now. */
  current: number;
  /** What to change in the scenario to give the setting `value`. */
  changes(value: number): SettingChange[];
}

/** The id of the derived plant-mass setting (total start mass of all groups, g dry). */
export const PLANT_MASS = "plantMass";

/** Fields that are not settings to vary: the file version, the tank's nitrate band, chart spacing and run length, per-group plant fields. */
const NOT_ADJUSTABLE = /^(schemaVersion|targets\.|run\.|plants\.)/;

const NUMERIC_FIELDS = listScenarioFields().filter(
  (f) => (f.kind === "number" || f.kind === "integer") && !NOT_ADJUSTABLE.test(f.key),
);

function valueAt(scenario: Scenario, path: SettingPath): unknown {
  let node: unknown = scenario;
  for (const p of path) node = (node as Record<string | number, unknown> | undefined)?.[p];
  return node;
}

function fieldSetting(field: ScenarioField, scenario: Scenario): Setting | null {
  const path = field.path as string[];
  const current = valueAt(scenario, path);
  if (typeof current !== "number") return null;
  return {
    id: field.key,
    label: field.meta.label,
    hint: field.meta.hint,
    quantity: field.meta.quantity,
    unit: field.meta.unit,
    min: field.min ?? 0,
    max: field.max ?? current * 10,
    integer: field.kind === "integer",
    current,
    changes: (value) => [{ path, value }],
  };
}

/** Plant mass of all groups, start and maximum scaled together; null without plants. */
function plantMassSetting(scenario: Scenario): Setting | null {
  const total = scenario.plants.reduce((s, g) => s + g.startMassG, 0);
  if (scenario.plants.length === 0 || !(total > 0)) return null;
  const biggestMax = Math.max(...scenario.plants.map((g) => g.maxMassG));
  const smallestMax = Math.min(...scenario.plants.map((g) => g.maxMassG));
  // Scale factor k: every maximum stays within the schema's 0.01–5000 g.
  const kMin = 0.01 / smallestMax;
  const kMax = 5000 / biggestMax;
  return {
    id: PLANT_MASS,
    label: "Plant mass, all groups",
    hint: "Every group's start mass and “most the tank holds” scaled together.",
    quantity: "mass",
    unit: "g dry",
    min: Math.max(0.01, total * kMin),
    max: total * kMax,
    integer: false,
    current: total,
    changes: (value) => {
      const k = value / total;
      return scenario.plants.flatMap((g, i) => [
        { path: ["plants", i, "startMassG"], value: g.startMassG * k },
        // More plants means more room too; a maximum never falls below the schema's 0.01 g.
        { path: ["plants", i, "maxMassG"], value: Math.max(0.01, g.maxMassG * k) },
      ]);
    },
  };
}

/** Every setting of a scenario: plant mass first (when there are plants), then the numeric fields in form order. */
export function scenarioSettings(scenario: Scenario): Setting[] {
  const plants = plantMassSetting(scenario);
  const fields = NUMERIC_FIELDS.map((f) => fieldSetting(f, scenario)).filter((s): s is Setting => s !== null);
  return plants ? [plants, ...fields] : fields;
}

/** One setting of a scenario by id, or null (no such setting, or plant mass without plants). */
export function scenarioSetting(scenario: Scenario, id: string): Setting | null {
  if (id === PLANT_MASS) return plantMassSetting(scenario);
  const field = NUMERIC_FIELDS.find((f) => f.key === id);
  return field ? fieldSetting(field, scenario) : null;
}

/** A field setting's label, unit and bounds, without a scenario (for building forms and schemas). */
export function settingField(id: string): ScenarioField {
  const field = NUMERIC_FIELDS.find((f) => f.key === id);
  if (!field) throw new RangeError(`No setting "${id}"`);
  return field;
}

/**
 * A copy of `scenario` with the value at `path` replaced (e.g. ["plants", 0, "startMassG"]).
 * The input is not modified. Throws if the path does not exist.
 */
export function setScenarioValue(scenario: Scenario, path: SettingPath, value: unknown): Scenario {
  const copy = structuredClone(scenario) as unknown as Record<string | number, unknown>;
  let node: Record<string | number, unknown> = copy;
  for (let i = 0; i < path.length - 1; i++) {
    const next = node[path[i]];
    if (next === null || typeof next !== "object") throw new RangeError(`No setting at ${path.join(".")}`);
    node = next as Record<string | number, unknown>;
  }
  const last = path[path.length - 1];
  if (!(last in node)) throw new RangeError(`No setting at ${path.join(".")}`);
  node[last] = value;
  return copy as unknown as Scenario;
}

/** A copy of `scenario` with every change applied in order. */
export function applyChanges(scenario: Scenario, changes: readonly SettingChange[]): Scenario {
  return changes.reduce((s, c) => setScenarioValue(s, c.path, c.value), scenario);
}
