/**
 * The scenario setup form, server side: builds what the page draws from the engine's own
 * schema metadata (labels, hints, bounds), in the viewer's units, and turns a submitted form
 * back into a validated scenario in canonical units. Nothing here knows about HTTP.
 */
import {
  GROWTH_FORM_DEFAULTS,
  GROWTH_FORMS,
  listScenarioFields,
  parseScenario,
  plantGroupFromForm,
  type Scenario,
  type ScenarioField,
} from "~models";
import { fromDisplay, toDisplay, unitLabel } from "~models/units";
import type { DisplayUnits } from "~/utils/display-units";
import type { FieldErrors } from "~/utils/form-errors";
import type { FormField, FormSection, PlantRow, ScenarioFormModel } from "~/features/scenarios/scenario-form-types";

const SECTIONS: { id: FormSection["id"]; keys: string[]; title: string; intro: string }[] = [
  { id: "water", keys: ["water"], title: "Water", intro: "The tank's water and what it holds on day one." },
  {
    id: "fish",
    keys: ["fish", "fishlessCycling"],
    title: "Fish & feeding",
    intro: "Food is where most of the nitrogen comes from. A new tank without fish can be cycled by dosing ammonia.",
  },
  { id: "plants", keys: [], title: "Plants", intro: "Growing plants take nitrogen out of the water, ammonium first." },
  {
    id: "filter",
    keys: ["filter"],
    title: "Filter",
    intro: "The bacteria that turn ammonia into nitrite and nitrate live mostly here.",
  },
  {
    id: "maintenance",
    keys: ["maintenance"],
    title: "Maintenance",
    intro: "Water changes and gravel cleaning take nitrogen out.",
  },
  {
    id: "tapWater",
    keys: ["tapWater"],
    title: "Tap water",
    intro: "Change water may already carry nitrate: then a water change adds nitrate instead of removing it.",
  },
  {
    id: "lowOxygen",
    keys: ["lowOxygen"],
    title: "Low-oxygen zones",
    intro: "Optional: places where bacteria turn nitrate (or ammonium and nitrite) into nitrogen gas.",
  },
  { id: "run", keys: ["run"], title: "Run length", intro: "How long to simulate and how often to draw a point." },
  {
    id: "multipliers",
    keys: ["multipliers"],
    title: "Model multipliers",
    intro: "Leave at 1 unless calibration against your readings suggested otherwise.",
  },
];

const ENUM_LABELS: Record<string, string> = {
  none: "never",
  whenFull: "when it fills its space",
  everyDays: "every so many days",
  whenCycled: "once the tank is cycled",
  afterDays: "after a set number of days",
  never: "never (keep dosing)",
  stem: "stem plants",
  floating: "floating plants",
  rosette: "rosette plants",
  moss: "mosses",
  custom: "other (custom)",
};

/** Fields the form does not show: the version is implied, ids are kept in hidden inputs, and the nitrate band is a tank setting. */
const HIDDEN = new Set(["schemaVersion", "plants.*.id", "targets.nitrateLow", "targets.nitrateHigh"]);

const FIELDS = listScenarioFields().filter((f) => !HIDDEN.has(f.key));

/** The unit label a field is shown in, in the viewer's units ("mg/L NO3", "%", "g/day"). */
function unitFor(field: ScenarioField, units: DisplayUnits): string {
  return unitLabel(field.meta.quantity, units, field.meta.unit);
}

/**
 * Up to 4 significant figures, no float noise ("26.42", not "26.417205235814845"). Saving an
 * untouched field keeps its exact stored value (see parseScenarioForm's baseline).
 */
function formatInput(x: number): string {
  if (!Number.isFinite(x)) return "";
  return String(Number(x.toPrecision(4)));
}

function valueAt(obj: unknown, path: (string | number)[]): unknown {
  let cur = obj;
  for (const p of path) {
    if (cur === null || typeof cur !== "object") return undefined;
    cur = (cur as Record<string | number, unknown>)[p];
  }
  return cur;
}

function displayBound(field: ScenarioField, bound: number | null, units: DisplayUnits): number | null {
  if (bound === null) return null;
  return Number(formatInput(toDisplay(field.meta.quantity, bound, units)));
}

function toFormField(field: ScenarioField, name: string, raw: unknown, units: DisplayUnits): FormField {
  const kind: FormField["kind"] = field.kind === "string" ? "text" : field.kind === "literal" ? "enum" : field.kind;
  let value = "";
  if (field.kind === "boolean") value = raw ? "true" : "false";
  else if (typeof raw === "number") value = formatInput(toDisplay(field.meta.quantity, raw, units));
  else if (raw !== undefined && raw !== null) value = String(raw);
  return {
    name,
    label: field.meta.label,
    hint: field.meta.hint,
    kind,
    value,
    unit: unitFor(field, units),
    min: displayBound(field, field.min, units),
    max: displayBound(field, field.max, units),
    options: field.options
      ? field.options.map((o) => ({ value: o, label: field.meta.optionLabels?.[o] ?? ENUM_LABELS[o] ?? o }))
      : null,
  };
}

