/**
 * What a keeper gets before changing anything: a 100 L planted community tank.
 */
import { p } from "./sourced";

/** 5 and 20 mg/L as NO3⁻ expressed as N (× 0.22590, computed). */
const NO3_AS_N = 0.2259;

export const SCENARIO_DEFAULTS = {
  water: {
    volumeL: p(100, "L", "common practice, no source"),
    temperatureC: p(25, "°C", "common practice, no source"),
    pH: p(7.2, "pH", "common practice, no source"),
    khDkh: p(4, "dKH", "common practice, no source"),
    startTan: p(0, "mg N/L", "common practice, no source"),
    startNitrite: p(0, "mg N/L", "common practice, no source"),
    startNitrate: p(10 * NO3_AS_N, "mg N/L", "common practice, no source (10 mg/L as NO3)"),
  },
  fish: {
    feedGPerDay: p(0.4, "g/day", "common practice, no source (a modestly stocked 100 L tank)"),
    proteinFraction: p(0.45, "fraction", "common practice, no source (flake food label)"),
    feedsPerDay: p(2, "count", "common practice, no source"),
    fractionEaten: p(0.9, "fraction", "common practice, no source"),
  },
  filter: {
    /** About 0.5 m² of colonised media at the Zhu & Chen rate of 0.59 g TAN/m²/day at 1 mg/L. */
    capacityMgTanPerDay: p(300, "mg TAN-N/day", "Zhu & Chen (1999), 0.5 m² of media"),
    cleaningIntervalDays: p(30, "days", "common practice, no source"),
    organicsRemovedFraction: p(0.5, "fraction", "common practice, no source"),
    turnoverPerHour: p(4, "tank volumes per hour", "common practice, no source"),
  },
  maintenance: {
    waterChangeIntervalDays: p(7, "days", "common practice, no source"),
    waterChangeFraction: p(0.25, "fraction", "common practice, no source"),
    gravelCleaningFraction: p(0.2, "fraction", "common practice, no source"),
    dripLPerDay: p(0, "L/day", "common practice, no source"),
  },
  tapWater: {
    nitrate: p(5 * NO3_AS_N, "mg N/L", "common practice, no source (5 mg/L as NO3)"),
    tan: p(0, "mg N/L", "common practice, no source"),
    khDkh: p(5, "dKH", "common practice, no source"),
    roShare: p(0, "fraction", "common practice, no source"),
  },
  lowOxygen: {
    denitrificationCapacityMgNPerDay: p(
      20,
      "mg N/day",
      "model choice, no source (no published rate for porous media; docs/sources.md §8)",
    ),
    anammoxCapacityMgNPerDay: p(5, "mg NH4-N/day", "model choice, no source"),
    porousRockL: p(2, "L", "common practice, no source"),
    sandBedAreaM2: p(0.25, "m²", "common practice, no source (the floor of an 80 × 30 cm tank)"),
    sandBedDepthCm: p(5, "cm", "common practice, no source"),
  },
  run: {
    lengthDays: p(180, "days", "common practice, no source"),
    outputIntervalDays: p(1, "days", "common practice, no source"),
  },
  fishlessCycling: {
    /** 2 mg/L of "ammonia" on a kit reading as NH4⁺ is about 1.5 mg N/L. */
    doseMgNPerL: p(1.5, "mg N/L per dose", "common practice, no source"),
    doseIntervalDays: p(1, "days", "common practice, no source"),
    stopAfterDays: p(42, "days", "common practice, no source"),
  },
  targets: {
    nitrateLow: p(5 * NO3_AS_N, "mg N/L", "common practice, no source (5 mg/L as NO3, docs/sources.md §9)"),
    nitrateHigh: p(20 * NO3_AS_N, "mg N/L", "common practice, no source (20 mg/L as NO3, docs/sources.md §9)"),
  },
  cycling: {
    /** TAN and nitrite-N both below this count as "processed". */
    clearThreshold: p(0.1, "mg N/L", "common practice, no source"),
    /** TAN or nitrite-N at or above this means the tank went through a cycle. */
    cycleSeenThreshold: p(0.5, "mg N/L", "common practice, no source"),
  },
} as const;
