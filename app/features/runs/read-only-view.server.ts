/**
 * A read-only view of one scenario for someone who may look but not change it: the public
 * share page, an admin reviewing a link, an educator opening a student's lesson copy. It
 * reuses the stored run (ensureRun runs the engine only if the settings or engine changed).
 */
import type { Scenario } from "~models";
import { packedResultsPayload, resultsPayload } from "~/features/runs/results.server";
import { buildScenarioForm } from "~/features/scenarios/scenario-form.server";
import { ensureRun, readStoredSettings, withTankTargets } from "~/features/runs/simulation.server";
import { runProblem } from "~/http/pages.server";
import type { ScenarioRow } from "~/features/tanks/tanks.server";
import type { DisplayUnits } from "~/utils/display-units";
import { formatNumber } from "~/utils/display-units";
import type { ReadOnlyView } from "~/features/runs/results-payload";
export type { ReadOnlyView } from "~/features/runs/results-payload";

const views = new Map<string, ReadOnlyView>();
const VIEW_CACHE_SIZE = 64;

/**
 * The view in `units`. Kept per scenario version (updatedAt), band and units, so a link posted
 * to a busy forum thread builds its page data once; a save of the scenario or tank makes a new key.
 */
export async function readOnlyScenarioView(
  scenario: Pick<ScenarioRow, "id" | "name" | "settings" | "updatedAt">,
  band: { nitrateTargetLow: number; nitrateTargetHigh: number; ownerId: number },
  units: DisplayUnits,
): Promise<ReadOnlyView> {
  const key = [
    scenario.id,
    scenario.updatedAt.getTime(),
    band.nitrateTargetLow,
    band.nitrateTargetHigh,
    ...Object.values(units),
  ].join("|");
  const hit = views.get(key);
  if (hit) return hit;
  const view = await buildView(scenario, band, units);
  if (view.results) {
    if (views.size >= VIEW_CACHE_SIZE) views.delete(views.keys().next().value!);
    views.set(key, view);
  }
  return view;
}

async function buildView(
  scenario: Pick<ScenarioRow, "id" | "name" | "settings">,
  band: { nitrateTargetLow: number; nitrateTargetHigh: number; ownerId: number },
  units: DisplayUnits,
): Promise<ReadOnlyView> {
  const ownerId = band.ownerId;
  const settings = readStoredSettings(scenario.settings);
  if (!settings)
    return { error: "The saved settings of this scenario can no longer be read.", results: null, settings: null };
  const withTargets: Scenario = withTankTargets(settings, band);
  const form = buildScenarioForm(scenario.name, withTargets, units);
  try {
    const run = await ensureRun(scenario.id, withTargets, ownerId);
    // Series packed into strings, as on the owner's results page: much cheaper to send.
    return { error: null, results: packedResultsPayload(resultsPayload(run, withTargets, units)), settings: form };
  } catch (error) {
    const problem = runProblem(error);
    if (problem) return { error: problem, results: null, settings: form };
    throw error;
  }
}

/** One sentence for a page description or a forum preview, in the view's units. */
export function describeView(view: ReadOnlyView): string {
  const r = view.results;
  if (!r) return "A nitrogen-cycle scenario for a freshwater aquarium, simulated with Fernwater.";
  const k = r.keyFigures;
  return (
    `Simulated nitrogen over ${r.lengthDays} days: nitrate ends at ${formatNumber(k.nitrateEnd)} ${r.labels.nitrate}, ` +
    `free ammonia peaks at ${formatNumber(k.peakFreeNh3.value)} ${r.labels.ammonia}, ` +
    `nitrite at ${formatNumber(k.peakNitrite.value)} ${r.labels.nitrite}. A model, not a water test.`
  );
}
