/**
 * A small planted tank for the job tests (sweeps, calibrations, restarts): one stem-plant group
 * trimmed every two weeks, 1 g of food a day, 60 days. Our own worked example, not a measurement.
 */
import { plantGroupFromForm, type ScenarioInput } from "../../models/index";

export const PLANTED: ScenarioInput = {
  plants: [
    plantGroupFromForm("stem", {
      id: "stems",
      name: "Stem plants",
      startMassG: 15,
      maxMassG: 60,
      trim: { rule: "everyDays", everyDays: 14, trimToFraction: 0.5, fullAtFraction: 0.9 },
    }),
  ],
  fish: { feedGPerDay: 1, proteinFraction: 0.42 },
  run: { lengthDays: 60 },
};
