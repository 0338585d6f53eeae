/**
 * What a calibration is asked for: the multipliers to fit and the kits (the API's body and the
 * form's fields), and the fitted multipliers saved as a new scenario.
 */
import { z } from "zod";
import {
  DEFAULT_CARDS,
  KIT_UNITS,
  KitSchema,
  MULTIPLIER_BOUNDS,
  MULTIPLIER_KEYS,
  SPECIES,
  type Kit,
  type Kits,
  type MultiplierKey,
  type Species,
} from "~models/nitrogen/calibrate";
import type { DisplayUnits } from "~/utils/display-units";
import { SPECIES_UNIT } from "~/features/calibration/calibration-report.server";

export const CalibrateInputSchema = z.object({
  fit: z
    .array(z.enum(MULTIPLIER_KEYS, { error: "Choose among the listed multipliers." }))
    .min(1, "Choose at least one multiplier to fit.")
    .max(3),
  kits: z.partialRecord(z.enum(SPECIES), KitSchema).optional(),
  /** What to fit against: the tank's journal as it happened (the default when it has entries) or the scenario's schedule. */
  schedule: z.enum(["journal", "periodic"], { error: 'Choose "journal" or "periodic".' }).optional(),
});

const StepSchema = z.coerce
  .number({ error: "The kit's step must be a number." })
  .positive("The kit's step must be above zero.")
  .max(1000, "The kit's step must be at most 1000.");

/**
 * The kits chosen on the form (`kit.<species>` and `step.<species>`, steps in the person's
 * units), as engine kits; field errors by name. "auto" leaves the species to be inferred.
 */
export function kitsFromForm(
  form: Record<string, string>,
  units: DisplayUnits,
): { kits: Kits; errors: Record<string, string> } {
  const kits: Kits = {};
  const errors: Record<string, string> = {};
  for (const species of SPECIES) {
    const choice = form[`kit.${species}`] ?? "auto";
    const unit = units[SPECIES_UNIT[species]];
    if (choice === "exact") kits[species] = { kind: "exact" };
    else if (choice === "card") kits[species] = defaultCard(species, unit);
    else if (choice === "steps") {
      const step = StepSchema.safeParse(form[`step.${species}`]);
      if (step.success) kits[species] = { kind: "steps", unit, step: step.data };
      else errors[`step.${species}`] = step.error.issues[0].message;
    } else if (choice !== "auto") errors[`kit.${species}`] = "Choose how you tested from the list.";
  }
  return { kits, errors };
}

function defaultCard(species: Species, unit: string): Kit {
  // The card is printed in the ion's unit; a person who reads as N gets the same card.
  return { kind: "card", unit: unit === "asN" ? KIT_UNITS[species][0].id : unit, values: [...DEFAULT_CARDS[species]] };
}

export const SaveFittedSchema = z.object({
  name: z
    .string({ error: "Give the new scenario a name." })
    .trim()
    .min(1, "Give the new scenario a name.")
    .max(120, "Keep the name under 120 characters."),
  ...(Object.fromEntries(
    MULTIPLIER_KEYS.map((k) => [
      k,
      z.coerce
        .number({ error: "The multipliers must be numbers." })
        .min(MULTIPLIER_BOUNDS.min, `Multipliers lie between ${MULTIPLIER_BOUNDS.min} and ${MULTIPLIER_BOUNDS.max}.`)
        .max(MULTIPLIER_BOUNDS.max, `Multipliers lie between ${MULTIPLIER_BOUNDS.min} and ${MULTIPLIER_BOUNDS.max}.`),
    ]),
  ) as Record<MultiplierKey, z.ZodCoercedNumber>),
});
