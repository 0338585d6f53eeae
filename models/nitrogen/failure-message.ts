/** Keepers' messages for runs the solvers could not finish. */
import type { FailureCode } from "../core/simulate";
import { PLANT_UPTAKE } from "./parameters";
import type { Scenario } from "./scenario";
import type { TankConstants } from "./tank-constants";

/**
 * A keeper's message for a run that could not be solved: names the fastest process in the
 * scenario (the usual culprit) and the settings that drive it.
 */
export function describeFailure(
  s: Scenario,
  c: TankConstants,
  code: FailureCode,
  day: number,
  maxWallMs: number,
): string {
  const V = c.volumeL;
  // Fastest rate constants (1/day) a pool can see, with the settings behind each.
  const rates: { rate: number; what: string; check: string }[] = [
    {
      rate: (c.aobQ * c.aobMax) / (c.aobK * V),
      what: "the filter bacteria could clear the water's ammonia many times a day",
      check: "the filter capacity, its multiplier and the water volume",
    },
    {
      rate: s.plants.reduce(
        (a, g, i) =>
          a + (c.plantRate[i] * g.maxMassG * c.plantNmg[i]) / (4 * PLANT_UPTAKE.ammoniumHalfSaturation.value * V),
        0,
      ),
      what: "the plants could take up the water's nitrogen many times a day",
      check: "the plant growth rates, maximum masses, the plant-uptake multiplier and the water volume",
    },
    {
      rate: (c.denitCap + c.anammoxCap) / (0.1 * V),
      what: "the low-oxygen zones could strip the water's nitrogen many times a day",
      check: "the denitrification and anammox capacities and the water volume",
    },
    {
      rate: c.dripLPerDay / V,
      what: "the drip replaces the tank's water many times a day",
      check: "the drip rate and the water volume",
    },
    {
      rate: c.kla,
      what: "the surface and filter exchange oxygen with the air many times a day",
      check: "the surface movement and the filter flow",
    },
  ];
  rates.sort((a, b) => b.rate - a.rate);
  const top = rates[0];
  const when = `at day ${Number(day.toFixed(1))}`;
  if (code === "WALL_TIME") {
    return (
      `The model ran out of time (${maxWallMs} ms) ${when}. Try a shorter run, a wider chart spacing or turning off "Model each meal". ` +
      (top.rate > 50 ? `The settings also make the chemistry very fast: ${top.what}. Check ${top.check}.` : "")
    ).trim();
  }
  const lead =
    code === "MAX_STEPS"
      ? `The model could not settle with these settings ${when}`
      : `The model produced an impossible value ${when}`;
  return `${lead}: ${top.what}, which is far outside the usual range. Check ${top.check}.`;
}
