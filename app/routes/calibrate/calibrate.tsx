import { Link, redirect, useNavigation, useSearchParams } from "react-router";
import type { Route } from "./+types/calibrate";
import { CalibrationReport } from "~/components/calibration-report";
import { jobActive, JobProgress, useJob } from "~/components/job-progress";
import { FormMessage } from "~/components/ui/field";
import { CalibrationSetup } from "~/components/calibration-setup";
import { calibrationJob } from "~/features/calibration/calibration.server";
import { assessCalibration, inferredKits } from "~/features/calibration/calibration-assess.server";
import { scenarioBases, SCHEDULE_TEXT } from "~/features/calibration/calibration-basis.server";
import { CalibrateInputSchema, kitsFromForm, SaveFittedSchema } from "~/features/calibration/calibration-input.server";
import { MULTIPLIER_LABELS } from "~/features/calibration/calibration-report.server";
import type { CalibrationJson } from "~/features/calibration/calibration-json";
import { cancelJob, findScenarioJob, jobJson, startJob } from "~/features/jobs/jobs.server";
import { requireUser } from "~/permissions.server";
import {
  countCalibrationReadingsBefore,
  countReadings,
  modelStartMs,
  readingsForCalibration,
} from "~/features/readings/readings.server";
import { readStoredSettings } from "~/features/runs/simulation.server";
import { requireOwnedScenario } from "~/features/tanks/tanks.server";
import { formatDate } from "~/utils/dates";
import { displayUnitsFor } from "~/utils/display-units";
import { fieldErrors, formValues } from "~/utils/form-errors";
import { invalid, readForm, refusedForm } from "~/http/pages.server";
import { MULTIPLIER_KEYS, withMultipliers } from "~models/nitrogen/calibrate";
import { saveScenarioVariant } from "~/features/scenarios/scenario-variant.server";
import { Breadcrumbs } from "~/components/breadcrumbs";
import { NO_GOOD_FIT_SAVE } from "~/components/calibration-report";

export const meta: Route.MetaFunction = ({ data }) => [
  { title: `Calibrate · ${data?.scenario.name ?? "Scenario"} · Fernwater` },
];

async function context(request: Request, params: Route.LoaderArgs["params"]) {
  const user = await requireUser(request);
  const { tank, scenario: row } = requireOwnedScenario(user.id, params.tankId, params.scenarioId);
  const settings = readStoredSettings(row.settings);
  const startMs = modelStartMs(row);
  // The journal replayed "as it happened" with this scenario as the tank's description, when there
  // is one; the check and the fit run on it by default (calibration-basis.server.ts).
  const bases = settings ? scenarioBases(tank, settings, startMs) : null;
  const replay = bases?.replay ?? null;
  const basisFor = (choice: string | null | undefined) => bases?.basisFor(choice) ?? null;
  return { user, tank, row, settings, startMs, replay, basisFor };
}

export async function loader({ request, params }: Route.LoaderArgs) {
  const { user, tank, row, settings, startMs, replay, basisFor } = await context(request, params);
  const job = findScenarioJob(user.id, request, "calibration", row.id);
  const basis = basisFor(new URL(request.url).searchParams.get("schedule"));
  const lengthDays = settings?.run.lengthDays ?? 0;
  const hasPlants = (settings?.plants.length ?? 0) > 0;
  const units = displayUnitsFor(user);
  const candidates = MULTIPLIER_KEYS.filter((k) => hasPlants || k !== "plantUptake");
  // Which multipliers the readings can tell (a few short runs) on what the fit will run on, so only those start ticked.
  const assessment = basis && !job ? await assessCalibration(user, tank.id, basis, units, candidates) : null;
  return {
    tank: { id: tank.id, name: tank.name },
    scenario: { id: row.id, name: row.name },
    readable: settings !== null,
    startDate: formatDate(startMs),
    lengthDays,
    inRun: settings ? readingsForCalibration(tank.id, startMs, lengthDays).length : 0,
    total: countReadings(tank.id),
    journal: replay
      ? {
          from: formatDate(replay.startMs),
          readings: readingsForCalibration(tank.id, replay.startMs, replay.lengthDays).length,
          // Readings from before the first entry have no journal to replay against: said, not dropped silently.
          before: countCalibrationReadingsBefore(tank.id, replay.startMs),
        }
      : null,
    hasPlants,
    multipliers: MULTIPLIER_KEYS.map((k) => ({
      key: k,
      ...MULTIPLIER_LABELS[k],
      value: settings?.multipliers[k] ?? 1,
      assessment: assessment?.multipliers.find((m) => m.key === k) ?? null,
    })),
    kits: assessment?.kits ?? (basis ? inferredKits(tank.id, basis, units) : []),
    schedule: basis?.schedule.kind ?? null,
    checkedAgainst: assessment && basis ? SCHEDULE_TEXT[basis.schedule.kind] : null,
    units: { tan: units.ammonia, no2: units.nitrite, no3: units.nitrate },
    job: job ? jobJson(job) : null,
    fit: job ? (job.params as { fit: string[] }).fit : null,
  };
}

