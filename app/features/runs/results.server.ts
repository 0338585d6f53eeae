/**
 * Everything a results view draws for one run, in the viewer's units. Shared by the owner's
 * results page, the public share page and the classroom views, so they all show the same.
 */
import type { NitrogenBudget, Scenario } from "~models";
import { displayKeyFigures } from "~/features/runs/display-figures";
import { runChart } from "~/features/runs/run-chart";
import { speciesFactor, toCanonical } from "~models/units";
import { resultWarnings } from "~/features/runs/run-warnings";
import type { StoredRun } from "~/features/runs/simulation.server";
import type { DisplayUnits } from "~/utils/display-units";
import { packSeries } from "~/features/runs/series-packing";
import type { PackedResultsPayload, ResultsPayload } from "~/features/runs/results-payload";
export type { ResultsPayload } from "~/features/runs/results-payload";

/** WHO Guidelines for Drinking-water Quality: nitrate 50 mg/L as NO3 = 11.29 mg/L as N. */
export const DRINKING_WATER_NITRATE_MG_N = toCanonical("nitrate", 50, "asNO3");

// Runs never change once stored, and the scenario a run belongs to is fixed by its settings
// hash: the converted payload can be kept per run and viewer units.
const payloads = new Map<string, ResultsPayload>();
const PAYLOAD_CACHE_SIZE = 64;

/** Everything a results view draws, in `units`; cached per run, settings and units. */
export function resultsPayload(run: StoredRun, scenario: Scenario, units: DisplayUnits) {
  const key = `${run.id}|${run.settingsHash}|${units.volume}|${units.temperature}|${units.nitrate}|${units.nitrite}|${units.ammonia}|${units.kh}`;
  const hit = payloads.get(key);
  if (hit) return hit;
  const payload = buildPayload(run, scenario, units);
  if (payloads.size >= PAYLOAD_CACHE_SIZE) payloads.delete(payloads.keys().next().value!);
  payloads.set(key, payload);
  return payload;
}

function buildPayload(run: StoredRun, scenario: Scenario, units: DisplayUnits): ResultsPayload {
  const { labels, series, events, guides } = runChart(run, scenario, units);
  return {
    runId: run.id,
    labels,
    series,
    events,
    guides,
    keyFigures: displayKeyFigures(run.keyFigures, units),
    budget: run.budget as NitrogenBudget,
    stats: { steps: run.stats.steps, rhsEvals: run.stats.rhsEvals, wallMs: Math.round(run.stats.wallMs * 10) / 10 },
    engineVersion: run.engineVersion,
    tapNitrateAboveDrinkingLimit: scenario.tapWater.nitrate > DRINKING_WATER_NITRATE_MG_N,
    tapNitrateDisplay: scenario.tapWater.nitrate * speciesFactor("nitrate", units),
    tapNitrateLimitDisplay: DRINKING_WATER_NITRATE_MG_N * speciesFactor("nitrate", units),
    lengthDays: scenario.run.lengthDays,
    warnings: resultWarnings(
      {
        keyFigures: run.keyFigures,
        warnings: run.findings.warnings,
        tapWater: scenario.tapWater,
        volumeL: scenario.water.volumeL,
      },
      units,
    ),
  };
}

const packed = new WeakMap<ResultsPayload, PackedResultsPayload>();

/**
 * The payload with its series packed into strings (app/features/runs/series-packing.ts) for the
 * busiest page, the owner's results: far cheaper to send. Cached with the payload.
 */
export function packedResultsPayload(payload: ResultsPayload): PackedResultsPayload {
  let hit = packed.get(payload);
  if (!hit) {
    const { series, ...rest } = payload;
    hit = { ...rest, packedSeries: packSeries(series) };
    packed.set(payload, hit);
  }
  return hit;
}
