/**
 * A lesson's locks: which setup-form fields a student may change (the lesson's unlocked input
 * names, and the pseudo-field "plants" that frees the plant groups), the check that refuses a
 * change to a locked field even when the form is forged, and what a copy changed.
 */
import { listScenarioFields, type Scenario } from "~models";
import { CANONICAL_UNITS } from "~models/units";
import type { LessonRow } from "~/features/classes/class-rows";
import { readStoredSettings } from "~/features/runs/simulation.server";
import { buildScenarioForm } from "~/features/scenarios/scenario-form.server";
import type { FormField, ScenarioFormModel } from "~/features/scenarios/scenario-form-types";
import type { DisplayUnits } from "~/utils/display-units";
import type { FieldErrors } from "~/utils/form-errors";

/** The pseudo-field that frees the plant groups (adding, removing and every plant setting). */
export const PLANT_GROUPS_FIELD = "plants";

/**
 * The settings a lesson leaves open, in words ("Water volume", "Growth rate (plant group 1)"),
 * from its unlocked input names; the form's own labels, from the engine's field list.
 */
export function openSettingLabels(unlockedFields: readonly string[]): string[] {
  const labels = new Map(listScenarioFields().map((f) => [f.key, f.meta.label]));
  return unlockedFields.map((name) => {
    if (name === PLANT_GROUPS_FIELD) return "The plant groups (adding, removing and all their settings)";
    const plant = /^plants\.(\d+)\.(.+)$/.exec(name);
    if (plant) return `${labels.get(`plants.*.${plant[2]}`) ?? plant[2]} (plant group ${Number(plant[1]) + 1})`;
    if (name === "name") return "Scenario name";
    if (name === "startDate") return "Run starts on";
    return labels.get(name) ?? name;
  });
}

/** Every input name of a scenario's setup form, grouped as the form groups them. */
export function formFieldGroups(model: ScenarioFormModel): { title: string; fields: FormField[] }[] {
  return model.sections.flatMap((s) =>
    s.id === "plants"
      ? model.plants.map((p) => ({
          title: `Plants: ${p.fields.find((f) => f.name.endsWith(".name"))?.value || `group ${p.index + 1}`}`,
          fields: p.fields,
        }))
      : [{ title: s.title, fields: s.fields }],
  );
}

export function lessonFieldNames(settings: Scenario, units: DisplayUnits): Set<string> {
  const model = buildScenarioForm("", settings, units);
  return new Set(formFieldGroups(model).flatMap((g) => g.fields.map((f) => f.name)));
}

/** Names drawn locked on a student's form: every field not unlocked (all plant fields are free when the groups are). */
export function lockedNames(model: ScenarioFormModel, unlocked: readonly string[]): Set<string> {
  const free = new Set(unlocked);
  const plantsFree = free.has(PLANT_GROUPS_FIELD);
  const out = new Set<string>();
  for (const g of formFieldGroups(model)) {
    for (const f of g.fields) {
      if (free.has(f.name) || (plantsFree && f.name.startsWith("plants."))) continue;
      out.add(f.name);
    }
  }
  return out;
}

function valueAt(obj: unknown, path: string[]): unknown {
  let cur = obj;
  for (const p of path) {
    if (cur === null || typeof cur !== "object") return undefined;
    cur = (cur as Record<string, unknown>)[p];
  }
  return cur;
}

function same(a: unknown, b: unknown): boolean {
  if (typeof a === "number" && typeof b === "number")
    return Math.abs(a - b) <= 1e-9 * Math.max(1, Math.abs(a), Math.abs(b));
  return a === b;
}

/**
 * The check handleSetupSubmission runs before saving a student's copy: every locked field must
 * still hold the lesson's value (in canonical units), and, unless the plant groups are free,
 * the same plant groups must be there in the same order. A refused field gets its message.
 */
export function lessonEnforcer(lesson: Pick<LessonRow, "settings" | "unlockedFields">) {
  const base = readStoredSettings(lesson.settings);
  const free = new Set(lesson.unlockedFields);
  const plantsFree = free.has(PLANT_GROUPS_FIELD);
  return (scenario: Scenario): FieldErrors | null => {
    if (!base) return { "": "The lesson’s settings can no longer be read; ask your teacher." };
    const errors: FieldErrors = {};
    if (!plantsFree) {
      const ids = (s: Scenario) => s.plants.map((p) => p.id).join("|");
      if (ids(scenario) !== ids(base))
        errors[""] = "This lesson fixes the plant groups: they cannot be added or removed.";
    }
    // Check every field the form has, in the lesson's own settings (units do not matter here).
    for (const name of lessonFieldNames(base, CANONICAL_UNITS)) {
      if (free.has(name) || (plantsFree && name.startsWith("plants."))) continue;
      const path = name.split(".");
      if (!same(valueAt(scenario, path), valueAt(base, path))) errors[name] = "This setting is locked by the lesson.";
    }
    return Object.keys(errors).length ? errors : null;
  };
}

/** The fields a student's copy changed from the lesson, with their labels and units (locked ones marked). */
export function changedFields(lesson: ScenarioFormModel, copy: ScenarioFormModel, locked: ReadonlySet<string>) {
  const before = new Map(formFieldGroups(lesson).flatMap((g) => g.fields.map((f) => [f.name, f] as const)));
  const out: { name: string; label: string; from: string; to: string; unit: string; locked: boolean }[] = [];
  for (const g of formFieldGroups(copy)) {
    for (const f of g.fields) {
      const b = before.get(f.name);
      if (b && b.value === f.value) continue;
      out.push({
        name: f.name,
        label: g.title.startsWith("Plants") ? `${f.label} (${g.title.slice(8)})` : f.label,
        from: b ? b.value : "–",
        to: f.value,
        unit: f.kind === "boolean" || f.kind === "enum" ? "" : f.unit,
        locked: locked.has(f.name),
      });
    }
  }
  return { fields: out, plantGroups: { from: lesson.plants.length, to: copy.plants.length } };
}
