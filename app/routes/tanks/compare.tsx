import { Form } from "react-router";
import type { Route } from "./+types/compare";
import { CompareChart } from "~/components/charts/compare-chart";
import type { SeriesKey } from "~/utils/chart-data";
import { CautionsPanel } from "~/components/cautions";
import { CompareWarnings } from "~/components/compare-warnings";
import { keyFigureRows } from "~/components/key-figures";
import { FormMessage } from "~/components/ui/field";
import { requireUser } from "~/permissions.server";
import { resultsPayload } from "~/features/runs/results.server";
import { ensureRun, readStoredSettings, withTankTargets } from "~/features/runs/simulation.server";
import { runProblem } from "~/http/pages.server";
import { listScenarios, requireOwnedTank } from "~/features/tanks/tanks.server";
import { displayUnitsFor, formatNumber } from "~/utils/display-units";
import { budgetSections } from "~/components/charts/budget-model";
import { Breadcrumbs } from "~/components/breadcrumbs";
import { ScrollTable } from "~/components/ui/scroll-table";

export const meta: Route.MetaFunction = ({ data }) => [{ title: `Compare · ${data?.tank.name ?? "Tank"} · Fernwater` }];

const SPECIES_OPTIONS: { value: SeriesKey; label: string }[] = [
  { value: "no3", label: "Nitrate" },
  { value: "tan", label: "Total ammonia (TAN)" },
  { value: "nh3", label: "Free ammonia (NH3)" },
  { value: "no2", label: "Nitrite" },
  { value: "plants", label: "Plant mass" },
];

// Rendered from its loader data alone (no clock, no randomness): a repeat view may reuse the rendering (app/http/render-cache.server.ts).
export const handle = { renderCache: true };

export async function loader({ request, params }: Route.LoaderArgs) {
  const user = await requireUser(request);
  const tank = requireOwnedTank(user.id, params.tankId);
  const url = new URL(request.url);
  const wanted = [...new Set(url.searchParams.getAll("s"))];
  const speciesParam = url.searchParams.get("species");
  const species = (SPECIES_OPTIONS.find((o) => o.value === speciesParam)?.value ?? "no3") as SeriesKey;
  const all = listScenarios(tank.id);
  const base = {
    tank: { id: tank.id, name: tank.name },
    species,
    choices: all.map((s) => ({ id: s.id, name: s.name, chosen: wanted.includes(String(s.id)) })),
  };
  if (wanted.length < 2 || wanted.length > 4) {
    return { ...base, message: "Tick two, three or four scenarios to compare.", runs: [] };
  }
  const chosen = wanted.map((id) => all.find((s) => String(s.id) === id));
  if (chosen.some((s) => !s)) return { ...base, message: "One of those scenarios is not in this tank.", runs: [] };
  const units = displayUnitsFor(user);
  const runs = [];
  for (const s of chosen) {
    const settings = readStoredSettings(s!.settings);
    if (!settings) return { ...base, message: `The settings of “${s!.name}” can no longer be read.`, runs: [] };
    const withTargets = withTankTargets(settings, tank);
    try {
      const run = await ensureRun(s!.id, withTargets, user.id);
      runs.push({ id: s!.id, name: s!.name, ...resultsPayload(run, withTargets, units) });
    } catch (error) {
      const problem = runProblem(error);
      if (problem) return { ...base, message: `“${s!.name}” could not be run: ${problem}`, runs: [] };
      throw error;
    }
  }
  return { ...base, message: null, runs };
}

/** Budget rows flattened across sections, same order for every run (plant groups summed so rows line up). */
function budgetTableRows(budget: Parameters<typeof budgetSections>[0]) {
  return budgetSections(budget).flatMap((section) =>
    section.rows.filter((r) => !r.key.startsWith("plants-")).map((r) => ({ ...r, section: section.title })),
  );
}

/** A cell that differs from the baseline by more than 1 % is marked, with words for screen readers; in the cell's colour (a flagged peak stays red). */
function Diff({ value, baseline, text }: { value: number | null; baseline: number | null; text: string }) {
  if (value === null || baseline === null || Math.abs(value - baseline) <= Math.max(1e-9, Math.abs(baseline) * 0.01)) {
    return <>{text}</>;
  }
  const up = value > baseline;
  return (
    <span className="font-semibold">
      {text} <span aria-hidden="true">{up ? "▲" : "▼"}</span>
      <span className="sr-only">{up ? " (higher than the baseline)" : " (lower than the baseline)"}</span>
    </span>
  );
}

