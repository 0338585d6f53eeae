import { Link, redirect } from "react-router";
import type { Route } from "./+types/new";
import { getPreset, PRESETS, ScenarioSchema } from "~models";
import { ScenarioForm } from "~/components/scenario-form";
import { requireUser } from "~/permissions.server";
import { buildScenarioForm } from "~/features/scenarios/scenario-form.server";
import { requireOwnedTank } from "~/features/tanks/tanks.server";
import { readForm } from "~/http/pages.server";
import { handleSetupSubmission, unitsOf, unitsSummary } from "~/features/scenarios/scenario-setup.server";
import { Breadcrumbs } from "~/components/breadcrumbs";
import { nitrateText } from "~/utils/display-units";

export const meta: Route.MetaFunction = ({ data }) => [
  { title: `New scenario · ${data?.tank.name ?? "Tank"} · Fernwater` },
];

export async function loader({ request, params }: Route.LoaderArgs) {
  const user = await requireUser(request);
  const tank = requireOwnedTank(user.id, params.tankId);
  const presetId = new URL(request.url).searchParams.get("preset");
  const preset = presetId ? getPreset(presetId) : undefined;
  const scenario = ScenarioSchema.parse(preset?.scenario ?? {});
  const units = unitsOf(user);
  return {
    tank: { id: tank.id, name: tank.name },
    presets: PRESETS.map((p) => ({
      id: p.id,
      name: p.name,
      description: p.describe((mgN) => nitrateText(mgN, units)),
    })),
    presetId: preset?.id ?? null,
    form: { ...buildScenarioForm(preset ? preset.name.split(" — ")[0] : "Baseline", scenario, units), startDate: "" },
    unitsNote: unitsSummary(units),
  };
}

export async function action({ request, params }: Route.ActionArgs) {
  const user = await requireUser(request);
  const tank = requireOwnedTank(user.id, params.tankId);
  const outcome = await handleSetupSubmission(await readForm(request), user, tank, "new");
  if ("scenarioId" in outcome) return redirect(`/tanks/${tank.id}/scenarios/${outcome.scenarioId}`);
  return outcome;
}

export default function NewScenarioPage({ loaderData, actionData }: Route.ComponentProps) {
  const { tank, presets, presetId } = loaderData;
  const form = actionData?.form ?? loaderData.form;
  return (
    <div className="space-y-6">
      <Breadcrumbs
        trail={[
          { to: "/tanks", label: "Tanks" },
          { to: `/tanks/${tank.id}`, label: tank.name },
        ]}
        current="New scenario"
      />
      <h1 className="text-2xl">New scenario for {tank.name}</h1>
      <section aria-labelledby="presets-title" className="space-y-2">
        <h2 id="presets-title" className="text-lg">
          Start from
        </h2>
        <ul className="grid gap-3 sm:grid-cols-2 lg:grid-cols-3">
          <li>
            <Link
              to={`/tanks/${tank.id}/scenarios/new`}
              className={`card block h-full hover:border-fern-600 ${presetId === null ? "border-fern-600 ring-2 ring-fern-200" : ""}`}
              aria-current={presetId === null ? "true" : undefined}
            >
              <span className="font-semibold">Typical planted tank</span>
              <span className="block text-sm text-stone-600">
                Fernwater’s defaults: change what differs in your tank.
              </span>
            </Link>
          </li>
          {presets.map((p) => (
            <li key={p.id}>
              <Link
                to={`/tanks/${tank.id}/scenarios/new?preset=${p.id}`}
                className={`card block h-full hover:border-fern-600 ${presetId === p.id ? "border-fern-600 ring-2 ring-fern-200" : ""}`}
                aria-current={presetId === p.id ? "true" : undefined}
              >
                <span className="font-semibold">{p.name}</span>
                <span className="block text-sm text-stone-600">{p.description}</span>
              </Link>
            </li>
          ))}
        </ul>
      </section>
      <ScenarioForm
        key={presetId ?? "default"}
        model={form}
        errors={actionData?.errors ?? {}}
        submitLabel="Save and run"
        unitsNote={
          <>
            {loaderData.unitsNote}{" "}
            <Link to="/account" className="link">
              Change units
            </Link>
          </>
        }
      />
    </div>
  );
}
