import { and, eq } from "drizzle-orm";
import type { Route } from "./+types/run";
import { apiError, apiRoute, json, methodNotAllowed } from "~/http/api.server";
import { toCsv, type CsvCell } from "~/utils/csv";
import { getDb } from "~/db/client.server";
import { runs, scenarios, tanks } from "~/db/schema";
import { requireApiUser } from "~/permissions.server";
import { runSummaryJson } from "~/features/scenarios/scenario-api.server";
import {
  getRun,
  readStoredSettings,
  settingsHash,
  withTankTargets,
  type StoredRun,
} from "~/features/runs/simulation.server";
import { tanCriterionLines, type TanCriterionLines } from "~/features/runs/criterion-line";
import { requireOwnedScenarioById } from "~/features/tanks/tanks.server";

/**
 * The run's series in canonical units, one row per sample (both samples of each event), with
 * the two TAN caution lines the chart draws when they are known (`criteria`).
 */
function runCsv(run: StoredRun, criteria: TanCriterionLines | null): string {
  const s = run.series;
  const header: CsvCell[] = [
    "day",
    "tan_mg_n_per_l",
    "free_nh3_mg_n_per_l",
    "nitrite_mg_n_per_l",
    "nitrate_mg_n_per_l",
    "kh_dkh",
    "ph",
    ...s.plants.map((p) => `plants_${p.id}_g_dry`),
    "ammonia_oxidisers_mg_n",
    "nitrite_oxidisers_mg_n",
    "organic_n_water_mg_n",
    "organic_n_filter_mg_n",
    "oxygen_mg_o2_per_l",
    ...(criteria ? ["tan_long_term_limit_mg_n_per_l", "tan_short_term_criterion_mg_n_per_l"] : []),
  ];
  const rows: CsvCell[][] = [header];
  for (let i = 0; i < s.t.length; i++) {
    rows.push([
      s.t[i],
      s.tan[i],
      s.nh3[i],
      s.no2[i],
      s.no3[i],
      s.kh[i],
      s.ph[i],
      ...s.plants.map((p) => p.massG[i]),
      s.aob[i],
      s.nob[i],
      s.organicWater[i],
      s.organicFilter[i],
      s.o2[i],
      ...(criteria ? [criteria.longTerm[i], criteria.shortTerm[i]] : []),
    ]);
  }
  return toCsv(rows);
}

/** GET /api/runs/:runId — the whole run as JSON; `?format=csv` for the series as CSV. */
export const loader = apiRoute(async ({ request, params }: Route.LoaderArgs) => {
  const user = await requireApiUser(request);
  const runId = /^\d{1,12}$/.test(params.runId ?? "") ? Number(params.runId) : 0;
  const owned = getDb()
    .select({ id: runs.id, scenarioId: runs.scenarioId })
    .from(runs)
    .innerJoin(scenarios, eq(scenarios.id, runs.scenarioId))
    .innerJoin(tanks, eq(tanks.id, scenarios.tankId))
    .where(and(eq(runs.id, runId), eq(tanks.ownerId, user.id)))
    .get();
  const run = owned ? getRun(owned.id) : null;
  if (!run) return apiError(404, "There is no such run among yours.");
  const format = new URL(request.url).searchParams.get("format") ?? "json";
  if (format === "csv") {
    return new Response(runCsv(run, criteriaOf(run, user.id, owned!.scenarioId)), {
      headers: {
        "Content-Type": "text/csv; charset=utf-8",
        "Content-Disposition": `attachment; filename="fernwater-run-${run.id}.csv"`,
        "Cache-Control": "private, max-age=3600",
      },
    });
  }
  if (format !== "json")
    return apiError(400, "format must be json or csv.", [{ path: "format", message: "Use json or csv." }]);
  return json({ run: { ...runSummaryJson(run), series: run.series } });
});

/**
 * The TAN caution lines at each sample's pH and the run's temperature, as the results chart
 * draws them. The temperature is the scenario's: known only while its settings are still the
 * ones the run was made from (an older run of since-edited settings goes without the two columns).
 */
function criteriaOf(run: StoredRun, userId: number, scenarioId: number): TanCriterionLines | null {
  const { tank, scenario } = requireOwnedScenarioById(userId, String(scenarioId));
  const settings = readStoredSettings(scenario.settings);
  // Runs are stored under the settings' hash with the tank's nitrate targets or, when made on saving, without.
  const madeFrom =
    settings && [settings, withTankTargets(settings, tank)].some((s) => settingsHash(s) === run.settingsHash);
  return madeFrom ? tanCriterionLines(run.series, settings.water.pH, settings.water.temperatureC) : null;
}

/** A run is read-only. Any other method: 405 in the API's JSON shape. */
export function action() {
  return methodNotAllowed(["GET"]);
}
