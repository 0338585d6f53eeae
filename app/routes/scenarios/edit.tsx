import { Link, redirect } from "react-router";
import type { Route } from "./+types/edit";
import { lessonCopyPath } from "~/features/classes/classes.server";
import { ScenarioForm } from "~/components/scenario-form";
import { FormMessage } from "~/components/ui/field";
import { requireUser } from "~/permissions.server";
import { buildScenarioForm } from "~/features/scenarios/scenario-form.server";
import { readStoredSettings } from "~/features/runs/simulation.server";
import { requireOwnedScenario } from "~/features/tanks/tanks.server";
import { formatDate } from "~/utils/dates";
import { readForm } from "~/http/pages.server";
import { handleSetupSubmission, unitsOf, unitsSummary } from "~/features/scenarios/scenario-setup.server";
import { Breadcrumbs } from "~/components/breadcrumbs";

export const meta: Route.MetaFunction = ({ data }) => [
  { title: `Edit ${data?.scenario.name ?? "scenario"} · Fernwater` },
];

export async function loader({ request, params }: Route.LoaderArgs) {
  const user = await requireUser(request);
  const { tank, scenario } = requireOwnedScenario(user.id, params.tankId, params.scenarioId);
  // A lesson copy is changed on its lesson page, where the lesson's locks apply.
  const lessonPath = lessonCopyPath(scenario.id);
  if (lessonPath) throw redirect(lessonPath);
  const settings = readStoredSettings(scenario.settings);
  const units = unitsOf(user);
  return {
    tank: { id: tank.id, name: tank.name },
    scenario: { id: scenario.id, name: scenario.name },
    form: settings
      ? {
          ...buildScenarioForm(scenario.name, settings, units),
          startDate: scenario.startDate ? formatDate(scenario.startDate.getTime()) : "",
        }
      : null,
    unitsNote: unitsSummary(units),
    // A link to one setting (e.g. the calibration page's "Change the start date") opens its section.
    open: new URL(request.url).searchParams.get("open"),
  };
}

export async function action({ request, params }: Route.ActionArgs) {
  const user = await requireUser(request);
  const { tank, scenario } = requireOwnedScenario(user.id, params.tankId, params.scenarioId);
  const lessonPath = lessonCopyPath(scenario.id);
  if (lessonPath) throw redirect(lessonPath);
  const baseline = readStoredSettings(scenario.settings) ?? undefined;
  const outcome = await handleSetupSubmission(await readForm(request), user, tank, scenario.id, baseline);
  if ("scenarioId" in outcome) return redirect(`/tanks/${tank.id}/scenarios/${outcome.scenarioId}`);
  return outcome;
}

export default function EditScenarioPage({ loaderData, actionData }: Route.ComponentProps) {
  const { tank, scenario } = loaderData;
  const form = actionData?.form ?? loaderData.form;
  return (
    <div className="space-y-6">
      <Breadcrumbs
        trail={[
          { to: "/tanks", label: "Tanks" },
          { to: `/tanks/${tank.id}`, label: tank.name },
          { to: `/tanks/${tank.id}/scenarios/${scenario.id}`, label: scenario.name },
        ]}
        current="Edit"
      />
      <h1 className="text-2xl">Edit {scenario.name}</h1>
      {form ? (
        <ScenarioForm
          model={form}
          errors={actionData?.errors ?? {}}
          submitLabel="Save and run"
          openSections={["water", ...form.sections.filter((x) => x.id === loaderData.open).map((x) => x.id)]}
          extraActions={[{ intent: "save-as-new", label: "Save as a new scenario" }]}
          unitsNote={
            <>
              {loaderData.unitsNote}{" "}
              <Link to="/account" className="link">
                Change units
              </Link>
            </>
          }
        />
      ) : (
        <FormMessage>
          The saved settings of this scenario can no longer be read. Create a new scenario instead.
        </FormMessage>
      )}
    </div>
  );
}
