import { useCallback, useMemo, useState } from "react";
import { Form, Link, redirect } from "react-router";
import type { Route } from "./+types/results";
import { BudgetBar, BudgetTable } from "~/components/charts/budget";
import { TimeSeriesChart } from "~/components/charts/time-series-chart";
import { CautionsPanel } from "~/components/cautions";
import { KeyFiguresList } from "~/components/key-figures";
import { RunWarnings } from "~/components/run-warnings";
import { FormMessage } from "~/components/ui/field";
import { WhatIfPanel, type WhatIfPreview } from "~/components/what-if-panel";
import { WhatIfSummary } from "~/components/what-if-summary";
import { WhatIfBeforeScript } from "~/components/what-if-before-script";
import { useHydrated } from "~/utils/use-hydrated";
import { requireUser } from "~/permissions.server";
import { modelStartMs, readingsForChart } from "~/features/readings/readings.server";
import { packedResultsPayload, resultsPayload } from "~/features/runs/results.server";
import { saveScenarioVariant } from "~/features/scenarios/scenario-variant.server";
import { ensureRun, readStoredSettings, withTankTargets } from "~/features/runs/simulation.server";
import { refusedForm, runProblem } from "~/http/pages.server";
import { requireOwnedScenario } from "~/features/tanks/tanks.server";
import { displayUnitsFor, formatNumber } from "~/utils/display-units";
import { formValues } from "~/utils/form-errors";
import { unpackSeries } from "~/features/runs/series-packing";
import { invalid, readForm } from "~/http/pages.server";
import { applyWhatIf, whatIfBase, whatIfSettings, WhatIfSchema } from "~/features/runs/what-if.server";
import { ScenarioNameSchema } from "~/features/scenarios/scenario-setup.server";
import { Breadcrumbs } from "~/components/breadcrumbs";

export const meta: Route.MetaFunction = ({ data }) => [
  { title: `${data?.scenario.name ?? "Results"} · ${data?.tank.name ?? ""} · Fernwater` },
];

// Rendered from its loader data alone (no clock, no randomness): a repeat view may reuse the rendering (app/http/render-cache.server.ts).
export const handle = { renderCache: true };

export async function loader({ request, params }: Route.LoaderArgs) {
  const user = await requireUser(request);
  const { tank, scenario } = requireOwnedScenario(user.id, params.tankId, params.scenarioId);
  const base = { tank: { id: tank.id, name: tank.name }, scenario: { id: scenario.id, name: scenario.name } };
  const settings = readStoredSettings(scenario.settings);
  if (!settings)
    return {
      ...base,
      error: "The saved settings of this scenario can no longer be read.",
      results: null,
      whatIf: null,
      readings: [],
      readingsTotal: 0,
    };
  const withTargets = withTankTargets(settings, tank);
  const units = displayUnitsFor(user);
  try {
    const run = await ensureRun(scenario.id, withTargets, user.id);
    const chart = readingsForChart(tank.id, modelStartMs(scenario), withTargets.run.lengthDays, units);
    return {
      ...base,
      error: null,
      results: packedResultsPayload(resultsPayload(run, withTargets, units)),
      runCsvHref: `/api/runs/${run.id}?format=csv`,
      // The chart draws at most MAX_CHART_READINGS of them (an even sample); the page says how many.
      readings: chart.points,
      readingsTotal: chart.total,
      whatIf: {
        base: whatIfBase(withTargets),
        hasPlants: withTargets.plants.length > 0,
        settings: whatIfSettings(),
        units,
      },
    };
  } catch (error) {
    const problem = runProblem(error);
    if (problem) return { ...base, error: problem, results: null, whatIf: null, readings: [], readingsTotal: 0 };
    throw error;
  }
}

export async function action({ request, params }: Route.ActionArgs) {
  const user = await requireUser(request);
  const { tank, scenario } = requireOwnedScenario(user.id, params.tankId, params.scenarioId);
  const values = formValues(await readForm(request));
  if (values.intent !== "save-what-if") return invalid({ "": "Unknown action." }, values);
  const name = ScenarioNameSchema.safeParse(values.name);
  const changes = WhatIfSchema.safeParse(
    Object.fromEntries(
      ["feedGPerDay", "waterChangeFraction", "waterChangeIntervalDays", "plantMassFactor", "tapNitrate"]
        .filter((k) => values[k] !== undefined && values[k] !== "")
        .map((k) => [k, Number(values[k])]),
    ),
  );
  if (!name.success) return invalid({ name: name.error.issues[0].message }, values);
  if (!changes.success) return invalid({ "": "Those what-if values are out of range." }, values);
  const saved = readStoredSettings(scenario.settings);
  if (!saved) return invalid({ "": "The saved settings of this scenario can no longer be read." }, values);
  try {
    // Only the levers the person moved change; every other setting, and the start date (so
    // readings still line up), stay exactly as saved.
    const startMs = scenario.startDate?.getTime() ?? null;
    const id = await saveScenarioVariant(tank, scenario.id, startMs, name.data, applyWhatIf(saved, changes.data));
    return redirect(`/tanks/${tank.id}/scenarios/${id}`);
  } catch (error) {
    return refusedForm(error, values);
  }
}

