/** Where the nitrogen sits at one moment: each pool in mg N, for the budget. */
import { IX, PLANT0 } from "./state";
import type { TankConstants } from "./tank-constants";

/** Nitrogen (mg N) held in each stock for a state vector. */
export function stocks(c: TankConstants, y: readonly number[]) {
  const V = c.volumeL;
  const plantsByGroup: number[] = [];
  let plants = 0;
  for (let i = 0; i < c.plantCount; i++) {
    const n = c.plantNmg[i] * y[PLANT0 + i];
    plantsByGroup.push(n);
    plants += n;
  }
  const water = { tan: V * y[IX.tan], nitrite: V * y[IX.no2], nitrate: V * y[IX.no3], total: 0 };
  water.total = water.tan + water.nitrite + water.nitrate;
  const bacteria = { ammoniaOxidisers: y[IX.aob], nitriteOxidisers: y[IX.nob], total: y[IX.aob] + y[IX.nob] };
  const detritus = { tank: y[IX.orgW], filter: y[IX.orgF], total: y[IX.orgW] + y[IX.orgF] };
  const fishGut = y[IX.gut];
  return {
    water,
    plants,
    plantsByGroup,
    bacteria,
    detritus,
    fishGut,
    total: water.total + plants + bacteria.total + detritus.total + fishGut,
  };
}
export type Stocks = ReturnType<typeof stocks>;
