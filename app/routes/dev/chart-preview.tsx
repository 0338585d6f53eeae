import { useLayoutEffect, useMemo, useRef, useState } from "react";
import type { Route } from "./+types/chart-preview";
import { BudgetBar, BudgetTable } from "~/components/charts/budget";
import { CompareChart } from "~/components/charts/compare-chart";
import { TimeSeriesChart } from "~/components/charts/time-series-chart";
import {
  chartEventKind,
  type ChartEvent,
  type ChartOverlay,
  type ChartReading,
  type ChartSeries,
  type ChartUnits,
} from "~/utils/chart-data";
import { requireLocalTool } from "~/routes/dev/local-tools.server";
import { ScenarioSchema, getPreset, plantGroupFromForm, simulate, type ScenarioInput } from "~models";

export const meta: Route.MetaFunction = () => [{ title: "Chart preview (local) · Fernwater" }];

/** mg N/L → mg/L as NO3 (14.007 / 62.004 = 0.2259), for the preview only; pages use the user's units. */
const NO3_PER_N = 1 / 0.2259;
const UNITS: ChartUnits = { ammonia: "mg N/L", nitrite: "mg N/L", nitrate: "mg/L NO3" };

function run(scenario: ScenarioInput, lengthDays: number, outputIntervalDays: number) {
  const s = ScenarioSchema.parse({ ...scenario, run: { lengthDays, outputIntervalDays } });
  const r = simulate(s, { maxWallMs: 20_000 });
  const series: ChartSeries = {
    t: r.series.t,
    tan: r.series.tan,
    nh3: r.series.nh3,
    no2: r.series.no2,
    no3: r.series.no3.map((v) => v * NO3_PER_N),
    plants: r.series.plants,
  };
  const events: ChartEvent[] = r.events.map((e) => ({ day: e.day, kind: chartEventKind(e.kind), detail: e.detail }));
  const band = { low: s.targets.nitrateLow * NO3_PER_N, high: s.targets.nitrateHigh * NO3_PER_N };
  return {
    series,
    events,
    budget: r.budget,
    band,
    plantNames: r.series.plants.map((p) => p.name),
    wallMs: r.stats.wallMs,
  };
}

/** Local mode, this machine only: the chart components on engine output, to look at and to time. */
export function loader({ request, context }: Route.LoaderArgs) {
  requireLocalTool(request, context);
  const crowded = getPreset("crowded-reach")!.scenario;
  const floating: ScenarioInput = {
    ...crowded,
    plants: [
      ...(crowded.plants ?? []),
      plantGroupFromForm("floating", { id: "float", name: "Floating carpet", startMassG: 6, maxMassG: 30 }),
    ],
  };
  const biggerChanges: ScenarioInput = {
    ...crowded,
    maintenance: { ...crowded.maintenance, waterChangeFraction: 0.6 },
  };
  const base = run(crowded, 365, 1 / 24);
  const withPlants = run(floating, 365, 1 / 24);
  const bigger = run(biggerChanges, 365, 1 / 24);
  const cycling = run(getPreset("first-light-fishless")!.scenario, 60, 0.25);
  // Made-up test readings near the model (±15 %) so the markers and residuals can be seen.
  const wobble = [1.12, 0.9, 1.05, 0.86, 1.15, 0.97];
  const readings: ChartReading[] = [20, 55, 100, 160, 230, 300].map((day, k) => {
    const i = base.series.t.findIndex((d) => d >= day);
    return { day, no3: Math.round(base.series.no3[i] * wobble[k] * 10) / 10, tan: k % 2 ? 0.1 : null };
  });
  return { base, withPlants, bigger, cycling, readings };
}

/** Guides for the preview (free NH3 0.02 mg/L as NH3 = 0.0165 mg N/L; nitrite 0.15 mg N/L). */
const cautions = { freeAmmoniaCaution: 0.02 * (14.007 / 17.031), nitriteCaution: 0.15 };

type PreviewData = Route.ComponentProps["loaderData"];

/**
 * The results chart with a what-if overlay, in its own component so that a redraw re-renders
 * only the chart (as on the results page, where the overlay comes from a fetcher).
 */
