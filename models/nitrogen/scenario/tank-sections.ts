/**
 * Scenario sections that describe the tank itself: water, fish and feeding, plant groups.
 * Canonical units: litres, °C, mg N/L, g, dKH, days (convert at the edges with models/units.ts).
 */
import { z } from "zod";
import { GROWTH_FORM_DEFAULTS, GROWTH_FORMS, SCENARIO_DEFAULTS as D } from "../parameters";
import { bool, choice, fraction, num, text } from "./field-kit";

/** How much the water surface moves (sets the oxygen exchange with the air). */
const SURFACE_AGITATION = ["still", "gentle", "rippling", "strong"] as const;

export const WaterSchema = z.object({
  volumeL: num(
    D.water.volumeL.value,
    {
      label: "Water volume",
      hint: "Actual water in the tank, after gravel and decorations.",
      quantity: "volume",
      unit: "L",
    },
    { min: 1, max: 10000 },
  ),
  temperatureC: num(
    D.water.temperatureC.value,
    { label: "Temperature", hint: "Held steady by a heater or the room.", quantity: "temperature", unit: "°C" },
    { min: 0, max: 40 },
  ),
  pH: num(
    D.water.pH.value,
    {
      label: "pH",
      hint: "Measured pH; it sets how much of the ammonia is in the toxic free form.",
      quantity: "ph",
      unit: "",
    },
    { min: 4, max: 10 },
  ),
  khDkh: num(
    D.water.khDkh.value,
    {
      label: "KH (carbonate hardness)",
      hint: "Buffer that nitrifying bacteria use up; water changes restore it.",
      quantity: "kh",
      unit: "dKH",
    },
    { min: 0, max: 30 },
  ),
  startTan: num(
    D.water.startTan.value,
    {
      label: "Ammonia at the start",
      hint: "Total ammonia (NH3 + NH4) on the first day.",
      quantity: "ammonia",
      unit: "mg N/L",
    },
    { min: 0, max: 50 },
  ),
  startNitrite: num(
    D.water.startNitrite.value,
    { label: "Nitrite at the start", hint: "Nitrite on the first day.", quantity: "nitrite", unit: "mg N/L" },
    { min: 0, max: 50 },
  ),
  startNitrate: num(
    D.water.startNitrate.value,
    { label: "Nitrate at the start", hint: "Nitrate on the first day.", quantity: "nitrate", unit: "mg N/L" },
    { min: 0, max: 200 },
  ),
  phFollowsKh: bool(false, {
    label: "pH follows KH",
    hint: "If on, pH drops as KH is used up (assumes steady CO2); if off, pH stays as entered.",
  }),
  surfaceAgitation: choice(
    SURFACE_AGITATION,
    "rippling",
    {
      label: "Surface movement",
      hint: "How much the water surface moves; a moving surface takes up oxygen from the air.",
      optionLabels: {
        still: "still surface",
        gentle: "gentle movement",
        rippling: "rippling (filter outflow breaks the surface)",
        strong: "strong (air stone or spray bar)",
      },
    },
    "Surface movement must be still, gentle, rippling or strong",
  ),
});

export const FishSchema = z.object({
  feedGPerDay: num(
    D.fish.feedGPerDay.value,
    {
      label: "Food per day",
      hint: "Grams of dry food given each day, all feeds together.",
      quantity: "mass",
      unit: "g/day",
    },
    { min: 0, max: 1000 },
  ),
  proteinFraction: fraction(
    D.fish.proteinFraction.value,
    "Protein share of the food",
    "From the food label, e.g. 45 % protein.",
    0.8,
  ),
  feedsPerDay: num(
    D.fish.feedsPerDay.value,
    { label: "Feeds per day", hint: "How many times a day the fish are fed.", quantity: "count", unit: "" },
    { min: 1, max: 12, int: true },
  ),
  fractionEaten: fraction(
    D.fish.fractionEaten.value,
    "Share of food eaten",
    "The rest sinks and rots unless you remove it.",
  ),
  leftoversRemoved: bool(false, {
    label: "Leftovers removed",
    hint: "If on, uneaten food is taken out after the meal and adds no nitrogen.",
  }),
  pulsedFeeding: bool(false, {
    label: "Model each meal",
    hint: "If on, each feed is a separate pulse (shows the ammonia bump after meals); slower to compute.",
  }),
});

const TrimSchema = z.object({
  rule: choice(
    ["none", "whenFull", "everyDays"],
    "whenFull",
    {
      label: "Trimming",
      hint: "When you cut this group back: never, when it fills its space, or on a fixed schedule.",
    },
    "Trimming rule must be none, when full or every N days",
  ),
  fullAtFraction: fraction(0.9, "Counts as full at", "Share of the maximum mass at which you trim.", 1),
  trimToFraction: fraction(0.6, "Trim back to", "Share of the maximum mass left after trimming."),
  everyDays: num(
    14,
    { label: "Trim every", hint: "Days between trims (for the fixed schedule).", quantity: "days", unit: "days" },
    { min: 1, max: 365 },
  ),
});

const stem = GROWTH_FORM_DEFAULTS.stem;

export const PlantGroupSchema = z
  .object({
    id: text(
      "plants",
      { label: "Id", hint: "Short unique key for this group." },
      { min: 1, max: 40, subject: "Plant group id" },
    ),
    name: text(
      stem.label,
      { label: "Name", hint: "What you call this group of plants." },
      { max: 80, subject: "Plant group name" },
    ),
    growthForm: choice(
      GROWTH_FORMS,
      "stem",
      { label: "Growth form", hint: "Sets typical growth rate and nitrogen content." },
      "Growth form must be stem, floating, rosette, moss or custom",
    ),
    startMassG: num(
      stem.startMassG.value,
      {
        label: "Plant mass at the start",
        hint: "Dry mass; fresh plants are roughly ten times heavier.",
        quantity: "mass",
        unit: "g",
      },
      { min: 0, max: 5000 },
    ),
    maxMassG: num(
      stem.maxMassG.value,
      {
        label: "Most the tank holds",
        hint: "Dry mass at which the group fills its space.",
        quantity: "mass",
        unit: "g",
      },
      { min: 0.01, max: 5000 },
    ),
    nitrogenContent: fraction(
      stem.nitrogenContent.value,
      "Nitrogen content",
      "Share of dry mass that is nitrogen, typically 2–4 %.",
      0.08,
    ),
    growthRatePerDay: num(
      stem.growthRatePerDay.value,
      {
        label: "Growth rate",
        hint: "Relative growth per day with plenty of nitrogen, e.g. 0.05 doubles in two weeks.",
        quantity: "rate",
        unit: "/day",
      },
      { min: 0, max: 1 },
    ),
    trim: TrimSchema.prefault({}),
  })
  .superRefine((g, ctx) => {
    if (g.startMassG > g.maxMassG) {
      ctx.addIssue({
        code: "custom",
        path: ["startMassG"],
        message: "Plant mass at the start cannot be more than the most the tank holds",
      });
    }
    if (g.trim.rule === "whenFull" && g.trim.trimToFraction >= g.trim.fullAtFraction) {
      ctx.addIssue({
        code: "custom",
        path: ["trim", "trimToFraction"],
        message: "Trim back to a smaller share than the one that counts as full",
      });
    }
  });
