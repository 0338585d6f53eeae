/**
 * Scenario sections that describe how the tank is kept and run: filter, maintenance, tap water,
 * low-oxygen zones, run length, fishless cycling, targets and calibration multipliers.
 */
import { z } from "zod";
import { SCENARIO_DEFAULTS as D } from "../parameters";
import { bool, choice, fraction, intervalDays, num } from "./field-kit";

export const FilterSchema = z.object({
  capacityMgTanPerDay: num(
    D.filter.capacityMgTanPerDay.value,
    {
      label: "Filter capacity",
      hint: "Ammonia-N a fully grown filter clears per day at 1 mg/L and 25 °C; about 600 per m² of media surface.",
      quantity: "none",
      unit: "mg N/day",
    },
    { min: 1, max: 100000 },
  ),
  establishedAtStart: bool(true, {
    label: "Filter already cycled",
    hint: "Off for a new filter: bacteria must grow first, so ammonia and nitrite peak.",
  }),
  cleaningIntervalDays: intervalDays(D.filter.cleaningIntervalDays.value, {
    label: "Clean filter every",
    hint: "Days between filter cleanings; 0 for never.",
    quantity: "days",
    unit: "days",
  }),
  organicsRemovedFraction: fraction(
    D.filter.organicsRemovedFraction.value,
    "Sludge removed per cleaning",
    "Share of the trapped muck a cleaning takes out.",
  ),
  cleanedInTapWater: bool(false, {
    label: "Rinsed in tap water",
    hint: "Chlorinated tap water kills many of the filter bacteria; old tank water does not.",
  }),
  turnoverPerHour: num(
    D.filter.turnoverPerHour.value,
    {
      label: "Filter flow",
      hint: "Pump rate divided by the water volume, e.g. 400 L/h on a 100 L tank is 4; the flow brings oxygen to the bacteria.",
      quantity: "none",
      unit: "volumes/hour",
    },
    { min: 0, max: 30 },
  ),
});

export const MaintenanceSchema = z.object({
  waterChangeIntervalDays: intervalDays(D.maintenance.waterChangeIntervalDays.value, {
    label: "Change water every",
    hint: "Days between water changes; 0 for none.",
    quantity: "days",
    unit: "days",
  }),
  waterChangeFraction: fraction(
    D.maintenance.waterChangeFraction.value,
    "Share of water changed",
    "e.g. 25 % for a quarter of the tank.",
    0.95,
  ),
  gravelCleaningFraction: fraction(
    D.maintenance.gravelCleaningFraction.value,
    "Detritus siphoned per change",
    "Share of the muck in the gravel removed at each water change.",
  ),
  dripLPerDay: num(
    D.maintenance.dripLPerDay.value,
    {
      label: "Continuous drip",
      hint: "Litres a day replaced by a drip or overflow system; 0 for none.",
      quantity: "volume",
      unit: "L/day",
    },
    { min: 0, max: 10000 },
  ),
});

export const TapWaterSchema = z.object({
  nitrate: num(
    D.tapWater.nitrate.value,
    {
      label: "Tap water nitrate",
      hint: "From your water supplier's report or a test.",
      quantity: "nitrate",
      unit: "mg N/L",
    },
    { min: 0, max: 100 },
  ),
  tan: num(
    D.tapWater.tan.value,
    {
      label: "Tap water ammonia",
      hint: "Chloramine-treated water often shows some ammonia.",
      quantity: "ammonia",
      unit: "mg N/L",
    },
    { min: 0, max: 10 },
  ),
  khDkh: num(
    D.tapWater.khDkh.value,
    { label: "Tap water KH", hint: "Carbonate hardness of the tap water.", quantity: "kh", unit: "dKH" },
    { min: 0, max: 30 },
  ),
  roShare: fraction(
    D.tapWater.roShare.value,
    "Reverse-osmosis share",
    "Share of the change water that is RO water (no nitrate, no KH).",
  ),
});

