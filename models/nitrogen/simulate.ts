/**
 * simulate(): run a scenario through the tank model and return series, events, the nitrogen
 * budget, key figures and solver statistics. Pure and deterministic (apart from `stats.wallMs`,
 * which is reported but never changes any other value; the clock is otherwise read only to abort).
 */
import { ModelError } from "../core/errors";
import type { EventRecord, ScheduledEvent } from "../core/events";
import { periodicTimes } from "../core/events";
import type { OdeProblem, Watch } from "../core/problem";
import { runLoop } from "../core/simulate";
import { BACTERIA, PLANT_UPTAKE, SCENARIO_DEFAULTS } from "./parameters";
import type { NitrogenBudget } from "./budget";
import { buildBudget, emptyFlows } from "./budget";
import { EATEN_N_SPLIT } from "./chemistry";
import type { TankConstants } from "./processes";
import {
  IX,
  PLANT0,
  STATE_NAMES,
  absoluteTolerances,
  deriveConstants,
  fnh3At,
  initialState,
  makeRhs,
  phAt,
  stocks,
} from "./processes";
import type { Scenario } from "./scenario";
import { ScenarioSchema, describeScenarioIssues } from "./scenario";

/** Version of the engine's numbers: bump when a change alters results for the same scenario. */
export const ENGINE_VERSION = "fernwater-engine 1.0.0";

export interface SimulateOptions {
  /** Abort with ModelError("WALL_TIME") after this many milliseconds (default 2000). */
  maxWallMs?: number;
  /** Abort with ModelError("MAX_STEPS") after this many solver steps in total (default 200 000). */
  maxSteps?: number;
  /** Steps allowed between two events (default 50 000). */
  maxStepsPerSegment?: number;
  /** Override the scenario's chart spacing (days). */
  outputIntervalDays?: number;
}

/**
 * Columnar time series. Values are rounded to 6 significant figures (budget values are not).
 * At every event the series holds two samples with the same `t`: just before and just after.
 */
export interface Series {
  /** Days from the start. */
  t: number[];
  /** Total ammonia nitrogen, mg N/L. */
  tan: number[];
  /** Free (un-ionised) ammonia, mg N/L (Emerson et al. 1975 split). */
  nh3: number[];
  /** Nitrite-N, mg N/L. */
  no2: number[];
  /** Nitrate-N, mg N/L. */
  no3: number[];
  /** Carbonate hardness, dKH. */
  kh: number[];
  ph: number[];
  /** Dry mass per plant group, g. */
  plants: { id: string; name: string; massG: number[] }[];
  /** Ammonia-oxidiser biomass, mg N. */
  aob: number[];
  /** Nitrite-oxidiser biomass, mg N. */
  nob: number[];
  /** Organic N (detritus, uneaten food) in the tank, mg N. */
  organicWater: number[];
  /** Organic N trapped in the filter, mg N. */
  organicFilter: number[];
}

export interface Peak {
  /** Value in the unit of the quantity (mg N/L). */
  value: number;
  /** Day at which it occurred. */
  day: number;
}

export interface KeyFigures {
  /** Highest free NH3 (mg N/L) seen at any solver step or sample. */
  peakFreeNh3: Peak;
  /** Highest TAN (mg N/L). */
  peakTan: Peak;
  /** Highest nitrite-N (mg N/L). */
  peakNitrite: Peak;
  /** Nitrate-N at the end (mg N/L). */
  nitrateEnd: number;
  /** Highest nitrate-N (mg N/L). */
  peakNitrate: Peak;
  /** Nitrate-N just before the last water change (mg N/L), or null without water changes. */
  nitrateBeforeLastWaterChange: number | null;
  /** Days with nitrate-N above the target band's top (linear between samples). */
  daysAboveNitrateTarget: number;
  /** Days with nitrate-N below the target band's bottom. */
  daysBelowNitrateTarget: number;
  /**
   * Whether the run shows a cycle: TAN or nitrite-N reached 0.5 mg N/L at some sample.
   */
  cycleSeen: boolean;
  /**
   * Day cycling finished: the first sampled time, after TAN or nitrite-N has reached
   * 0.5 mg N/L, at which TAN and nitrite-N are both below 0.1 mg N/L. Null if no cycle was seen
   * or the cycle had not finished by the end. With fishless dosing the "just before a dose"
   * samples make this the first day a dose was cleared within one dosing interval.
   */
  cyclingFinishedDay: number | null;
  /** Dry mass trimmed out over the run, g (all groups). */
  plantsTrimmedG: number;
}

