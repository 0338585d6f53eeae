import { Form, Link, redirect } from "react-router";
import type { Route } from "./+types/plan";
import { Breadcrumbs } from "~/components/breadcrumbs";
import { FormMessage, TextField } from "~/components/ui/field";
import { planFormValues, readPlanForm, trimField } from "~/features/tanks/maintenance-plan";
import {
  markTaskDone,
  resetPlan,
  savePlan,
  tankPlan,
  timedTrimGroups,
  upcomingPlanned,
} from "~/features/tanks/maintenance-plan.server";
import { UpcomingList } from "~/features/tanks/upcoming-list";
import { requireOwnedTank } from "~/features/tanks/tanks.server";
import { invalid, readForm } from "~/http/pages.server";
import { requireUser } from "~/permissions.server";
import { formValues } from "~/utils/form-errors";
import { keeperNow } from "~/features/accounts/time-zone.server";
import { upcomingView } from "~/routes/tanks/upcoming-view.server";

export const meta: Route.MetaFunction = ({ data }) => [
  { title: `Maintenance plan · ${data?.tank.name ?? "Tank"} · Fernwater` },
];

export async function loader({ request, params }: Route.LoaderArgs) {
  const user = await requireUser(request);
  const tank = requireOwnedTank(user.id, params.tankId);
  const tp = tankPlan(tank.id);
  return {
    tank: { id: tank.id, name: tank.name },
    plan: tp
      ? {
          scenarioName: tp.scenario.name,
          edited: tp.edited,
          values: planFormValues(tp.plan),
          trims: timedTrimGroups(tp.base).map((g) => ({ field: trimField(g.id), name: g.name })),
        }
      : null,
    upcoming: upcomingView(tank.id, keeperNow(request, user)),
    done: new URL(request.url).searchParams.has("done"),
  };
}

export async function action({ request, params }: Route.ActionArgs) {
  const user = await requireUser(request);
  const tank = requireOwnedTank(user.id, params.tankId);
  const values = formValues(await readForm(request));
  const tp = tankPlan(tank.id);
  if (!tp) return invalid({ "": "This tank has no scenario yet: make one first, its timetable is the plan." }, values);
  if (values.intent === "save") {
    const read = readPlanForm(
      values,
      timedTrimGroups(tp.base).map((g) => g.id),
    );
    if (!read.ok) return invalid(read.errors, values);
    savePlan(tank.id, tp.scenario.id, read.plan);
    return redirect(`/tanks/${tank.id}/plan?saved=1`);
  }
  if (values.intent === "reset") {
    resetPlan(tank.id);
    return redirect(`/tanks/${tank.id}/plan`);
  }
  if (values.intent === "done") {
    const today = keeperNow(request, user);
    const task = upcomingPlanned(tank.id, today).find((t) => t.key === values.task);
    const done = markTaskDone(tank.id, { ...values, kind: task?.values.kind ?? values.kind ?? "" }, today);
    if (!done.ok) return invalid(done.errors, values);
    return redirect(values.back === "tank" ? `/tanks/${tank.id}?done=1` : `/tanks/${tank.id}/plan?done=1`);
  }
  return invalid({ "": "Unknown action." }, values);
}

export default function PlanPage({ loaderData, actionData }: Route.ComponentProps) {
  const { tank, plan, upcoming } = loaderData;
  const errors: Record<string, string> = actionData?.errors ?? {};
  const values: Record<string, string> = actionData?.values ?? {};
  const saving = values.intent === "save";
  const v = saving ? values : (plan?.values ?? {});
  return (
    <div className="space-y-6">
      <Breadcrumbs
        trail={[
          { to: "/tanks", label: "Tanks" },
          { to: `/tanks/${tank.id}`, label: tank.name },
        ]}
        current="Maintenance plan"
      />
      <h1 className="text-2xl">Maintenance plan</h1>
      {loaderData.done ? (
        <FormMessage tone="success">Added to the journal; the next one moves on from that date.</FormMessage>
      ) : null}
      {!saving && errors[""] ? <FormMessage>{errors[""]}</FormMessage> : null}
      {plan ? (
        <section aria-labelledby="plan-title" className="space-y-3">
          <h2 id="plan-title" className="text-lg">
            What you plan to do
          </h2>
          <p className="text-sm text-stone-700">
            {plan.edited ? "Your plan, starting from" : "The timetable of"} the scenario “{plan.scenarioName}”. The
            upcoming list, the calendar feed and the journal’s forecast follow it. A plan is a model’s suggestion: test
            your water, and ask your fish’s keeper or a vet when fish look unwell.
          </p>
          <Form method="post" className="grid max-w-2xl gap-4 sm:grid-cols-2" noValidate>
            <input type="hidden" name="intent" value="save" />
            <TextField
              label="Water changed each time"
              name="water_change_percent"
              suffix="%"
              defaultValue={v.water_change_percent}
              error={errors.water_change_percent}
            />
            <TextField
              label="Change water every"
              hint="0 for none"
              name="water_change_every_days"
              suffix="days"
              defaultValue={v.water_change_every_days}
              error={errors.water_change_every_days}
            />
            <TextField
              label="Detritus siphoned from the gravel at each change"
              name="gravel_percent"
              suffix="%"
              defaultValue={v.gravel_percent}
              error={errors.gravel_percent}
            />
            <TextField
              label="Clean the filter every"
              hint="0 for never"
              name="filter_every_days"
              suffix="days"
              defaultValue={v.filter_every_days}
              error={errors.filter_every_days}
            />
            {plan.trims.map((t) => (
              <TextField
                key={t.field}
                label={`Trim ${t.name} every`}
                name={t.field}
                suffix="days"
                defaultValue={v[t.field]}
                error={errors[t.field]}
              />
            ))}
            <div className="flex gap-2 sm:col-span-2">
              <button type="submit" className="btn">
                Save the plan
              </button>
            </div>
          </Form>
          {plan.edited ? (
            <Form method="post">
              <input type="hidden" name="intent" value="reset" />
              <button type="submit" className="btn-secondary">
                Back to the scenario’s timetable
              </button>
            </Form>
          ) : null}
        </section>
      ) : (
        <p>
          This tank has no scenario yet. <Link to={`/tanks/${tank.id}/scenarios/new`}>Make one</Link>: its timetable is
          the plan.
        </p>
      )}
      <section aria-labelledby="upcoming-title" className="space-y-3">
        <h2 id="upcoming-title" className="text-lg">
          Upcoming
        </h2>
        <UpcomingList
          tankId={tank.id}
          tasks={upcoming}
          back="plan"
          failed={values.intent === "done" ? { key: values.task, errors, values } : null}
        />
      </section>
    </div>
  );
}