export default function ComparePage({ loaderData }: Route.ComponentProps) {
  const { tank, runs, message, species, choices } = loaderData;
  const first = runs[0];
  return (
    <div className="space-y-6">
      <Breadcrumbs
        trail={[
          { to: "/tanks", label: "Tanks" },
          { to: `/tanks/${tank.id}`, label: tank.name },
        ]}
        current="Compare"
      />
      <h1 className="text-2xl">Compare scenarios of {tank.name}</h1>
      <Form method="get" className="card flex flex-wrap items-end gap-4">
        <fieldset>
          <legend className="text-sm font-semibold">Scenarios (2–4; the first ticked is the baseline)</legend>
          <div className="mt-1 flex flex-wrap gap-3">
            {choices.map((c) => (
              <label key={c.id} className="flex items-center gap-2 text-sm">
                <input
                  type="checkbox"
                  name="s"
                  value={c.id}
                  defaultChecked={c.chosen}
                  className="h-5 w-5 accent-fern-700"
                />
                {c.name}
              </label>
            ))}
          </div>
        </fieldset>
        <div>
          <label htmlFor="species" className="block text-sm font-semibold">
            Show
          </label>
          <select id="species" name="species" defaultValue={species} className="input">
            {SPECIES_OPTIONS.map((o) => (
              <option key={o.value} value={o.value}>
                {o.label}
              </option>
            ))}
          </select>
        </div>
        <button type="submit" className="btn">
          Compare
        </button>
      </Form>
      {message ? <FormMessage tone="info">{message}</FormMessage> : null}
      {first ? (
        <>
          <CompareChart
            title={`${SPECIES_OPTIONS.find((o) => o.value === species)?.label} in ${tank.name}`}
            runs={runs.map((r) => ({ label: r.name, series: r.series }))}
            units={first.labels}
            species={species}
            hidePicker
            events={first.events}
            guides={first.guides}
            downloadName={`compare-${tank.name}`}
          />
          <CompareWarnings runs={runs} />
          <section aria-labelledby="figures-title" className="space-y-2">
            <h2 id="figures-title" className="text-lg">
              Key figures
            </h2>
            <ScrollTable label="Key figures table">
              <table className="w-full min-w-[36rem] border-collapse text-sm">
                <caption className="sr-only">
                  Key figures of each scenario; differences from the baseline are marked
                </caption>
                <thead>
                  <tr className="border-b border-stone-300 text-left">
                    <th scope="col" className="py-2 pr-3">
                      Figure
                    </th>
                    {runs.map((r, i) => (
                      <th key={r.id} scope="col" className="num py-2 pr-3">
                        {r.name}
                        {i === 0 ? <span className="block text-xs font-normal text-stone-500">baseline</span> : null}
                      </th>
                    ))}
                  </tr>
                </thead>
                <tbody>
                  {keyFigureRows(first.keyFigures, first.labels).map((row, rowIndex) => (
                    <tr key={row.label} className="border-b border-stone-200">
                      <th scope="row" className="py-2 pr-3 text-left font-normal">
                        {row.label} {row.unit ? <span className="text-xs text-stone-500">({row.unit})</span> : null}
                      </th>
                      {runs.map((r) => {
                        const cells = keyFigureRows(r.keyFigures, r.labels);
                        const numeric = (text: string) =>
                          /^-?[\d.,]+$/.test(text) ? Number(text.replace(/,/g, "")) : null;
                        const warned = row.id !== undefined && r.warnings.some((w) => w.figure === row.id);
                        return (
                          <td
                            key={r.id}
                            className={`num py-2 pr-3 ${warned ? "bg-red-50 font-semibold text-red-800" : ""}`}
                            data-flagged={warned ? "" : undefined}
                          >
                            <Diff
                              value={numeric(cells[rowIndex].value)}
                              baseline={numeric(keyFigureRows(first.keyFigures, first.labels)[rowIndex].value)}
                              text={cells[rowIndex].value}
                            />
                            {warned ? <span className="sr-only"> (above the caution line)</span> : null}
                          </td>
                        );
                      })}
                    </tr>
                  ))}
                </tbody>
              </table>
            </ScrollTable>
          </section>
          <section aria-labelledby="budget-title" className="space-y-2">
            <h2 id="budget-title" className="text-lg">
              Nitrogen budget (mg N over the run)
            </h2>
            <ScrollTable label="Budgets table">
              <table className="w-full min-w-[36rem] border-collapse text-sm">
                <caption className="sr-only">Where the nitrogen came from and went, per scenario</caption>
                <thead>
                  <tr className="border-b border-stone-300 text-left">
                    <th scope="col" className="py-2 pr-3">
                      Flow or stock
                    </th>
                    {runs.map((r) => (
                      <th key={r.id} scope="col" className="num py-2 pr-3">
                        {r.name}
                      </th>
                    ))}
                  </tr>
                </thead>
                <tbody>
                  {budgetTableRows(first.budget).map((row, rowIndex) => (
                    <tr key={row.key} className={`border-b border-stone-200 ${row.total ? "font-semibold" : ""}`}>
                      <th
                        scope="row"
                        className={`py-2 pr-3 text-left ${row.total ? "font-semibold" : "font-normal"} ${row.level ? "pl-4" : ""}`}
                      >
                        {row.section}: {row.label}
                      </th>
                      {runs.map((r) => {
                        const value = budgetTableRows(r.budget)[rowIndex].mg;
                        return (
                          <td key={r.id} className="num py-2 pr-3">
                            <Diff value={value} baseline={row.mg} text={formatNumber(value)} />
                          </td>
                        );
                      })}
                    </tr>
                  ))}
                </tbody>
              </table>
            </ScrollTable>
          </section>
          <CautionsPanel
            tapNitrateAboveDrinkingLimit={runs.some((r) => r.tapNitrateAboveDrinkingLimit)}
            tapNitrateText={runs.map((r) => `${formatNumber(r.tapNitrateDisplay)} ${r.labels.nitrate}`).join(", ")}
            limitText={`${formatNumber(runs[0].tapNitrateLimitDisplay)} ${runs[0].labels.nitrate}`}
          />
        </>
      ) : null}
    </div>
  );
}