export interface SimulationStats {
  /** Solver steps (accepted and rejected). */
  steps: number;
  /** Right-hand-side evaluations. */
  rhsEvals: number;
  /** Rejected steps. */
  rejected: number;
  /** Integration segments (gaps between events). */
  segments: number;
  /** Wall time of the run (ms). The only field that is not deterministic. */
  wallMs: number;
}

export interface SimulationResult {
  engineVersion: string;
  series: Series;
  events: EventRecord[];
  budget: NitrogenBudget;
  keyFigures: KeyFigures;
  stats: SimulationStats;
}

const now = (): number => (typeof performance !== "undefined" ? performance.now() : Date.now());

/**
 * Round to 6 significant figures (prints as a short decimal in JSON). Magnitudes below 1e-15
 * become 0: far below anything measurable, and it keeps the powers of ten exact.
 */
export function round6(x: number): number {
  if (!Number.isFinite(x)) return x;
  if (Math.abs(x) < 1e-15) return 0;
  const e = Math.floor(Math.log10(Math.abs(x)));
  const k = 5 - e;
  if (k >= 0) {
    const f = 10 ** k;
    return Math.round(x * f) / f;
  }
  const f = 10 ** -k;
  return Math.round(x / f) * f;
}

const nonNeg = (x: number) => (x > 0 ? round6(x) : 0);
/** Days are rounded to 1e-6 day (0.09 s) rather than to significant figures. */
const roundDay = (t: number) => Math.round(t * 1e6) / 1e6;
const pct = (f: number) => `${Math.round(f * 100)} %`;
const mg = (x: number) => `${x >= 100 ? Math.round(x) : Number(x.toPrecision(3))} mg N`;

/**
 * Run the nitrogen model.
 *
 * @param scenario A validated scenario (canonical units; see ScenarioSchema). It is checked
 *   again here and never modified.
 * @returns series (mg N/L, dKH, g, mg N over days), events, the nitrogen budget (mg N),
 *   key figures and solver statistics.
 * @throws ModelError INVALID for a scenario that fails the schema; MAX_STEPS, WALL_TIME or
 *   NON_FINITE when the numbers cannot be resolved, with a message a keeper can act on.
 */