export default function ResultsPage({ loaderData, actionData }: Route.ComponentProps) {
  const { tank, scenario, results, error, whatIf } = loaderData;
  const [preview, setPreview] = useState<WhatIfPreview | null>(null);
  // The what-if panel is the script's, like the chart: the server sends a stand-in (decision 0012).
  const hydrated = useHydrated();
  const series = useMemo(() => (results ? unpackSeries(results.packedSeries) : null), [results]);
  const onPreview = useCallback((p: WhatIfPreview | null) => setPreview(p), []);
  // Stable identities, so the chart and budget only redraw what changed.
  const overlays = useMemo(() => (preview ? [{ label: "What if", series: preview.series }] : undefined), [preview]);
  const plantNames = useMemo(() => series?.plants.map((p) => p.name) ?? [], [series]);
  const budgets = useMemo(
    () => (results ? [{ label: scenario.name, budget: results.budget, plantNames }] : []),
    [results, scenario.name, plantNames],
  );
  const base = `/tanks/${tank.id}/scenarios/${scenario.id}`;
  return (
    <div className="space-y-6">
      <Breadcrumbs
        trail={[
          { to: "/tanks", label: "Tanks" },
          { to: `/tanks/${tank.id}`, label: tank.name },
        ]}
        current={scenario.name}
      />
      <div className="flex flex-wrap items-center justify-between gap-3">
        <h1 className="text-2xl">{scenario.name}</h1>
        <div className="flex flex-wrap gap-2">
          <Link to={`${base}/edit`} className="btn-secondary">
            Edit settings
          </Link>
          <a href={`${base}/export`} className="btn-secondary" download>
            Export scenario file
          </a>
          <Link to={`${base}/share`} className="btn-secondary">
            Share
          </Link>
        </div>
      </div>
      {error ? (
        <FormMessage>
          {error}{" "}
          <Link to={`${base}/edit`} className="link">
            Change the settings
          </Link>
        </FormMessage>
      ) : null}
      {actionData?.errors[""] ? <FormMessage>{actionData.errors[""]}</FormMessage> : null}
      {actionData?.errors.name ? <FormMessage>{actionData.errors.name}</FormMessage> : null}
      {results && series ? (
        <>
          <section aria-labelledby="figures-title" className="space-y-2">
            <h2 id="figures-title" className="sr-only">
              Key figures
            </h2>
            <KeyFiguresList
              figures={results.keyFigures}
              units={results.labels}
              flagged={results.warnings.map((w) => w.figure)}
            />
          </section>
          <RunWarnings warnings={results.warnings} />
          <TimeSeriesChart
            title={`${scenario.name}: nitrogen over ${results.lengthDays} days`}
            series={series}
            seriesLabel="Saved"
            units={results.labels}
            events={results.events}
            guides={results.guides}
            overlays={overlays}
            readings={loaderData.readings}
            downloadName={`${tank.name}-${scenario.name}`}
            csvHref={loaderData.runCsvHref}
          />
          <p className="text-sm text-stone-700">
            {loaderData.readings.length === loaderData.readingsTotal
              ? loaderData.readings.length
                ? `${loaderData.readings.length} test readings are drawn as points over the curves. `
                : "No test readings fall within this run. "
              : `${loaderData.readings.length} of the ${loaderData.readingsTotal.toLocaleString("en")} test readings in this run are drawn as points over the curves, evenly spread over time (the readings page lists them all). `}
            <Link to={`/tanks/${tank.id}/readings`} className="link">
              Readings
            </Link>{" "}
            ·{" "}
            <Link to={`${base}/calibrate`} className="link">
              Calibrate against them
            </Link>{" "}
            ·{" "}
            <Link to={`${base}/sweep`} className="link">
              Sweep a setting
            </Link>{" "}
            ·{" "}
            <Link to={`${base}/target`} className="link">
              Find the change that meets a goal
            </Link>
          </p>
          {!whatIf ? null : !hydrated ? (
            <WhatIfBeforeScript editHref={`${base}/edit`} />
          ) : (
            <div className="grid items-start gap-4 lg:grid-cols-[1fr_17rem]">
              <WhatIfPanel
                // A new scenario (saved from here) starts with fresh sliders and name.
                key={scenario.id}
                scenarioId={scenario.id}
                scenarioName={scenario.name}
                base={whatIf.base}
                hasPlants={whatIf.hasPlants}
                settings={whatIf.settings}
                units={whatIf.units}
                onPreview={onPreview}
              />
              <WhatIfSummary
                saved={results.keyFigures}
                preview={preview?.keyFigures ?? null}
                labels={results.labels}
                warnings={preview ? preview.warnings : results.warnings}
              />
            </div>
          )}
          <section aria-labelledby="budget-title" className="card space-y-4">
            <h2 id="budget-title" className="text-lg">
              Nitrogen budget
            </h2>
            <BudgetBar budget={results.budget} plantNames={plantNames} />
            <BudgetTable budgets={budgets} />
          </section>
          <CautionsPanel
            tapNitrateAboveDrinkingLimit={results.tapNitrateAboveDrinkingLimit}
            tapNitrateText={`${formatNumber(results.tapNitrateDisplay)} ${results.labels.nitrate}`}
            limitText={`${formatNumber(results.tapNitrateLimitDisplay)} ${results.labels.nitrate}`}
          />
          <p className="text-xs text-stone-500">
            {results.engineVersion}: {results.stats.steps} solver steps, {results.stats.rhsEvals} evaluations,{" "}
            {results.stats.wallMs} ms.
          </p>
          <Form method="post" action={`/tanks/${tank.id}`} className="flex flex-wrap items-center gap-3 text-sm">
            <input type="hidden" name="intent" value="delete-scenario" />
            <input type="hidden" name="scenarioId" value={scenario.id} />
            <label className="flex items-center gap-2">
              <input type="checkbox" name="confirm" value="yes" className="h-4 w-4 accent-red-700" /> Yes, delete this
              scenario
            </label>
            <button type="submit" className="btn-danger py-1">
              Delete scenario
            </button>
          </Form>
        </>
      ) : null}
    </div>
  );
}
