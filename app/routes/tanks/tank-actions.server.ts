/**
 * The tank page's actions (app/routes/tanks/detail.tsx): its settings with the nitrate band in
 * the person's units, and deleting the tank or one scenario — refused while they hold a
 * student's handed-in lesson copy.
 */
import { and, eq } from "drizzle-orm";
import { redirect } from "react-router";
import { z } from "zod";
import { speciesFactor } from "~models/units";
import { getDb } from "~/db/client.server";
import { scenarios, tanks } from "~/db/schema";
import { handedInCopyIn } from "~/features/classes/classes.server";
import { bandKeptMessage, saveTankSettings } from "~/features/tanks/tank-settings.server";
import type { TankRow } from "~/features/tanks/tanks.server";
import { invalid } from "~/http/pages.server";
import { TankNameSchema, TankNotesSchema } from "~/routes/tanks/tanks-page.server";
import { displayUnitsFor } from "~/utils/display-units";
import { fieldErrors } from "~/utils/form-errors";
import type { SessionUser } from "~/session.server";

const bandNumber = (label: string) =>
  z.coerce
    .number({ error: `${label} must be a number.` })
    .finite(`${label} must be a number.`)
    .min(0, `${label} cannot be negative.`)
    .max(1000, `${label} must be at most 1000.`);

const SettingsSchema = z
  .object({
    intent: z.literal("settings"),
    name: TankNameSchema,
    notes: TankNotesSchema,
    nitrateLow: bandNumber("The low end"),
    nitrateHigh: bandNumber("The high end"),
  })
  .refine((v) => v.nitrateLow <= v.nitrateHigh, {
    path: ["nitrateLow"],
    message: "The low end must not be above the high end.",
  });

const DeleteTankSchema = z.object({
  intent: z.literal("delete-tank"),
  confirm: z.literal("yes", { error: "Tick the box to confirm that everything in this tank goes." }),
});

const DeleteScenarioSchema = z.object({
  intent: z.literal("delete-scenario"),
  scenarioId: z.coerce.number().int().positive(),
  confirm: z.literal("yes", { error: "Tick the box to confirm." }),
});

/** The tank page's actions: save the settings, delete the tank, delete a scenario. */
export async function tankPageAction(user: SessionUser, tank: TankRow, values: Record<string, string>) {
  const db = getDb();

  if (values.intent === "settings") {
    const parsed = SettingsSchema.safeParse(values);
    if (!parsed.success) return invalid(fieldErrors(parsed.error), values);
    const no3 = speciesFactor("nitrate", displayUnitsFor(user));
    const saved = saveTankSettings(tank, {
      name: parsed.data.name,
      notes: parsed.data.notes,
      nitrateLowMgN: parsed.data.nitrateLow / no3,
      nitrateHighMgN: parsed.data.nitrateHigh / no3,
    });
    if (!saved.ok) return invalid({ nitrateLow: bandKeptMessage(saved.lessonTitle) }, values, 409);
    return redirect(`/tanks/${tank.id}?saved=1`);
  }

  if (values.intent === "delete-tank") {
    const parsed = DeleteTankSchema.safeParse(values);
    if (!parsed.success) return invalid(fieldErrors(parsed.error), values);
    // Scenarios, runs, readings, share links and lesson copies go with it (foreign keys cascade), all or nothing.
    const kept = db.transaction((tx) => {
      const handedIn = handedInCopyIn({ tankId: tank.id });
      if (handedIn) return handedIn;
      tx.delete(tanks)
        .where(and(eq(tanks.id, tank.id), eq(tanks.ownerId, user.id)))
        .run();
      return null;
    });
    if (kept) return invalid({ "": handedInMessage(kept.lessonTitle, "tank") }, values, 409);
    return redirect("/tanks");
  }

  if (values.intent === "delete-scenario") {
    const parsed = DeleteScenarioSchema.safeParse(values);
    if (!parsed.success) return invalid(fieldErrors(parsed.error), values);
    const outcome = db.transaction((tx) => {
      const handedIn = handedInCopyIn({ scenarioId: parsed.data.scenarioId });
      if (handedIn) return handedIn;
      return tx
        .delete(scenarios)
        .where(and(eq(scenarios.id, parsed.data.scenarioId), eq(scenarios.tankId, tank.id)))
        .run().changes;
    });
    if (typeof outcome === "object")
      return invalid({ "": handedInMessage(outcome.lessonTitle, "scenario") }, values, 409);
    if (outcome === 0) return invalid({ "": "That scenario is not in this tank." }, values);
    return redirect(`/tanks/${tank.id}`);
  }

  return invalid({ "": "Unknown action." }, values);
}

function handedInMessage(lessonTitle: string, what: "tank" | "scenario"): string {
  return `This ${what} holds your hand-in for the lesson “${lessonTitle}”. It stays, so your teacher can read what you handed in.`;
}
