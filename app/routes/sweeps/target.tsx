import { useState } from "react";
import { Form, redirect, useNavigation } from "react-router";
import { z } from "zod";
import type { Route } from "./+types/target";
import { CautionsPanel } from "~/components/cautions";
import { jobActive, JobProgress, useJob } from "~/components/job-progress";
import { FormMessage, SelectField, TextField } from "~/components/ui/field";
import { FREE_NH3_CAUTION_MG_N } from "~/features/runs/display-figures";
import { speciesFactor } from "~models/units";
import { typedTarget } from "~/features/tanks/nitrate-targets";
import { cancelJob, findScenarioJob, jobJson, startJob } from "~/features/jobs/jobs.server";
import { requireUser } from "~/permissions.server";
import { DRINKING_WATER_NITRATE_MG_N } from "~/features/runs/results.server";
import { modelStartMs } from "~/features/readings/readings.server";
import { saveScenarioVariant } from "~/features/scenarios/scenario-variant.server";
import { readStoredSettings, withTankTargets } from "~/features/runs/simulation.server";
import { applyLever, searchLever } from "~/features/sweeps/search-levers.server";
import { targetSearchJob, TargetInputSchema, type TargetResultJson } from "~/features/sweeps/target-finder.server";
import { requireOwnedScenario } from "~/features/tanks/tanks.server";
import { displayUnitsFor, formatNumber, unitLabels } from "~/utils/display-units";
import { TARGET_LEVER_LABELS, TARGET_LEVERS } from "~/features/sweeps/target-levers";
import { fieldErrors, formValues } from "~/utils/form-errors";
import { invalid, readForm, refusedForm } from "~/http/pages.server";
import { Breadcrumbs } from "~/components/breadcrumbs";

export const meta: Route.MetaFunction = ({ data }) => [
  { title: `Target finder · ${data?.scenario.name ?? "Scenario"} · Fernwater` },
];

async function context(request: Request, params: Route.LoaderArgs["params"]) {
  const user = await requireUser(request);
  const { tank, scenario: row } = requireOwnedScenario(user.id, params.tankId, params.scenarioId);
  const settings = readStoredSettings(row.settings);
  return { user, tank, row, settings, units: displayUnitsFor(user) };
}

export async function loader({ request, params }: Route.LoaderArgs) {
  const { user, tank, row, settings, units } = await context(request, params);
  const job = findScenarioJob(user.id, request, "target", row.id);
  const no3 = speciesFactor("nitrate", units);
  const m = settings?.maintenance;
  return {
    tank: { id: tank.id, name: tank.name },
    scenario: { id: row.id, name: row.name },
    readable: settings !== null,
    labels: unitLabels(units),
    defaults: {
      nitrateMax: String(typedTarget(tank.nitrateTargetHigh, no3)),
      nh3Max: formatNumber(FREE_NH3_CAUTION_MG_N * speciesFactor("ammonia", units)),
      intervalDays: m && m.waterChangeIntervalDays > 0 ? String(m.waterChangeIntervalDays) : "7",
      fractionPercent: m && m.waterChangeFraction > 0 ? formatNumber(m.waterChangeFraction * 100) : "25",
    },
    tapNitrate: settings ? settings.tapWater.nitrate * no3 : 0,
    tapAboveLimit: settings ? settings.tapWater.nitrate > DRINKING_WATER_NITRATE_MG_N : false,
    tapLimit: DRINKING_WATER_NITRATE_MG_N * no3,
    job: job ? jobJson(job) : null,
    input: job ? ((job.params as { input: Record<string, unknown> }).input as Record<string, string | number>) : null,
  };
}

const SaveSchema = z.object({
  name: z.string().trim().min(1, "Give the new scenario a name.").max(120, "Keep the name under 120 characters."),
  lever: z.enum(TARGET_LEVERS),
  value: z.coerce.number().refine(Number.isFinite),
  intervalDays: z.coerce.number().min(1).max(365).optional(),
  fraction: z.coerce.number().min(0).max(0.95).optional(),
});

