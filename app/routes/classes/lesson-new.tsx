import { Form, Link, redirect, useNavigation } from "react-router";
import { z } from "zod";
import type { Route } from "./+types/lesson-new";
import { fieldText } from "~/components/settings-summary";
import { FormMessage, SelectField, TextField } from "~/components/ui/field";
import {
  educatorScenarios,
  formFieldGroups,
  insertLesson,
  lessonFieldNames,
  PLANT_GROUPS_FIELD,
  requireOwnClass,
} from "~/features/classes/classes.server";
import { requireRole } from "~/permissions.server";
import { buildScenarioForm } from "~/features/scenarios/scenario-form.server";
import type { SessionUser } from "~/session.server";
import { readStoredSettings, withTankTargets } from "~/features/runs/simulation.server";
import { requireOwnedScenarioById } from "~/features/tanks/tanks.server";
import { displayUnitsFor } from "~/utils/display-units";
import { fieldErrors, formValues } from "~/utils/form-errors";
import { invalid, readForm } from "~/http/pages.server";
import { Breadcrumbs } from "~/components/breadcrumbs";

export const meta: Route.MetaFunction = ({ data }) => [
  { title: `New lesson · ${data?.cls.name ?? "Class"} · Fernwater` },
];

/** The chosen scenario's settings (frozen into the lesson) and the fields it offers to unlock. */
function chosen(user: SessionUser, scenarioParam: string | null) {
  if (!scenarioParam) return null;
  const { tank, scenario } = requireOwnedScenarioById(user.id, scenarioParam);
  const stored = readStoredSettings(scenario.settings);
  if (!stored) return null;
  const settings = withTankTargets(stored, tank);
  return { scenario, settings, model: buildScenarioForm(scenario.name, settings, displayUnitsFor(user)) };
}

export async function loader({ request, params }: Route.LoaderArgs) {
  const user = await requireRole(request, "educator");
  const cls = requireOwnClass(user, params.classId);
  const pick = chosen(user, new URL(request.url).searchParams.get("scenario"));
  return {
    cls: { id: cls.id, name: cls.name },
    scenarios: educatorScenarios(user.id).map((s) => ({ value: String(s.id), label: `${s.name} (${s.tankName})` })),
    pick: pick
      ? {
          id: pick.scenario.id,
          name: pick.scenario.name,
          groups: formFieldGroups(pick.model).map((g) => ({
            title: g.title,
            fields: g.fields.map((f) => ({
              name: f.name,
              label: f.label,
              value: fieldText(f),
              unit: f.kind === "boolean" || f.kind === "enum" ? "" : f.unit,
            })),
          })),
        }
      : null,
  };
}

const LessonSchema = z.object({
  scenarioId: z.coerce.number({ error: "Choose a scenario." }).int().positive("Choose a scenario."),
  title: z
    .string({ error: "Give the lesson a title." })
    .trim()
    .min(1, "Give the lesson a title.")
    .max(120, "Keep the title under 120 characters."),
  question: z
    .string({ error: "Write the question students answer." })
    .trim()
    .min(1, "Write the question students answer.")
    .max(2000, "Keep the question under 2,000 characters."),
});

export async function action({ request, params }: Route.ActionArgs) {
  const user = await requireRole(request, "educator");
  const cls = requireOwnClass(user, params.classId);
  const form = await readForm(request);
  const values = formValues(form);
  const parsed = LessonSchema.safeParse(values);
  if (!parsed.success) return invalid(fieldErrors(parsed.error), values);
  const pick = chosen(user, String(parsed.data.scenarioId));
  if (!pick) return invalid({ scenarioId: "The settings of that scenario can no longer be read." }, values);
  const allowed = lessonFieldNames(pick.settings, displayUnitsFor(user));
  allowed.add(PLANT_GROUPS_FIELD);
  const unlocked = [...new Set(form.getAll("unlock").map(String))];
  const unknown = unlocked.filter((name) => !allowed.has(name));
  if (unknown.length) return invalid({ unlock: `Unknown settings: ${unknown.slice(0, 3).join(", ")}.` }, values);
  const lessonId = insertLesson({
    classId: cls.id,
    scenarioId: pick.scenario.id,
    title: parsed.data.title,
    question: parsed.data.question,
    unlockedFields: unlocked,
    settings: pick.settings,
  });
  return redirect(`/classes/${cls.id}/lessons/${lessonId}`);
}