export function simulate(scenario: Scenario, options: SimulateOptions = {}): SimulationResult {
  const started = now();
  const parsed = ScenarioSchema.safeParse(scenario);
  if (!parsed.success) {
    const lines = describeScenarioIssues(parsed.error);
    throw new ModelError("INVALID", `The scenario has settings the model cannot use: ${lines.join("; ")}`, {
      detail: lines,
    });
  }
  const s = parsed.data;
  const outputInterval = options.outputIntervalDays ?? s.run.outputIntervalDays;
  if (!(outputInterval >= 1 / 24 - 1e-12 && outputInterval <= 7)) {
    throw new ModelError("INVALID", "The chart spacing must be between one hour (1/24 day) and 7 days.");
  }
  const c = deriveConstants(s);
  const tEnd = s.run.lengthDays;
  const np = c.plantCount;
  const V = c.volumeL;
  const y0 = initialState(s, c);
  const problem: OdeProblem = {
    dim: PLANT0 + np,
    names: [...STATE_NAMES, ...s.plants.map((g) => `plants "${g.name}" (g)`)],
    rhs: makeRhs(c),
    absoluteTolerance: absoluteTolerances(c),
    relativeTolerance: 1e-6,
  };
  const flows = emptyFlows(np);
  const trimmedG = new Array<number>(np).fill(0);

  // --- series and running key figures ---
  const series: Series = {
    t: [],
    tan: [],
    nh3: [],
    no2: [],
    no3: [],
    kh: [],
    ph: [],
    plants: s.plants.map((g) => ({ id: g.id, name: g.name, massG: [] })),
    aob: [],
    nob: [],
    organicWater: [],
    organicFilter: [],
  };
  const peaks = {
    nh3: { value: 0, day: 0 },
    tan: { value: 0, day: 0 },
    no2: { value: 0, day: 0 },
    no3: { value: 0, day: 0 },
  };
  const track = (t: number, y: readonly number[]) => {
    const tan = y[IX.tan];
    const nh3 = tan * fnh3At(c, y[IX.kh]);
    if (nh3 > peaks.nh3.value) peaks.nh3 = { value: nh3, day: t };
    if (tan > peaks.tan.value) peaks.tan = { value: tan, day: t };
    if (y[IX.no2] > peaks.no2.value) peaks.no2 = { value: y[IX.no2], day: t };
    if (y[IX.no3] > peaks.no3.value) peaks.no3 = { value: y[IX.no3], day: t };
  };
  const sample = (t: number, y: readonly number[]) => {
    track(t, y);
    const kh = y[IX.kh];
    series.t.push(roundDay(t));
    series.tan.push(nonNeg(y[IX.tan]));
    series.nh3.push(nonNeg(y[IX.tan] * fnh3At(c, kh)));
    series.no2.push(nonNeg(y[IX.no2]));
    series.no3.push(nonNeg(y[IX.no3]));
    series.kh.push(nonNeg(kh));
    series.ph.push(round6(phAt(c, kh)));
    for (let i = 0; i < np; i++) series.plants[i].massG.push(nonNeg(y[PLANT0 + i]));
    series.aob.push(nonNeg(y[IX.aob]));
    series.nob.push(nonNeg(y[IX.nob]));
    series.organicWater.push(nonNeg(y[IX.orgW]));
    series.organicFilter.push(nonNeg(y[IX.orgF]));
  };

  // --- events ---
  const schedule: ScheduledEvent[] = [];
  let nitrateBeforeLastChange: number | null = null;

  const m = s.maintenance;
  if (m.waterChangeIntervalDays > 0 && m.waterChangeFraction > 0) {
    const f = m.waterChangeFraction;
    const g = m.gravelCleaningFraction;
    for (const t of periodicTimes(m.waterChangeIntervalDays, tEnd)) {
      schedule.push({
        t,
        order: 40,
        apply: (y) => {
          nitrateBeforeLastChange = y[IX.no3];
          const out = f * V * (y[IX.tan] + y[IX.no2] + y[IX.no3]);
          const inN = f * V * (c.changeTan + c.changeNo3);
          y[IX.tan] += f * (c.changeTan - y[IX.tan]);
          y[IX.no2] -= f * y[IX.no2];
          y[IX.no3] += f * (c.changeNo3 - y[IX.no3]);
          y[IX.kh] += f * (c.changeKh - y[IX.kh]);
          const gravel = g * y[IX.orgW];
          y[IX.orgW] -= gravel;
          flows.waterChanges += out;
          flows.tapWaterByChanges += inN;
          flows.gravelCleaning += gravel;
          const gravelText = g > 0 ? `; ${pct(g)} of the detritus siphoned (${mg(gravel)})` : "";
          return [
            {
              day: t,
              kind: "waterChange",
              detail: `${pct(f)} of the water changed: ${mg(out)} out, ${mg(inN)} in${gravelText}`,
            },
          ];
        },
      });
    }
  }

  const fl = s.filter;
  if (fl.cleaningIntervalDays > 0) {
    const share =
      BACTERIA.shareInFilter.value *
      (fl.cleanedInTapWater ? BACTERIA.killedByTapWaterRinse.value : BACTERIA.lostByTankWaterRinse.value);
    for (const t of periodicTimes(fl.cleaningIntervalDays, tEnd)) {
      schedule.push({
        t,
        order: 30,
        apply: (y) => {
          const sludge = fl.organicsRemovedFraction * y[IX.orgF];
          const bact = share * (y[IX.aob] + y[IX.nob]);
          y[IX.orgF] -= sludge;
          y[IX.aob] -= share * y[IX.aob];
          y[IX.nob] -= share * y[IX.nob];
          flows.filterCleaning += sludge + bact;
          const how = fl.cleanedInTapWater ? "rinsed in tap water" : "rinsed in tank water";
          return [
            {
              day: t,
              kind: "filterCleaning",
              detail: `Filter ${how}: ${mg(sludge)} of sludge out, ${pct(share)} of the bacteria lost`,
            },
          ];
        },
      });
    }
  }

  const trimGroup = (i: number, t: number, y: number[]): EventRecord[] => {
    const g = s.plants[i];
    const target = g.trim.trimToFraction * g.maxMassG;
    const cut = y[PLANT0 + i] - target;
    if (!(cut > 0)) return [];
    const n = cut * c.plantNmg[i];
    y[PLANT0 + i] = target;
    flows.trims += n;
    flows.trimsByGroup[i] += n;
    trimmedG[i] += cut;
    return [{ day: t, kind: "trim", detail: `${g.name}: ${Number(cut.toPrecision(3))} g dry trimmed out (${mg(n)})` }];
  };
  const watches: Watch[] = [];
  const watchGroup: number[] = [];
  s.plants.forEach((g, i) => {
    if (g.trim.rule === "everyDays") {
      for (const t of periodicTimes(g.trim.everyDays, tEnd)) {
        schedule.push({ t, order: 50 + i, apply: (y) => trimGroup(i, t, y) });
      }
    } else if (g.trim.rule === "whenFull") {
      watches.push({ index: PLANT0 + i, threshold: g.trim.fullAtFraction * g.maxMassG });
      watchGroup.push(i);
    }
  });

  const fc = s.fishlessCycling;
  if (fc.enabled && fc.doseMgNPerL > 0) {
    const clear = SCENARIO_DEFAULTS.cycling.clearThreshold.value;
    let doses = 0;
    let stopped = false;
    const last = fc.stopRule === "afterDays" ? fc.stopAfterDays : Infinity;
    for (const t of periodicTimes(fc.doseIntervalDays, tEnd, 0)) {
      if (t > last + 1e-9) break;
      schedule.push({
        t,
        order: 10,
        apply: (y) => {
          if (stopped) return [];
          if (fc.stopRule === "whenCycled" && doses > 0 && y[IX.tan] < clear && y[IX.no2] < clear) {
            stopped = true;
            return [
              {
                day: t,
                kind: "dosingStopped",
                detail: "The last dose was cleared before the next one: dosing stopped",
              },
            ];
          }
          doses++;
          y[IX.tan] += fc.doseMgNPerL;
          flows.dosing += fc.doseMgNPerL * V;
          return [
            { day: t, kind: "dose", detail: `Ammonia dosed: +${fc.doseMgNPerL} mg N/L (${mg(fc.doseMgNPerL * V)})` },
          ];
        },
      });
    }
  }

  if (c.pulsedFeeding && c.feedN > 0) {
    const meal = c.feedN / c.feedsPerDay;
    const eaten = meal * c.eatenShare;
    const uneaten = meal - eaten;
    for (const t of periodicTimes(1 / c.feedsPerDay, tEnd, 0)) {
      schedule.push({
        t,
        order: 20,
        apply: (y) => {
          flows.feed += meal;
          flows.fishGrowth += eaten * EATEN_N_SPLIT.fishGrowth;
          const intoGut = eaten * (1 - EATEN_N_SPLIT.fishGrowth);
          flows.eatenIntoGut += intoGut;
          y[IX.gut] += intoGut;
          if (c.leftoversRemoved) flows.leftoversRemoved += uneaten;
          else y[IX.orgW] += uneaten;
          return [{ day: t, kind: "feeding", detail: `Meal: ${mg(meal)} in the food` }];
        },
      });
    }
  }

  // --- run ---
  const start = stocks(c, y0);
  const loop = runLoop({
    problem,
    y0,
    tEnd,
    outputInterval,
    schedule,
    watches,
    onCrossing: (w, t, y) => trimGroup(watchGroup[w], t, y),
    sample,
    onStep: track,
    limits: {
      maxSteps: options.maxSteps ?? 200_000,
      maxStepsPerSegment: options.maxStepsPerSegment ?? 50_000,
      maxWallMs: options.maxWallMs ?? 2000,
    },
    describeFailure: (code, day) => describeFailure(s, c, code, day, options.maxWallMs ?? 2000),
  });
  const yEnd = loop.y;
  const end = stocks(c, yEnd);
  const budget = buildBudget(c, tEnd, yEnd, start, end, flows);
  if (!Number.isFinite(budget.imbalance)) {
    throw new ModelError("NON_FINITE", describeFailure(s, c, "NON_FINITE", tEnd, 0), { day: tEnd });
  }

  const keyFigures = keyFiguresFrom(series, s, peaks, nitrateBeforeLastChange, yEnd[IX.no3], trimmedG);
  return {
    engineVersion: ENGINE_VERSION,
    series,
    events: loop.events.map((e) => ({ ...e, day: roundDay(e.day) })),
    budget,
    keyFigures,
    stats: { ...loop.stats, wallMs: Math.round((now() - started) * 100) / 100 },
  };
}

