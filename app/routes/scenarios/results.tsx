import { Link } from "react-router";
import type { Route } from "./+types/results";
import { CautionsPanel } from "~/components/cautions";
import { KeyFiguresList } from "~/components/key-figures";
import { FormMessage } from "~/components/ui/field";
import { requireUser } from "~/permissions.server";
import { resultsPayload } from "~/results.server";
import { ensureRun, isModelError, readStoredSettings, withTankTargets } from "~/simulation.server";
import { requireOwnedScenario } from "~/tanks.server";
import { displayUnitsFor, formatNumber } from "~/utils/display-units";

export const meta: Route.MetaFunction = ({ data }) => [{ title: `${data?.scenario.name ?? "Results"} · Fernwater` }];

export async function loader({ request, params }: Route.LoaderArgs) {
  const user = await requireUser(request);
  const { tank, scenario } = requireOwnedScenario(user.id, params.tankId, params.scenarioId);
  const base = { tank: { id: tank.id, name: tank.name }, scenario: { id: scenario.id, name: scenario.name } };
  const settings = readStoredSettings(scenario.settings);
  if (!settings) return { ...base, error: "The saved settings of this scenario can no longer be read.", results: null };
  const withTargets = withTankTargets(settings, tank);
  try {
    const run = await ensureRun(scenario.id, withTargets);
    return { ...base, error: null, results: resultsPayload(run, withTargets, displayUnitsFor(user)) };
  } catch (error) {
    if (isModelError(error)) return { ...base, error: error.message, results: null };
    throw error;
  }
}

export default function ResultsPage({ loaderData }: Route.ComponentProps) {
  const { tank, scenario, results, error } = loaderData;
  return (
    <div className="space-y-6">
      <nav aria-label="Breadcrumb" className="text-sm">
        <Link to="/tanks" className="link">
          Tanks
        </Link>{" "}
        /{" "}
        <Link to={`/tanks/${tank.id}`} className="link">
          {tank.name}
        </Link>{" "}
        / {scenario.name}
      </nav>
      <div className="flex flex-wrap items-center justify-between gap-3">
        <h1 className="text-2xl">{scenario.name}</h1>
        <Link to={`/tanks/${tank.id}/scenarios/${scenario.id}/edit`} className="btn-secondary">
          Edit settings
        </Link>
      </div>
      {error ? <FormMessage>{error}</FormMessage> : null}
      {results ? (
        <>
          <KeyFiguresList figures={results.keyFigures} units={results.labels} />
          <CautionsPanel
            tapNitrateAboveDrinkingLimit={results.tapNitrateAboveDrinkingLimit}
            tapNitrateText={`${formatNumber(results.tapNitrateDisplay)} ${results.labels.nitrate}`}
          />
        </>
      ) : null}
    </div>
  );
}
