import { useMemo } from "react";
import { BudgetBar, BudgetTable } from "~/components/charts/budget";
import { TimeSeriesChart } from "~/components/charts/time-series-chart";
import { CautionsPanel } from "~/components/cautions";
import { KeyFiguresList } from "~/components/key-figures";
import { RunWarnings } from "~/components/run-warnings";
import { SettingsSummary } from "~/components/settings-summary";
import { FormMessage } from "~/components/ui/field";
import type { ReadOnlyView } from "~/features/runs/results-payload";
import { formatNumber } from "~/utils/display-units";
import { unpackSeries } from "~/features/runs/series-packing";

/**
 * A scenario's results for someone who may look but not change them (share page, admin review,
 * an educator opening a student's copy): key figures, chart, budget, settings and cautions.
 */
export function ReadOnlyResults({
  name,
  view,
  downloadName,
  showSettings = true,
}: {
  name: string;
  view: ReadOnlyView;
  downloadName: string;
  /** False where the settings are already on the page (a student's form). */
  showSettings?: boolean;
}) {
  const { results, settings, error } = view;
  const series = useMemo(() => (results ? unpackSeries(results.packedSeries) : null), [results]);
  const plantNames = useMemo(() => series?.plants.map((p) => p.name) ?? [], [series]);
  const budgets = useMemo(
    () => (results ? [{ label: name, budget: results.budget, plantNames }] : []),
    [results, name, plantNames],
  );
  return (
    <div className="space-y-6">
      {error ? <FormMessage>{error}</FormMessage> : null}
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
            title={`${name}: nitrogen over ${results.lengthDays} days`}
            series={series}
            units={results.labels}
            events={results.events}
            guides={results.guides}
            downloadName={downloadName}
          />
          <section aria-labelledby="budget-title" className="card space-y-4">
            <h2 id="budget-title" className="text-lg">
              Nitrogen budget
            </h2>
            <BudgetBar budget={results.budget} plantNames={plantNames} />
            <BudgetTable budgets={budgets} />
          </section>
        </>
      ) : null}
      {settings && showSettings ? <SettingsSummary model={settings} /> : null}
      <CautionsPanel
        tapNitrateAboveDrinkingLimit={results?.tapNitrateAboveDrinkingLimit ?? false}
        tapNitrateText={results ? `${formatNumber(results.tapNitrateDisplay)} ${results.labels.nitrate}` : ""}
        limitText={results ? `${formatNumber(results.tapNitrateLimitDisplay)} ${results.labels.nitrate}` : ""}
      />
    </div>
  );
}