export const LowOxygenSchema = z.object({
  enabled: bool(false, {
    label: "Low-oxygen zones",
    hint: "Deep sand, porous rock or a reactor where bacteria turn nitrate into nitrogen gas, using the muck as fuel.",
  }),
  zoneSize: choice(
    ["fromMedia", "fromCapacity"],
    "fromMedia",
    {
      label: "Size the zones from",
      hint: "What is in the tank (rock and sand, estimated with a wide range), or a capacity you know, e.g. of a reactor.",
      optionLabels: { fromMedia: "the rock and sand in the tank", fromCapacity: "a capacity I know" },
    },
    "Size the zones from the media or from a known capacity",
  ),
  porousRockL: num(
    D.lowOxygen.porousRockL.value,
    {
      label: "Porous rock or media",
      hint: "Volume of porous rock, lava rock or dense ceramic media with slow water inside.",
      quantity: "volume",
      unit: "L",
    },
    { min: 0, max: 500 },
  ),
  sandBedAreaM2: num(
    D.lowOxygen.sandBedAreaM2.value,
    {
      label: "Sand bed area",
      hint: "Floor area covered by sand or fine gravel, e.g. 0.8 m × 0.3 m = 0.24 m².",
      quantity: "none",
      unit: "m²",
    },
    { min: 0, max: 20 },
  ),
  sandBedDepthCm: num(
    D.lowOxygen.sandBedDepthCm.value,
    {
      label: "Sand bed depth",
      hint: "Depth of the sand; below the first centimetre or so it runs out of oxygen.",
      quantity: "none",
      unit: "cm",
    },
    { min: 0, max: 30 },
  ),
  capacityEstimate: choice(
    ["low", "typical", "high"],
    "typical",
    {
      label: "Which estimate to run",
      hint: "Published rates for rock and sand span more than tenfold; run the low and the high end to see the range.",
      optionLabels: { low: "low end", typical: "typical", high: "high end" },
    },
    "Estimate must be low, typical or high",
  ),
  denitrificationCapacityMgNPerDay: num(
    D.lowOxygen.denitrificationCapacityMgNPerDay.value,
    {
      label: "Denitrification capacity",
      hint: "For a known capacity: most nitrate-N the zones remove per day with plenty of nitrate and muck.",
      quantity: "none",
      unit: "mg N/day",
    },
    { min: 0, max: 10000 },
  ),
  anammoxEnabled: bool(false, {
    label: "Anammox",
    hint: "Bacteria that turn ammonium and nitrite together into nitrogen gas.",
  }),
  anammoxCapacityMgNPerDay: num(
    D.lowOxygen.anammoxCapacityMgNPerDay.value,
    {
      label: "Anammox capacity",
      hint: "Most ammonium-N the anammox bacteria use per day.",
      quantity: "none",
      unit: "mg N/day",
    },
    { min: 0, max: 10000 },
  ),
});

export const RunSchema = z.object({
  lengthDays: num(
    D.run.lengthDays.value,
    { label: "Run length", hint: "How many days to simulate (up to two years).", quantity: "days", unit: "days" },
    { min: 1, max: 730 },
  ),
  outputIntervalDays: num(
    D.run.outputIntervalDays.value,
    {
      label: "Chart point every",
      hint: "Spacing of chart points, from one hour (1/24 day) to one week.",
      quantity: "days",
      unit: "days",
    },
    { min: 1 / 24, max: 7 },
  ),
});

export const FishlessCyclingSchema = z.object({
  enabled: bool(false, {
    label: "Fishless cycling",
    hint: "Dose ammonia into a tank without fish to grow the filter bacteria.",
  }),
  doseMgNPerL: num(
    D.fishlessCycling.doseMgNPerL.value,
    { label: "Ammonia per dose", hint: "Rise in total ammonia from each dose.", quantity: "ammonia", unit: "mg N/L" },
    { min: 0, max: 10 },
  ),
  doseIntervalDays: num(
    D.fishlessCycling.doseIntervalDays.value,
    { label: "Dose every", hint: "Days between doses.", quantity: "days", unit: "days" },
    { min: 0.25, max: 30 },
  ),
  stopRule: choice(
    ["whenCycled", "afterDays", "never"],
    "whenCycled",
    {
      label: "Stop dosing",
      hint: "When cycled: stop once a dose is cleared (ammonia and nitrite below 0.1) by the next dose.",
    },
    "Stop rule must be when cycled, after some days or never",
  ),
  stopAfterDays: num(
    D.fishlessCycling.stopAfterDays.value,
    { label: "Stop after", hint: "Day of the last dose (for the fixed rule).", quantity: "days", unit: "days" },
    { min: 0, max: 730 },
  ),
});

export const TargetsSchema = z
  .object({
    nitrateLow: num(
      D.targets.nitrateLow.value,
      {
        label: "Nitrate target, low",
        hint: "Bottom of the band you aim for; plants starve below it.",
        quantity: "nitrate",
        unit: "mg N/L",
      },
      { min: 0, max: 100 },
    ),
    nitrateHigh: num(
      D.targets.nitrateHigh.value,
      { label: "Nitrate target, high", hint: "Top of the band you aim for.", quantity: "nitrate", unit: "mg N/L" },
      { min: 0, max: 100 },
    ),
  })
  .refine((t) => t.nitrateLow <= t.nitrateHigh, {
    path: ["nitrateLow"],
    message: "The low nitrate target must not be above the high one",
  });

const mult = (label: string, hint: string) =>
  num(1, { label, hint, quantity: "none", unit: "×" }, { min: 0.1, max: 10 });

export const MultipliersSchema = z.object({
  feedLoad: mult("Feed load multiplier", "Scales the nitrogen the food brings in; set by calibration."),
  plantUptake: mult("Plant uptake multiplier", "Scales plant growth and uptake; set by calibration."),
  nitrifierCapacity: mult("Filter capacity multiplier", "Scales the filter bacteria's capacity; set by calibration."),
});
