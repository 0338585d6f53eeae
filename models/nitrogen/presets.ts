/**
 * Ready-made scenarios (our own invented tanks) and growth-form defaults for plant groups.
 * Presets are ScenarioInput objects: parse them with ScenarioSchema to fill in the rest.
 */
import type { GrowthForm } from "./parameters";
import { GROWTH_FORM_DEFAULTS } from "./parameters";
import type { PlantGroup, ScenarioInput } from "./scenario";
import { PlantGroupSchema } from "./scenario";

export { GROWTH_FORM_DEFAULTS };

/** Nitrate as NO3⁻ (mg/L) to mg N/L, for writing presets in the units keepers know. */
const no3 = (mgPerL: number) => Math.round(mgPerL * 0.2259 * 1000) / 1000;

/**
 * A plant group filled from the typical values of its growth form, with overrides.
 * @param form growth form
 * @param overrides any plant-group fields (id, name, masses in g dry, rates per day …)
 */
export function plantGroupFromForm(form: GrowthForm, overrides: Partial<PlantGroup> = {}): PlantGroup {
  const d = GROWTH_FORM_DEFAULTS[form];
  return PlantGroupSchema.parse({
    id: form,
    name: d.label,
    growthForm: form,
    startMassG: d.startMassG.value,
    maxMassG: d.maxMassG.value,
    nitrogenContent: d.nitrogenContent.value,
    growthRatePerDay: d.growthRatePerDay.value,
    ...overrides,
  });
}

export interface Preset {
  /** Stable key for URLs and files. */
  id: string;
  /** Our own invented name for the demo tank. */
  name: string;
  /**
   * What it shows, in one or two sentences; an amount of nitrate in the reader's own units
   * through `nitrate` (mg N/L → "40 mg/L NO3" or "9.04 mg/L NO3-N").
   */
  describe: (nitrate: (mgN: number) => string) => string;
  scenario: ScenarioInput;
}

export const PRESETS: readonly Preset[] = [
  {
    id: "first-light-fishless",
    name: "First Light — a new tank cycled without fish",
    describe: () =>
      "A 60 L tank with a brand-new filter, dosed with ammonia every other day until the bacteria keep up. Ammonia peaks first, then nitrite, then nitrate climbs. Weekly water changes keep the KH from running out.",
    scenario: {
      water: { volumeL: 60, temperatureC: 26, pH: 7.4, khDkh: 7, startTan: 0, startNitrite: 0, startNitrate: 0 },
      fish: { feedGPerDay: 0 },
      plants: [],
      filter: { capacityMgTanPerDay: 200, establishedAtStart: false, cleaningIntervalDays: 0 },
      maintenance: { waterChangeIntervalDays: 7, waterChangeFraction: 0.3, gravelCleaningFraction: 0 },
      tapWater: { khDkh: 7 },
      fishlessCycling: { enabled: true, doseMgNPerL: 1.5, doseIntervalDays: 2, stopRule: "whenCycled" },
      run: { lengthDays: 60, outputIntervalDays: 0.25 },
    },
  },
  {
    id: "fern-hollow",
    name: "Fern Hollow — lightly stocked, heavily planted",
    describe: () =>
      "A 120 L tank with a few small fish, dense stem plants, a floating carpet and slow rosettes. Plants take nearly all the nitrogen, so nitrate sits below the target band (a case for fertiliser); trimming is the main way nitrogen leaves.",
    scenario: {
      water: { volumeL: 120, temperatureC: 24, pH: 6.9, khDkh: 3, startNitrate: no3(10) },
      fish: { feedGPerDay: 0.3, proteinFraction: 0.42, feedsPerDay: 1, fractionEaten: 0.95 },
      plants: [
        plantGroupFromForm("stem", { id: "stems", name: "Stem thicket", startMassG: 40, maxMassG: 90 }),
        plantGroupFromForm("floating", { id: "float", name: "Floating carpet", startMassG: 3, maxMassG: 12 }),
        plantGroupFromForm("rosette", { id: "rosettes", name: "Rosettes", startMassG: 15, maxMassG: 35 }),
      ],
      maintenance: { waterChangeIntervalDays: 14, waterChangeFraction: 0.3 },
      run: { lengthDays: 180 },
    },
  },
  {
    id: "crowded-reach",
    name: "Crowded Reach — heavily stocked, few plants",
    describe: () =>
      "A 200 L tank full of active fish eating generously, with a handful of slow plants. Nitrate climbs between water changes.",
    scenario: {
      water: { volumeL: 200, temperatureC: 26, pH: 7.5, khDkh: 8, startNitrate: no3(20) },
      fish: { feedGPerDay: 2.5, proteinFraction: 0.45, feedsPerDay: 2, fractionEaten: 0.85 },
      plants: [plantGroupFromForm("rosette", { id: "rosettes", name: "A few rosettes", startMassG: 8, maxMassG: 20 })],
      filter: { capacityMgTanPerDay: 1500, cleaningIntervalDays: 21, organicsRemovedFraction: 0.6 },
      maintenance: { waterChangeIntervalDays: 7, waterChangeFraction: 0.4, gravelCleaningFraction: 0.3 },
      tapWater: { khDkh: 10 },
      run: { lengthDays: 180 },
    },
  },
  {
    id: "hard-spring",
    name: "Hard Spring — tap water already high in nitrate",
    describe: (nitrate) =>
      `A 100 L planted tank whose tap water already carries nitrate, ${nitrate(no3(40))}: every water change adds more. Blending in reverse-osmosis water is the fix to try.`,
    scenario: {
      water: { volumeL: 100, temperatureC: 25, pH: 7.6, khDkh: 8, startNitrate: no3(40) },
      fish: { feedGPerDay: 0.8 },
      plants: [plantGroupFromForm("stem", { id: "stems", name: "Stem plants", startMassG: 20, maxMassG: 60 })],
      tapWater: { nitrate: no3(40), khDkh: 9, roShare: 0 },
      maintenance: { waterChangeIntervalDays: 7, waterChangeFraction: 0.3 },
      run: { lengthDays: 120 },
    },
  },
];

/** Find a preset by id; undefined if there is none. */
export function getPreset(id: string): Preset | undefined {
  return PRESETS.find((p) => p.id === id);
}