function WhatIfChart({ base, withPlants, readings }: Pick<PreviewData, "base" | "withPlants" | "readings">) {
  const [overlay, setOverlay] = useState<ChartOverlay[]>(() => [
    { label: "+ floating plants", series: withPlants.series },
  ]);
  const [timings, setTimings] = useState<number[]>([]);
  const started = useRef<number | null>(null);
  const guides = useMemo(() => ({ ...cautions, nitrateBand: base.band }), [base.band]);

  // A what-if response arrives as new arrays: copy them so no cache can help, then time the redraw.
  const fakeResponse = () => {
    const s = withPlants.series;
    const fresh: ChartSeries = {
      t: s.t.slice(),
      tan: s.tan.slice(),
      nh3: s.nh3.slice(),
      no2: s.no2.slice(),
      no3: s.no3.slice(),
      plants: s.plants.map((p) => ({ ...p, massG: p.massG.slice() })),
    };
    started.current = performance.now();
    setOverlay([{ label: "+ floating plants", series: fresh }]);
  };
  // Runs after React has committed the new chart to the DOM (before the browser paints).
  useLayoutEffect(() => {
    if (started.current == null) return;
    const ms = performance.now() - started.current;
    started.current = null;
    setTimings((old) => [...old.slice(-11), ms]);
  }, [overlay]);

  return (
    <>
      <div className="flex flex-wrap items-center gap-3 text-sm">
        <button type="button" className="btn-secondary" onClick={fakeResponse} data-testid="what-if">
          Redraw with a fresh what-if response
        </button>
        <output className="figure" data-testid="redraw-ms">
          {timings.length ? `last redraws: ${timings.map((t) => t.toFixed(1)).join(", ")} ms` : "no redraw timed yet"}
        </output>
      </div>
      <TimeSeriesChart
        title="Crowded Reach, one year"
        series={base.series}
        units={UNITS}
        seriesLabel="Saved"
        events={base.events}
        guides={guides}
        overlays={overlay}
        readings={readings}
      />
    </>
  );
}

export default function ChartPreviewPage({ loaderData }: Route.ComponentProps) {
  const { base, withPlants, bigger, cycling, readings } = loaderData;
  const guides = { ...cautions, nitrateBand: base.band };
  return (
    <div className="space-y-10">
      <header className="space-y-2">
        <h1 className="text-2xl">Chart preview</h1>
        <p className="text-sm text-stone-700">
          Local mode only. The chart components on engine output: “Crowded Reach” for a year at hourly output (
          {base.series.t.length} samples per series), a variant with a floating plant group as an overlay, and a new
          tank cycling. Test readings here are made up.
        </p>
      </header>

      <section className="space-y-3" aria-labelledby="ts-heading">
        <h2 id="ts-heading" className="text-xl">
          Results chart
        </h2>
        <WhatIfChart base={base} withPlants={withPlants} readings={readings} />
      </section>

      <section className="space-y-4" aria-labelledby="budget-heading">
        <h2 id="budget-heading" className="text-xl">
          Nitrogen budget
        </h2>
        <BudgetBar budget={base.budget} plantNames={base.plantNames} />
        <BudgetTable budgets={[{ label: "Crowded Reach", budget: base.budget, plantNames: base.plantNames }]} />
      </section>

      <section className="space-y-4" aria-labelledby="compare-heading">
        <h2 id="compare-heading" className="text-xl">
          Compare
        </h2>
        <CompareChart
          title="Crowded Reach: three ways"
          runs={[
            { label: "Baseline", series: base.series },
            { label: "+ floating plants", series: withPlants.series },
            { label: "60 % water changes", series: bigger.series },
          ]}
          units={UNITS}
          events={base.events}
          guides={guides}
        />
        <BudgetBar
          budget={withPlants.budget}
          plantNames={withPlants.plantNames}
          title="Where the nitrogen went: + floating plants"
        />
        <BudgetTable
          budgets={[
            { label: "Baseline", budget: base.budget, plantNames: base.plantNames },
            { label: "+ floating plants", budget: withPlants.budget, plantNames: withPlants.plantNames },
            { label: "60 % water changes", budget: bigger.budget, plantNames: bigger.plantNames },
          ]}
        />
      </section>

      <section className="space-y-3" aria-labelledby="cycling-heading">
        <h2 id="cycling-heading" className="text-xl">
          A new tank cycling
        </h2>
        <TimeSeriesChart
          title="First Light, 60 days"
          series={cycling.series}
          units={UNITS}
          events={cycling.events}
          guides={{ ...cautions, nitrateBand: cycling.band }}
          height={300}
        />
      </section>
    </div>
  );
}
