import { useMemo, useState } from "react";
import { Form, Link, redirect, useNavigation } from "react-router";
import type { Route } from "./+types/sweep";
import { XYChart } from "~/components/charts/xy-chart";
import { jobActive, JobProgress, useJob } from "~/components/job-progress";
import { FormMessage, SelectField, TextField } from "~/components/ui/field";
import { JOB_LIMITS } from "~/features/jobs/job-limits.server";
import { cancelJob, findScenarioJob, jobJson, startJob } from "~/features/jobs/jobs.server";
import { requireUser } from "~/permissions.server";
import { readStoredSettings, withTankTargets } from "~/features/runs/simulation.server";
import {
  leverJson,
  sweepJob,
  SWEEP_OUTCOMES,
  sweepInputSchema,
  sweepLevers,
  type SweepResultJson,
} from "~/features/sweeps/sweeps.server";
import { requireOwnedScenario } from "~/features/tanks/tanks.server";
import { displayUnitsFor, formatNumber } from "~/utils/display-units";
import { fieldErrors, formValues } from "~/utils/form-errors";
import { invalid, readForm, refusedForm } from "~/http/pages.server";
import { Breadcrumbs } from "~/components/breadcrumbs";

export const meta: Route.MetaFunction = ({ data }) => [
  { title: `Sweep · ${data?.scenario.name ?? "Scenario"} · Fernwater` },
];

async function context(request: Request, params: Route.LoaderArgs["params"]) {
  const user = await requireUser(request);
  const { tank, scenario: row } = requireOwnedScenario(user.id, params.tankId, params.scenarioId);
  const settings = readStoredSettings(row.settings);
  const units = displayUnitsFor(user);
  const scenario = settings ? withTankTargets(settings, tank) : null;
  return { user, tank, row, units, scenario, levers: scenario ? sweepLevers(scenario) : [] };
}

export async function loader({ request, params }: Route.LoaderArgs) {
  const { user, tank, row, units, levers } = await context(request, params);
  const job = findScenarioJob(user.id, request, "sweep", row.id);
  return {
    tank: { id: tank.id, name: tank.name },
    scenario: { id: row.id, name: row.name },
    levers: levers.map((l) => leverJson(l, units)),
    outcomes: SWEEP_OUTCOMES,
    maxPoints: JOB_LIMITS.sweepPoints[user.role],
    job: job ? jobJson(job) : null,
    input: job ? ((job.params as { input: Record<string, unknown> }).input as Record<string, string | number>) : null,
  };
}

export async function action({ request, params }: Route.ActionArgs) {
  const { user, tank, row, units, scenario, levers } = await context(request, params);
  const values = formValues(await readForm(request));
  const here = `/tanks/${tank.id}/scenarios/${row.id}/sweep`;
  if (values.intent === "cancel") {
    cancelJob(user.id, values.jobId ?? "");
    return redirect(`${here}?job=${encodeURIComponent(values.jobId ?? "")}`);
  }
  if (values.intent !== "start") return invalid({ "": "Unknown action." }, values);
  if (!scenario) return invalid({ "": "The saved settings of this scenario can no longer be read." }, values);
  const parsed = sweepInputSchema(levers, units, user.role).safeParse(values);
  if (!parsed.success) return invalid(fieldErrors(parsed.error), values);
  try {
    const job = startJob(sweepJob(user, row.id, scenario, parsed.data, units));
    return redirect(`${here}?job=${job.id}`);
  } catch (error) {
    return refusedForm(error, values);
  }
}

/** A starting range around the current value, within the setting's bounds. */
function suggestedRange(l: { min: number; max: number; current: number }): [number, number] {
  if (l.current > 0)
    return [
      Math.max(l.min, Number((l.current / 2).toPrecision(3))),
      Math.min(l.max, Number((l.current * 2).toPrecision(3))),
    ];
  return [l.min, Number((l.min + (l.max - l.min) / 10).toPrecision(3))];
}

