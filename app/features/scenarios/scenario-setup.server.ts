/**
 * Server code shared by the "new scenario" and "edit scenario" routes: reading the form,
 * answering the add/remove-plant buttons, validating, running the engine and saving the
 * scenario with its run in one transaction.
 */
import { data } from "react-router";
import { z } from "zod";
import { ScenarioSchema, type Scenario } from "~models";
import { getDb } from "~/db/client.server";
import { scenarios, tanks } from "~/db/schema";
import { eq } from "drizzle-orm";
import {
  buildScenarioForm,
  newPlantGroup,
  parseScenarioForm,
  plantRowsFromValues,
  renumberPlantRows,
} from "~/features/scenarios/scenario-form.server";
import type { SessionUser } from "~/session.server";
import { checkNewScenario } from "~/quotas.server";
import {
  insertRun,
  runEngineForStorage,
  settingsHash,
  withTankTargets,
  type StorableRun,
} from "~/features/runs/simulation.server";
import type { TankRow } from "~/features/tanks/tanks.server";
import { displayUnitsFor, unitLabels, type DisplayUnits } from "~/utils/display-units";
import { type FieldErrors, formValues } from "~/utils/form-errors";
import type { ScenarioFormModel } from "~/features/scenarios/scenario-form-types";
import { parseDateOnly } from "~/utils/dates";
import { formRefusal } from "~/http/pages.server";

export const ScenarioNameSchema = z
  .string({ error: "Give the scenario a name." })
  .trim()
  .min(1, "Give the scenario a name.")
  .max(120, "Keep the name under 120 characters.");

/** "Run starts on": a date (YYYY-MM-DD) or empty (null: the day the scenario was made); absent when the form does not show it. */
const StartDateSchema = z
  .string()
  .trim()
  .optional()
  .transform((v, ctx) => {
    if (v === undefined) return undefined;
    if (v === "") return null;
    const ms = parseDateOnly(v);
    if (ms === null) {
      ctx.addIssue({ code: "custom", message: "Give the start date like 2026-03-01, or leave it empty." });
      return z.NEVER;
    }
    return new Date(ms);
  });

type SetupActionData = { form: ScenarioFormModel; errors: FieldErrors };

export function unitsOf(user: SessionUser): DisplayUnits {
  return displayUnitsFor(user);
}

export function unitsSummary(units: DisplayUnits): string {
  const l = unitLabels(units);
  return `Volumes in ${l.volume}, temperatures in ${l.temperature}, nitrate in ${l.nitrate}, nitrite in ${l.nitrite}, ammonia in ${l.ammonia}, KH in ${l.kh}, shares in %.`;
}

/** A refused or redrawn form, answered with the person's input kept. */
function redraw(
  values: Record<string, string>,
  units: DisplayUnits,
  errors: FieldErrors,
  status: number,
  extraPlants: unknown[] = [],
) {
  // Submitted rows are drawn from their strings; new rows (no strings yet) from their typical values.
  const plants = [...plantRowsFromValues(values), ...extraPlants];
  const form = buildScenarioForm(values.name ?? "", ScenarioSchema.parse({}), units, values, plants);
  if (values.startDate !== undefined) form.startDate = values.startDate;
  return data<SetupActionData>({ form, errors }, { status });
}

type Saved = { scenarioId: number };

/**
 * Handles a submitted setup form. Returns a redraw (400 for refused input, 200 for an added
 * or removed plant row) or the id of the saved scenario.
 * @param target "new" to create a scenario in `tank`, or the id of the scenario to overwrite.
 */
export async function handleSetupSubmission(
  form: FormData,
  user: SessionUser,
  tank: TankRow,
  target: "new" | number,
  baseline?: Scenario,
  enforce?: (scenario: Scenario) => FieldErrors | null,
): Promise<ReturnType<typeof redraw> | Saved> {
  const units = unitsOf(user);
  const values = renumberPlantRows(formValues(form));
  const intent = values.intent ?? "save";

  if (intent === "add-plant") {
    const ids = Object.entries(values)
      .filter(([k]) => /^plants\.\d+\.id$/.test(k))
      .map(([, v]) => v);
    if (ids.length >= 12) return redraw(values, units, { "": "A scenario holds at most 12 plant groups." }, 400);
    return redraw(values, units, {}, 200, [newPlantGroup(values.newPlantForm ?? "stem", ids)]);
  }
  const remove = /^remove-plant:(\d{1,2})$/.exec(intent);
  if (remove) {
    const index = Number(remove[1]);
    const kept = Object.fromEntries(Object.entries(values).filter(([k]) => !k.startsWith(`plants.${index}.`)));
    return redraw(renumberPlantRows(kept), units, {}, 200);
  }
  if (intent !== "save" && intent !== "save-as-new") return redraw(values, units, { "": "Unknown action." }, 400);

  const name = ScenarioNameSchema.safeParse(values.name);
  const parsed = parseScenarioForm(values, units, baseline);
  const startDate = StartDateSchema.safeParse(values.startDate);
  const errors: FieldErrors = { ...(parsed.ok ? {} : parsed.errors) };
  if (!name.success) errors.name = name.error.issues[0].message;
  if (!startDate.success) errors.startDate = startDate.error.issues[0].message;
  if (!parsed.ok || !name.success || !startDate.success) return redraw(values, units, errors, 400);
  // Only a form that shows the field changes the start date.
  const start = startDate.data === undefined ? {} : { startDate: startDate.data };

  const refused = enforce?.(parsed.scenario);
  if (refused) return redraw(values, units, refused, 400);

  const scenario = withTankTargets(parsed.scenario, tank);
  let scenarioId: number;
  try {
    // Off the request thread unless provably cheap, within the person's limits (app/features/runs/run-gate.server.ts).
    const result = await runEngineForStorage(scenario, { userId: user.id, purpose: "save" });
    // Past a quota nothing is written (one transaction).
    scenarioId = write(tank, target, intent, name.data, scenario, start, settingsHash(scenario), result);
  } catch (error) {
    const refused = formRefusal(error);
    if (!refused) throw error;
    return redraw(values, units, { "": refused.message }, refused.status);
  }
  return { scenarioId };
}

/** The scenario (new or overwritten) and its run, in one transaction. */
function write(
  tank: TankRow,
  target: "new" | number,
  intent: string,
  name: string,
  scenario: Scenario,
  start: { startDate?: Date | null },
  hash: string,
  result: StorableRun,
): number {
  return getDb().transaction((tx) => {
    let id: number;
    if (target === "new" || intent === "save-as-new") {
      checkNewScenario(tx, tank.id);
      id = tx
        .insert(scenarios)
        .values({
          tankId: tank.id,
          name,
          settings: scenario,
          schemaVersion: scenario.schemaVersion,
          copiedFromId: target === "new" ? null : target,
          ...start,
        })
        .returning({ id: scenarios.id })
        .get().id;
    } else {
      id = target;
      tx.update(scenarios)
        .set({ name, settings: scenario, schemaVersion: scenario.schemaVersion, updatedAt: new Date(), ...start })
        .where(eq(scenarios.id, target))
        .run();
    }
    insertRun(tx, id, hash, result);
    tx.update(tanks).set({ updatedAt: new Date() }).where(eq(tanks.id, tank.id)).run();
    return id;
  });
}