export async function action({ request, params }: Route.ActionArgs) {
  const { user, tank, row, settings, units } = await context(request, params);
  const values = formValues(await readForm(request));
  const here = `/tanks/${tank.id}/scenarios/${row.id}/target`;
  if (values.intent === "cancel") {
    cancelJob(user.id, values.jobId ?? "");
    return redirect(`${here}?job=${encodeURIComponent(values.jobId ?? "")}`);
  }
  if (!settings) return invalid({ "": "The saved settings of this scenario can no longer be read." }, values);
  if (values.intent === "start") {
    const lever = values.lever;
    const parsed = TargetInputSchema.safeParse({
      ...values,
      // Only the companion setting of the chosen lever counts.
      intervalDays: lever === "waterChangeFraction" ? values.intervalDays : undefined,
      fractionPercent: lever === "waterChangeInterval" ? values.fractionPercent : undefined,
    });
    if (!parsed.success) return invalid(fieldErrors(parsed.error), values);
    try {
      const job = startJob(targetSearchJob(user, row.id, withTankTargets(settings, tank), parsed.data, units));
      return redirect(`${here}?job=${job.id}`);
    } catch (error) {
      return refusedForm(error, values);
    }
  }
  if (values.intent === "save") {
    const parsed = SaveSchema.safeParse(values);
    if (!parsed.success) return invalid(fieldErrors(parsed.error), values);
    const lever = searchLever(parsed.data.lever, settings, {
      intervalDays: parsed.data.intervalDays,
      fraction: parsed.data.fraction,
    });
    if ("unavailable" in lever || parsed.data.value < lever.lo || parsed.data.value > lever.hi) {
      return invalid({ "": "That value is outside what this setting allows." }, values);
    }
    try {
      const id = await saveScenarioVariant(
        tank,
        row.id,
        modelStartMs(row),
        parsed.data.name,
        applyLever(settings, lever, parsed.data.value),
      );
      return redirect(`/tanks/${tank.id}/scenarios/${id}`);
    } catch (error) {
      return refusedForm(error, values);
    }
  }
  return invalid({ "": "Unknown action." }, values);
}