export default function SweepPage({ loaderData, actionData }: Route.ComponentProps) {
  const { tank, scenario, levers, outcomes, maxPoints } = loaderData;
  const job = useJob(loaderData.job);
  const busy = useNavigation().state === "submitting";
  const errors = actionData?.errors ?? {};
  const typed = actionData?.values ?? loaderData.input ?? {};
  const [settingId, setSettingId] = useState(String(typed.setting ?? levers[0]?.id ?? ""));
  const lever = levers.find((l) => l.id === settingId) ?? levers[0];
  const [from, to] = lever ? suggestedRange(lever) : [0, 1];
  const keepTyped = typed.setting === settingId;
  // The very bounds the server's check enforces (leverBounds), written out in full.
  const rangeHint = lever ? `Between ${lever.min} and ${lever.max}${lever.unit ? ` ${lever.unit}` : ""}.` : "";
  const result = (job?.result ?? job?.partial) as SweepResultJson | null;
  const chart = useMemo(
    () =>
      result
        ? [
            {
              key: "sweep",
              label: result.outcome.label,
              color: "#9d174d",
              line: true,
              points: result.points.filter(Boolean).map((p) => ({ x: p.x, y: p.y })),
            },
          ]
        : [],
    [result],
  );
  const failed = result?.points.filter((p) => p && p.error) ?? [];
  return (
    <div className="space-y-6">
      <Breadcrumbs
        trail={[
          { to: "/tanks", label: "Tanks" },
          { to: `/tanks/${tank.id}`, label: tank.name },
          { to: `/tanks/${tank.id}/scenarios/${scenario.id}`, label: scenario.name },
        ]}
        current="Sweep"
      />
      <h1 className="text-2xl">Sweep a setting of {scenario.name}</h1>
      <p className="text-sm text-stone-700">
        The model runs once for each point of the range, with everything else as saved, and plots the outcome against
        the setting. At most {maxPoints} points; one job at a time.{" "}
        <Link className="link" to={`/tanks/${tank.id}/scenarios/${scenario.id}/target`}>
          Looking for the value that meets a goal? Use the target finder.
        </Link>
      </p>
      {errors[""] ? <FormMessage>{errors[""]}</FormMessage> : null}
      {lever ? (
        <Form method="post" className="card space-y-4">
          <input type="hidden" name="intent" value="start" />
          <div className="grid gap-4 sm:grid-cols-2">
            <SelectField
              label="Setting to vary"
              name="setting"
              value={settingId}
              onChange={(e) => setSettingId(e.target.value)}
              options={levers.map((l) => ({ value: l.id, label: `${l.label}${l.unit ? ` (${l.unit})` : ""}` }))}
              hint={`${lever.hint} Now ${formatNumber(lever.current)} ${lever.unit}.`}
              error={errors.setting}
            />
            <SelectField
              label="Outcome"
              name="outcome"
              defaultValue={String(typed.outcome ?? "nitrateBeforeLastWaterChange")}
              options={outcomes.map((o) => ({ value: o.id, label: o.label }))}
              error={errors.outcome}
            />
          </div>
          <div className="grid gap-4 sm:grid-cols-3" key={settingId}>
            <TextField
              label="From"
              name="from"
              inputMode="decimal"
              suffix={lever.unit}
              defaultValue={String(keepTyped ? typed.from : from)}
              hint={rangeHint}
              error={errors.from}
              className="figure"
            />
            <TextField
              label="To"
              name="to"
              inputMode="decimal"
              suffix={lever.unit}
              defaultValue={String(keepTyped ? typed.to : to)}
              hint={rangeHint}
              error={errors.to}
              className="figure"
            />
            <TextField
              label="Points"
              name="points"
              inputMode="numeric"
              defaultValue={String(typed.points ?? 20)}
              error={errors.points}
              hint={`2 to ${maxPoints}.`}
              className="figure"
            />
          </div>
          <button type="submit" className="btn" disabled={busy || jobActive(job)}>
            Run the sweep
          </button>
        </Form>
      ) : (
        <FormMessage>The saved settings of this scenario can no longer be read.</FormMessage>
      )}
      {job ? (
        <section aria-labelledby="sweep-result" className="card space-y-4">
          <h2 id="sweep-result" className="text-lg">
            {result ? `${result.outcome.label} against ${result.setting.label.toLowerCase()}` : "Sweep"}
          </h2>
          <JobProgress job={job} />
          {result && chart[0].points.length ? (
            <XYChart
              title={`${result.outcome.label} against ${result.setting.label.toLowerCase()}`}
              description={`${chart[0].points.length} runs of ${scenario.name}, one per value of ${result.setting.label.toLowerCase()}; the dotted line marks the saved value.`}
              xLabel={`${result.setting.label}${result.setting.unit ? `, ${result.setting.unit}` : ""}`}
              yLabel={`${result.outcome.label}${result.outcome.unit ? `, ${result.outcome.unit}` : ""}`}
              series={chart}
              marker={{ x: result.setting.current, label: `saved: ${formatNumber(result.setting.current)}` }}
              xRange={[result.setting.from, result.setting.to]}
            />
          ) : null}
          {failed.length ? (
            <p className="text-sm text-stone-700">
              {failed.length} point{failed.length === 1 ? "" : "s"} could not be run: {failed[0].error}
            </p>
          ) : null}
        </section>
      ) : null}
    </div>
  );
}