const PLANT_FIELDS = FIELDS.filter((f) => f.path[0] === "plants");

function plantRows(plants: unknown[], units: DisplayUnits): PlantRow[] {
  return plants.map((plant, index) => ({
    index,
    id: String(valueAt(plant, ["id"]) ?? `group-${index + 1}`),
    fields: PLANT_FIELDS.map((f) => {
      const rest = f.path.slice(2) as string[];
      return toFormField(f, ["plants", index, ...rest].join("."), valueAt(plant, rest), units);
    }),
  }));
}

/**
 * The form for `scenario` (canonical units) in the viewer's `units`. `raw` (the submitted
 * strings) wins over the scenario's values where given, so a refused form redraws as typed.
 */
export function buildScenarioForm(
  name: string,
  scenario: Scenario,
  units: DisplayUnits,
  raw?: Record<string, string>,
  plantsOverride?: unknown[],
): ScenarioFormModel {
  const sections: FormSection[] = SECTIONS.map((s) => ({
    id: s.id,
    title: s.title,
    intro: s.intro,
    fields: FIELDS.filter((f) => s.keys.includes(String(f.path[0]))).map((f) =>
      toFormField(f, f.key, valueAt(scenario, f.path as string[]), units),
    ),
  }));
  const plants = plantRows(plantsOverride ?? scenario.plants, units);
  if (raw) {
    for (const field of [...sections.flatMap((s) => s.fields), ...plants.flatMap((p) => p.fields)]) {
      if (raw[field.name] === undefined) continue;
      field.value = field.kind === "boolean" ? (raw[field.name] === "true" ? "true" : "false") : raw[field.name];
    }
  }
  const growthFormPresets: ScenarioFormModel["growthFormPresets"] = {};
  for (const form of GROWTH_FORMS) {
    const d = GROWTH_FORM_DEFAULTS[form];
    growthFormPresets[form] = {
      startMassG: formatInput(d.startMassG.value),
      maxMassG: formatInput(d.maxMassG.value),
      nitrogenContent: formatInput(d.nitrogenContent.value * 100),
      growthRatePerDay: formatInput(d.growthRatePerDay.value),
      name: d.label,
    };
  }
  return {
    name,
    sections,
    plants,
    growthForms: GROWTH_FORMS.map((g) => ({ value: g, label: ENUM_LABELS[g] ?? g })),
    growthFormPresets,
  };
}

/** Row indexes present in a submitted form ("plants.3.name" → 3), in order. */
function submittedPlantIndexes(values: Record<string, string>): number[] {
  const found = new Set<number>();
  for (const key of Object.keys(values)) {
    const m = /^plants\.(\d{1,2})\./.exec(key);
    if (m) found.add(Number(m[1]));
  }
  return [...found].sort((a, b) => a - b);
}

type ParseOk = { ok: true; scenario: Scenario };
type ParseFail = { ok: false; errors: FieldErrors };

/** Accepts "12,5" as 12.5 (a decimal comma) but nothing else that is not a plain number. */
function parseNumber(text: string): number | null {
  const t = text.trim().replace(/^(-?\d+),(\d+)$/, "$1.$2");
  if (!/^[-+]?(\d+\.?\d*|\.\d+)([eE][-+]?\d+)?$/.test(t)) return null;
  const n = Number(t);
  return Number.isFinite(n) ? n : null;
}

/**
 * Submitted strings → a validated scenario in canonical units, or errors keyed by input name.
 * Ranges are checked in the viewer's units first (so the message speaks their units), then the
 * engine's schema has the last word. `baseline` keeps exact canonical values for fields the
 * person did not touch (a value shown rounded in gallons is not re-rounded on every save).
 */