export default function TargetPage({ loaderData, actionData }: Route.ComponentProps) {
  const { tank, scenario, labels, defaults, readable } = loaderData;
  const job = useJob(loaderData.job);
  const busy = useNavigation().state === "submitting";
  const errors = actionData?.errors ?? {};
  const typed: Record<string, string | number | undefined> = actionData?.values ?? loaderData.input ?? {};
  const [lever, setLever] = useState(String(typed.lever ?? "waterChangeFraction"));
  const result = job?.status === "done" ? (job.result as TargetResultJson) : null;
  const value = (k: keyof typeof defaults) => String(typed[k] ?? defaults[k]);
  return (
    <div className="space-y-6">
      <Breadcrumbs
        trail={[
          { to: "/tanks", label: "Tanks" },
          { to: `/tanks/${tank.id}`, label: tank.name },
          { to: `/tanks/${tank.id}/scenarios/${scenario.id}`, label: scenario.name },
        ]}
        current="Target finder"
      />
      <h1 className="text-2xl">Find the change that meets a goal</h1>
      <p className="text-sm text-stone-700">
        Say what you want and what you are willing to change; the model is run over and over, halving the range each
        time, until it finds the smallest change that does it — or tells you why no amount of that change can.
      </p>
      {errors[""] ? <FormMessage>{errors[""]}</FormMessage> : null}
      {readable ? (
        <Form method="post" className="card space-y-4">
          <input type="hidden" name="intent" value="start" />
          <fieldset className="grid gap-4 sm:grid-cols-2">
            <legend className="mb-2 text-sm font-semibold">Goal (leave one empty to ignore it)</legend>
            <TextField
              label="Nitrate just before a water change, at most"
              name="nitrateMax"
              inputMode="decimal"
              suffix={labels.nitrate}
              defaultValue={value("nitrateMax")}
              error={errors.nitrateMax}
              className="figure"
            />
            <TextField
              label="Free ammonia never above"
              name="nh3Max"
              inputMode="decimal"
              suffix={labels.ammonia}
              defaultValue={value("nh3Max")}
              error={errors.nh3Max}
              className="figure"
            />
          </fieldset>
          <div className="grid gap-4 sm:grid-cols-2">
            <SelectField
              label="What you are willing to change"
              name="lever"
              value={lever}
              onChange={(e) => setLever(e.target.value)}
              options={TARGET_LEVERS.map((id) => ({ value: id, label: TARGET_LEVER_LABELS[id] }))}
              error={errors.lever}
            />
            {lever === "waterChangeFraction" ? (
              <TextField
                label="Change water every"
                name="intervalDays"
                inputMode="decimal"
                suffix="days"
                defaultValue={value("intervalDays")}
                error={errors.intervalDays}
                className="figure"
              />
            ) : lever === "waterChangeInterval" ? (
              <TextField
                label="Share changed each time"
                name="fractionPercent"
                inputMode="decimal"
                suffix="%"
                defaultValue={value("fractionPercent")}
                error={errors.fractionPercent}
                className="figure"
              />
            ) : null}
          </div>
          <button type="submit" className="btn" disabled={busy || jobActive(job)}>
            Find it
          </button>
        </Form>
      ) : (
        <FormMessage>The saved settings of this scenario can no longer be read.</FormMessage>
      )}
      {job ? (
        <section aria-labelledby="target-result" className="card space-y-3">
          <h2 id="target-result" className="text-lg">
            {result ? `For ${result.goalText}` : "Searching"}
          </h2>
          <JobProgress job={job} />
          {result ? (
            <div className="space-y-3" data-status={result.status}>
              <p
                className={`font-semibold ${result.status === "infeasible" || result.status === "unavailable" ? "text-red-900" : "text-fern-900"}`}
              >
                {result.headline}
              </p>
              {result.details.map((d, i) => (
                <p key={i} className="text-sm text-stone-700">
                  {d}
                </p>
              ))}
              {result.alternatives.length ? (
                <div className="text-sm">
                  <p className="font-semibold">What would, on its own:</p>
                  <ul className="list-disc space-y-1 pl-5">
                    {result.alternatives.map((a) => (
                      <li key={a.id} className={a.works ? "" : "text-stone-600"}>
                        <span className="font-semibold">{a.label}:</span> {a.text}
                      </li>
                    ))}
                  </ul>
                </div>
              ) : null}
              {result.save ? (
                <Form method="post" className="flex flex-wrap items-end gap-3 border-t border-stone-200 pt-3">
                  <input type="hidden" name="intent" value="save" />
                  <input type="hidden" name="lever" value={result.save.lever} />
                  <input type="hidden" name="value" value={result.save.value} />
                  {result.save.intervalDays !== undefined ? (
                    <input type="hidden" name="intervalDays" value={result.save.intervalDays} />
                  ) : null}
                  {result.save.fraction !== undefined ? (
                    <input type="hidden" name="fraction" value={result.save.fraction} />
                  ) : null}
                  <div className="min-w-[16rem] flex-1">
                    <TextField
                      label="Name of the new scenario"
                      name="name"
                      maxLength={120}
                      defaultValue={`${scenario.name} (meets the goal)`}
                      error={errors.name}
                    />
                  </div>
                  <button type="submit" className="btn" disabled={busy}>
                    Save it as a new scenario
                  </button>
                </Form>
              ) : null}
            </div>
          ) : null}
        </section>
      ) : null}
      <CautionsPanel
        tapNitrateAboveDrinkingLimit={loaderData.tapAboveLimit}
        tapNitrateText={`${formatNumber(loaderData.tapNitrate)} ${labels.nitrate}`}
        limitText={`${formatNumber(loaderData.tapLimit)} ${labels.nitrate}`}
      />
    </div>
  );
}