export default function NewLessonPage({ loaderData, actionData }: Route.ComponentProps) {
  const { cls, scenarios, pick } = loaderData;
  const busy = useNavigation().state === "submitting";
  const errors = actionData?.errors ?? {};
  const values = actionData?.values ?? {};
  return (
    <div className="max-w-4xl space-y-6">
      <Breadcrumbs
        trail={[
          { to: "/classes", label: "Classes" },
          { to: `/classes/${cls.id}`, label: cls.name },
        ]}
        current="New lesson"
      />
      <h1 className="text-2xl">New lesson for {cls.name}</h1>
      {scenarios.length === 0 ? (
        <FormMessage tone="info">
          A lesson hands out one of your scenarios. You have none yet:{" "}
          <Link to="/tanks" className="link">
            make one in a tank
          </Link>{" "}
          first.
        </FormMessage>
      ) : (
        <Form method="get" className="card flex flex-wrap items-end gap-3">
          <div className="min-w-0 flex-1">
            <SelectField
              label="1. Scenario to hand out"
              name="scenario"
              options={scenarios}
              defaultValue={pick ? String(pick.id) : undefined}
            />
          </div>
          <button type="submit" className="btn-secondary">
            Use this scenario
          </button>
        </Form>
      )}
      {pick ? (
        <Form method="post" className="space-y-4" noValidate>
          {errors[""] ? <FormMessage>{errors[""]}</FormMessage> : null}
          <input type="hidden" name="scenarioId" value={pick.id} />
          <div className="card space-y-4">
            <h2 className="text-lg">2. Title and question</h2>
            <TextField
              label="Lesson title"
              name="title"
              maxLength={120}
              defaultValue={values.title ?? pick.name}
              error={errors.title}
            />
            <div className="space-y-1">
              <label htmlFor="question" className="block text-sm font-semibold text-stone-800">
                Question for the students
              </label>
              <textarea
                id="question"
                name="question"
                rows={3}
                maxLength={2000}
                defaultValue={values.question}
                className="input"
                aria-invalid={errors.question ? true : undefined}
                aria-describedby={errors.question ? "question-error" : undefined}
              />
              {errors.question ? (
                <p id="question-error" className="text-sm font-semibold text-red-800" role="alert">
                  {errors.question}
                </p>
              ) : null}
            </div>
          </div>
          <fieldset className="card space-y-4">
            <legend className="sr-only">Settings students may change</legend>
            <h2 className="text-lg" aria-hidden="true">
              3. Settings students may change
            </h2>
            <p className="text-sm text-stone-700">
              Everything not ticked is locked: students see it but cannot change it. The values are frozen now, so later
              edits of your scenario do not move the lesson.
            </p>
            {errors.unlock ? (
              <p className="text-sm font-semibold text-red-800" role="alert">
                {errors.unlock}
              </p>
            ) : null}
            <label className="flex items-start gap-2">
              <input type="checkbox" name="unlock" value="plants" className="mt-1 h-4 w-4 accent-fern-700" />
              <span>
                <span className="font-semibold">Students may add and remove plant groups</span>
                <span className="block text-xs text-stone-600">Also frees every plant setting.</span>
              </span>
            </label>
            {pick.groups.map((g) => (
              <details
                key={g.title}
                className="rounded-md border border-stone-200 p-3"
                open={g.title === "Fish & feeding"}
              >
                <summary className="cursor-pointer font-semibold text-fern-900">{g.title}</summary>
                <div className="mt-2 grid gap-2 sm:grid-cols-2">
                  {g.fields.map((f) => (
                    <label key={f.name} className="flex items-start gap-2 text-sm">
                      <input type="checkbox" name="unlock" value={f.name} className="mt-1 h-4 w-4 accent-fern-700" />
                      <span>
                        {f.label}{" "}
                        <span className="text-xs text-stone-600">
                          (now {f.value}
                          {f.unit ? ` ${f.unit}` : ""})
                        </span>
                      </span>
                    </label>
                  ))}
                </div>
              </details>
            ))}
          </fieldset>
          <button type="submit" className="btn" disabled={busy}>
            Create the lesson
          </button>
        </Form>
      ) : null}
    </div>
  );
}