function keyFiguresFrom(
  series: Series,
  s: Scenario,
  peaks: { nh3: Peak; tan: Peak; no2: Peak; no3: Peak },
  beforeLastChange: number | null,
  no3End: number,
  trimmedG: number[],
): KeyFigures {
  const hi = s.targets.nitrateHigh;
  const lo = s.targets.nitrateLow;
  const { t, no3, tan, no2 } = series;
  // Time above/below a level, linear between samples (crossings interpolated).
  const timeBeyond = (level: number, above: boolean): number => {
    let total = 0;
    for (let k = 1; k < t.length; k++) {
      const dt = t[k] - t[k - 1];
      if (dt <= 0) continue;
      const a = above ? no3[k - 1] - level : level - no3[k - 1];
      const b = above ? no3[k] - level : level - no3[k];
      if (a > 0 && b > 0) total += dt;
      else if (a > 0 || b > 0) total += (dt * Math.max(a, b)) / (Math.abs(a) + Math.abs(b));
    }
    return total;
  };
  const seen = SCENARIO_DEFAULTS.cycling.cycleSeenThreshold.value;
  const clear = SCENARIO_DEFAULTS.cycling.clearThreshold.value;
  let cycleSeen = false;
  let finished: number | null = null;
  for (let k = 0; k < t.length; k++) {
    if (tan[k] >= seen || no2[k] >= seen) cycleSeen = true;
    else if (cycleSeen && finished === null && tan[k] < clear && no2[k] < clear) finished = t[k];
  }
  const r = (p: Peak): Peak => ({ value: round6(Math.max(p.value, 0)), day: roundDay(p.day) });
  return {
    peakFreeNh3: r(peaks.nh3),
    peakTan: r(peaks.tan),
    peakNitrite: r(peaks.no2),
    peakNitrate: r(peaks.no3),
    nitrateEnd: nonNeg(no3End),
    nitrateBeforeLastWaterChange: beforeLastChange === null ? null : nonNeg(beforeLastChange),
    daysAboveNitrateTarget: round6(timeBeyond(hi, true)),
    daysBelowNitrateTarget: round6(timeBeyond(lo, false)),
    cycleSeen,
    cyclingFinishedDay: finished,
    plantsTrimmedG: round6(trimmedG.reduce((a, b) => a + b, 0)),
  };
}

/**
 * A keeper's message for a run that could not be solved: names the fastest process in the
 * scenario (the usual culprit) and the settings that drive it.
 */
function describeFailure(
  s: Scenario,
  c: TankConstants,
  code: "MAX_STEPS" | "WALL_TIME" | "NON_FINITE",
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