export function parseScenarioForm(
  values: Record<string, string>,
  units: DisplayUnits,
  baseline?: Scenario,
): ParseOk | ParseFail {
  const errors: FieldErrors = {};
  const out: Record<string, unknown> = {};
  const set = (path: (string | number)[], v: unknown) => {
    let cur = out as Record<string | number, unknown>;
    path.slice(0, -1).forEach((p, i) => {
      if (cur[p] === undefined) cur[p] = typeof path[i + 1] === "number" ? [] : {};
      cur = cur[p] as Record<string | number, unknown>;
    });
    cur[path[path.length - 1]] = v;
  };

  const indexes = submittedPlantIndexes(values);
  const concrete: { field: ScenarioField; path: (string | number)[]; name: string; basePath: (string | number)[] }[] =
    [];
  for (const field of FIELDS) {
    if (field.path[0] === "plants") {
      indexes.forEach((index, position) => {
        const rest = field.path.slice(2) as string[];
        concrete.push({
          field,
          path: ["plants", position, ...rest],
          name: ["plants", index, ...rest].join("."),
          basePath: ["plants", index, ...rest],
        });
      });
    } else {
      concrete.push({ field, path: field.path as string[], name: field.key, basePath: field.path as string[] });
    }
  }

  for (const { field, path, name, basePath } of concrete) {
    const text = values[name];
    if (field.kind === "boolean") {
      set(path, text === "true");
      continue;
    }
    if (field.kind === "enum") {
      if (text !== undefined) set(path, text);
      continue;
    }
    if (field.kind === "string") {
      if (text !== undefined) set(path, text.trim());
      continue;
    }
    if (text === undefined) continue; // not on the form: the schema default applies
    if (text.trim() === "") {
      errors[name] = `Enter a number for ${field.meta.label.toLowerCase()}.`;
      continue;
    }
    const n = parseNumber(text);
    if (n === null) {
      errors[name] = `${field.meta.label} must be a number, like 12 or 0.5.`;
      continue;
    }
    const unit = unitFor(field, units);
    const min = displayBound(field, field.min, units);
    const max = displayBound(field, field.max, units);
    if (min !== null && n < min) {
      errors[name] = `${field.meta.label} must be at least ${min}${unit ? ` ${unit}` : ""}.`;
      continue;
    }
    if (max !== null && n > max) {
      errors[name] = `${field.meta.label} must be at most ${max}${unit ? ` ${unit}` : ""}.`;
      continue;
    }
    const before = baseline ? valueAt(baseline, basePath) : undefined;
    const untouched =
      typeof before === "number" && formatInput(toDisplay(field.meta.quantity, before, units)) === text.trim();
    set(path, untouched ? before : fromDisplay(field.meta.quantity, n, units));
  }
  // Every row keeps an id; a row without one (added in the browser) gets a fresh one.
  indexes.forEach((index, position) => {
    const id = values[`plants.${index}.id`]?.trim();
    set(["plants", position, "id"], id && id.length <= 40 ? id : `group-${index + 1}`);
  });
  if (indexes.length === 0) set(["plants"], []);
  if (baseline) set(["targets"], baseline.targets);

  if (Object.keys(errors).length > 0) return { ok: false, errors };
  const parsed = parseScenario(out);
  if (!parsed.success) {
    for (const issue of parsed.error.issues) {
      const path = issue.path.map((p, i) => (i === 1 && issue.path[0] === "plants" ? (indexes[Number(p)] ?? p) : p));
      const key = path.map(String).join(".");
      if (!(key in errors)) errors[key] = issue.message;
    }
    return { ok: false, errors };
  }
  return { ok: true, scenario: parsed.data };
}

/** A new plant row's values (canonical) for a growth form, with an id unused in `existing`. */
export function newPlantGroup(form: string, existingIds: string[]): unknown {
  const growthForm = (GROWTH_FORMS as readonly string[]).includes(form)
    ? (form as (typeof GROWTH_FORMS)[number])
    : "stem";
  let n = existingIds.length + 1;
  while (existingIds.includes(`group-${n}`)) n++;
  return plantGroupFromForm(growthForm, { id: `group-${n}` });
}

/**
 * Renumbers plant rows 0, 1, 2… in submitted values (rows removed in the browser leave gaps),
 * so errors, the redrawn form and the parsed scenario all use the same indexes.
 */
export function renumberPlantRows(values: Record<string, string>): Record<string, string> {
  const indexes = submittedPlantIndexes(values);
  const position = new Map(indexes.map((index, i) => [index, i]));
  const out: Record<string, string> = {};
  for (const [key, value] of Object.entries(values)) {
    const m = /^plants\.(\d{1,2})\.(.+)$/.exec(key);
    if (m) out[`plants.${position.get(Number(m[1]))}.${m[2]}`] = value;
    else if (!key.startsWith("plants.")) out[key] = value;
  }
  return out;
}

/** Stand-in rows for redrawing a submitted form: ids only; the values come from the raw strings. */
export function plantRowsFromValues(values: Record<string, string>): unknown[] {
  return submittedPlantIndexes(values).map((index) => ({ id: values[`plants.${index}.id`] ?? `group-${index + 1}` }));
}
