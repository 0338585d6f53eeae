/** The state on day 0, from the scenario. */
import { EATEN_N_SPLIT } from "./chemistry";
import { BACTERIA } from "./parameters";
import type { Scenario } from "./scenario";
import { IX, PLANT0 } from "./state";
import type { TankConstants } from "./tank-constants";

/**
 * The initial state. A filter "established at start" holds the biomass its expected TAN load
 * supports (capped by its carrying capacity) and detritus at its steady level; a new filter holds
 * only a seed of bacteria and no detritus.
 */
export function initialState(s: Scenario, c: TankConstants): number[] {
  const y = new Array<number>(PLANT0 + c.plantCount).fill(0);
  y[IX.tan] = s.water.startTan;
  y[IX.no2] = s.water.startNitrite;
  y[IX.no3] = s.water.startNitrate;
  y[IX.kh] = s.water.khDkh;
  y[IX.o2] = c.o2Sat;
  const eatenKept = c.feedN * c.eatenShare * (1 - EATEN_N_SPLIT.fishGrowth);
  if (c.pulsedFeeding) {
    // Periodic steady state just before a meal: M·e^(−kτ) / (1 − e^(−kτ)), τ = 1/feeds per day.
    const decay = Math.exp(-c.gutRelease / c.feedsPerDay);
    y[IX.gut] = ((eatenKept / c.feedsPerDay) * decay) / (1 - decay);
  } else {
    y[IX.gut] = eatenKept / c.gutRelease;
  }
  const toDetritus = eatenKept * c.gutToFaeces + (c.leftoversRemoved ? 0 : c.feedN * (1 - c.eatenShare));
  if (s.filter.establishedAtStart) {
    // Steady detritus without cleanings: tank pool drains by trapping and mineralisation.
    y[IX.orgW] = toDetritus / (c.trapRate + c.mineralisation);
    y[IX.orgF] = (y[IX.orgW] * c.trapRate) / c.mineralisation;
    const dosing = s.fishlessCycling.enabled
      ? (s.fishlessCycling.doseMgNPerL * c.volumeL) / s.fishlessCycling.doseIntervalDays
      : 0;
    const load = eatenKept + c.feedN * (c.leftoversRemoved ? 0 : 1 - c.eatenShare) + dosing;
    const floor = BACTERIA.establishedFloorFraction.value;
    // Steady biomass for an oxidation rate L: yield·L·(1 − B/Bmax) = b·(B − B_resident).
    const steady = (yieldN: number, decay: number, max: number, resident: number) => {
      const g = yieldN * load;
      return Math.max(((g + decay * resident) * max) / (decay * max + g), floor * max);
    };
    y[IX.aob] = steady(c.aobYield, c.aobDecay, c.aobMax, c.aobFloor);
    y[IX.nob] = steady(c.nobYield, c.nobDecay, c.nobMax, c.nobFloor);
  } else {
    const seed = BACTERIA.seedFraction.value;
    y[IX.aob] = seed * c.aobMax;
    y[IX.nob] = seed * c.nobMax;
  }
  for (let i = 0; i < c.plantCount; i++) y[PLANT0 + i] = s.plants[i].startMassG;
  return y;
}