export async function action({ request, params }: Route.ActionArgs) {
  const { user, tank, row, settings, startMs, replay, basisFor } = await context(request, params);
  const form = await readForm(request);
  const values = formValues(form);
  const here = `/tanks/${tank.id}/scenarios/${row.id}/calibrate`;
  if (values.intent === "cancel") {
    cancelJob(user.id, values.jobId ?? "");
    return redirect(`${here}?job=${encodeURIComponent(values.jobId ?? "")}`);
  }
  if (!settings) return invalid({ "": "The saved settings of this scenario can no longer be read." }, values);
  if (values.intent === "start") {
    const units = displayUnitsFor(user);
    const { kits, errors } = kitsFromForm(values, units);
    const input = CalibrateInputSchema.safeParse({ fit: form.getAll("fit"), kits });
    if (!input.success) return invalid({ fit: input.error.issues[0].message, ...errors }, values);
    if (Object.keys(errors).length) return invalid(errors, values);
    const onJournal = (values.schedule ?? (replay ? "journal" : "periodic")) === "journal";
    if (onJournal && !replay)
      return invalid({ schedule: "This tank's journal is empty: log what you did first." }, values);
    if (values.schedule !== undefined && !["journal", "periodic"].includes(values.schedule))
      return invalid({ schedule: "Choose the journal or the scenario's schedule." }, values);
    try {
      const basis = basisFor(values.schedule)!;
      const job = startJob(calibrationJob(user, row, tank.id, basis, input.data.fit, units, input.data.kits));
      return redirect(`${here}?job=${job.id}`);
    } catch (error) {
      return refusedForm(error, values);
    }
  }
  if (values.intent === "save") {
    // A fit the report calls "no good fit" has multipliers no reading supports: not saved from its page.
    const fit = findScenarioJob(user.id, request, "calibration", row.id)?.result as CalibrationJson | undefined;
    if (fit?.fitQuality && !fit.fitQuality.good) return invalid({ "": NO_GOOD_FIT_SAVE }, values);
    const parsed = SaveFittedSchema.safeParse(values);
    if (!parsed.success) return invalid(fieldErrors(parsed.error), values);
    const { name, ...multipliers } = parsed.data;
    try {
      const id = await saveScenarioVariant(tank, row.id, startMs, name, withMultipliers(settings, multipliers));
      return redirect(`/tanks/${tank.id}/scenarios/${id}`);
    } catch (error) {
      return refusedForm(error, values);
    }
  }
  return invalid({ "": "Unknown action." }, values);
}

export default function CalibratePage({ loaderData, actionData }: Route.ComponentProps) {
  const { tank, scenario, startDate, lengthDays, inRun, total, hasPlants, multipliers, readable, kits } = loaderData;
  const job = useJob(loaderData.job);
  const busy = useNavigation().state === "submitting";
  const [, setSearch] = useSearchParams();
  const errors = actionData?.errors ?? {};
  const values = actionData?.values ?? {};
  const assessed = multipliers.some((m) => m.assessment);
  // Pre-tick what the readings can tell; without an assessment, the old defaults.
  const chosen = new Set(
    loaderData.fit ??
      (assessed
        ? multipliers.filter((m) => m.assessment?.determinable).map((m) => m.key)
        : hasPlants
          ? ["feedLoad", "plantUptake", "nitrifierCapacity"]
          : ["feedLoad", "nitrifierCapacity"]),
  );
  const result = job?.status === "done" ? (job.result as CalibrationJson) : null;
  return (
    <div className="space-y-6">
      <Breadcrumbs
        trail={[
          { to: "/tanks", label: "Tanks" },
          { to: `/tanks/${tank.id}`, label: tank.name },
          { to: `/tanks/${tank.id}/scenarios/${scenario.id}`, label: scenario.name },
        ]}
        current="Calibrate"
      />
      <h1 className="text-2xl">Calibrate {scenario.name} against your readings</h1>
      <p className="text-sm text-stone-700">
        Calibration adjusts a few multipliers of the model until its curves explain your test results as well as they
        can, taking each kit’s colour steps as ranges rather than exact numbers, and says which multipliers your
        readings really tell. Day 0 of this scenario is {startDate}; its run covers {lengthDays} days.{" "}
        <strong>{inRun}</strong> of the tank’s {total} readings fall within it.{" "}
        <Link className="link" to={`/tanks/${tank.id}/readings`}>
          Readings
        </Link>{" "}
        ·{" "}
        <Link className="link" to={`/tanks/${tank.id}/scenarios/${scenario.id}/edit?open=run#f-startDate`}>
          Change the start date
        </Link>
      </p>
      {errors[""] ? <FormMessage>{errors[""]}</FormMessage> : null}
      {readable ? (
        <CalibrationSetup
          multipliers={multipliers}
          hasPlants={hasPlants}
          chosen={chosen}
          kits={kits}
          errors={errors}
          values={values}
          inRun={inRun}
          journal={loaderData.journal}
          schedule={loaderData.schedule}
          checkedAgainst={loaderData.checkedAgainst}
          onSchedule={(schedule) =>
            setSearch((q) => (q.set("schedule", schedule), q), { replace: true, preventScrollReset: true })
          }
          disabled={busy || (inRun === 0 && !loaderData.journal) || jobActive(job)}
        />
      ) : (
        <FormMessage>The saved settings of this scenario can no longer be read.</FormMessage>
      )}
      {job ? (
        <section aria-labelledby="fit-title" className="card space-y-4">
          <h2 id="fit-title" className="text-lg">
            {result ? "The fit" : "Fitting"}
          </h2>
          <JobProgress job={job} />
          {result?.schedule ? <p className="text-sm">Fitted against {result.schedule}.</p> : null}
          {result ? <CalibrationReport result={result} errors={errors} values={actionData?.values ?? {}} /> : null}
        </section>
      ) : null}
    </div>
  );
}
