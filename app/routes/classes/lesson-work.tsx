import { useMemo, useState } from "react";
import { Form, redirect, useNavigation, useSearchParams } from "react-router";
import { z } from "zod";
import type { Route } from "./+types/lesson-work";
import { ReadOnlyResults } from "~/components/read-only-results";
import { ScenarioForm } from "~/components/scenario-form";
import { FormMessage } from "~/components/ui/field";
import {
  copyScenario,
  findCopy,
  handIn,
  lessonEnforcer,
  lockedNames,
  PLANT_GROUPS_FIELD,
  requireClassAccess,
  requireLesson,
} from "~/features/classes/classes.server";
import { notFound, requireUser } from "~/permissions.server";
import { readOnlyScenarioView } from "~/features/runs/read-only-view.server";
import { buildScenarioForm } from "~/features/scenarios/scenario-form.server";
import { readStoredSettings } from "~/features/runs/simulation.server";
import { displayUnitsFor } from "~/utils/display-units";
import { fieldErrors, formValues } from "~/utils/form-errors";
import { invalid, readForm } from "~/http/pages.server";
import { handleSetupSubmission, unitsSummary } from "~/features/scenarios/scenario-setup.server";
import { Breadcrumbs } from "~/components/breadcrumbs";

export const meta: Route.MetaFunction = ({ data }) => [
  { title: `${data?.lesson.title ?? "Lesson"} · your copy · Fernwater` },
];

/** The signed-in student's copy of the lesson; 404 for anyone but a member who started it. */
async function studentCopy(request: Request, params: { classId?: string; lessonId?: string }) {
  const user = await requireUser(request);
  const { cls, as } = requireClassAccess(user, params.classId);
  if (as !== "student") notFound("Only the class’s students have copies of its lessons.");
  const lesson = requireLesson(cls, params.lessonId);
  const copy = findCopy(lesson.id, user.id);
  return { user, cls, lesson, copy };
}

export async function loader({ request, params }: Route.LoaderArgs) {
  const { user, cls, lesson, copy } = await studentCopy(request, params);
  if (!copy) throw redirect(`/classes/${cls.id}/lessons/${lesson.id}`);
  const { scenario, tank } = copyScenario(copy);
  const units = displayUnitsFor(user);
  const settings = readStoredSettings(scenario.settings);
  const form = settings ? buildScenarioForm(scenario.name, settings, units) : null;
  const unlocked = new Set(lesson.unlockedFields);
  const plantGroupsFree = unlocked.has(PLANT_GROUPS_FIELD);
  // Open the sections that hold something the student may change.
  const openSections = form
    ? form.sections
        .filter((s) =>
          s.id === "plants"
            ? plantGroupsFree || form.plants.some((p) => p.fields.some((f) => unlocked.has(f.name)))
            : s.fields.some((f) => unlocked.has(f.name)),
        )
        .map((s) => s.id)
    : [];
  return {
    cls: { id: cls.id, name: cls.name },
    lesson: { id: lesson.id, title: lesson.title, question: lesson.question },
    scenario: { name: scenario.name },
    form,
    locked: form ? [...lockedNames(form, lesson.unlockedFields)] : [],
    plantGroupsFree,
    openSections: openSections.length ? openSections : ["water"],
    view: await readOnlyScenarioView(scenario, tank, units),
    handedIn: copy.handedInAt
      ? { at: copy.handedInAt.toISOString().slice(0, 16).replace("T", " "), answer: copy.answer ?? "" }
      : null,
    unitsNote: unitsSummary(units),
  };
}

const HandInSchema = z.object({
  intent: z.literal("hand-in"),
  answer: z
    .string({ error: "Write your answer first." })
    .trim()
    .min(1, "Write your answer first.")
    .max(4000, "Keep the answer under 4,000 characters."),
});

export async function action({ request, params }: Route.ActionArgs) {
  const { user, cls, lesson, copy } = await studentCopy(request, params);
  if (!copy) notFound("Start the lesson first.");
  const form = await readForm(request);
  const values = formValues(form);
  const here = `/classes/${cls.id}/lessons/${lesson.id}/work`;
  if (copy.handedInAt) return invalid({ "": "You handed this lesson in; it can no longer change." }, values);

  if (values.intent === "hand-in") {
    const parsed = HandInSchema.safeParse(values);
    if (!parsed.success) return invalid(fieldErrors(parsed.error), values);
    if (!handIn(copy.id, parsed.data.answer)) return invalid({ "": "You handed this lesson in already." }, values);
    return redirect(`${here}?handedIn=1`);
  }

  const intent = values.intent ?? "save";
  const plantsFree = lesson.unlockedFields.includes(PLANT_GROUPS_FIELD);
  if (!plantsFree && (intent === "add-plant" || intent.startsWith("remove-plant:"))) {
    return invalid({ "": "This lesson fixes the plant groups: they cannot be added or removed." }, values);
  }
  if (intent !== "save" && intent !== "add-plant" && !intent.startsWith("remove-plant:")) {
    return invalid({ "": "Unknown action." }, values);
  }
  const { scenario, tank } = copyScenario(copy);
  const baseline = readStoredSettings(scenario.settings) ?? undefined;
  const outcome = await handleSetupSubmission(form, user, tank, scenario.id, baseline, lessonEnforcer(lesson));
  if ("scenarioId" in outcome) return redirect(`${here}?saved=1#results`);
  return outcome;
}

export default function LessonWorkPage({ loaderData, actionData }: Route.ComponentProps) {
  const { cls, lesson, scenario, view, handedIn, locked, plantGroupsFree, openSections, unitsNote } = loaderData;
  const busy = useNavigation().state === "submitting";
  const [params] = useSearchParams();
  const lockedSet = useMemo(() => new Set(locked), [locked]);
  const setupData = actionData && "form" in actionData ? actionData : null;
  const failure = actionData && "values" in actionData ? actionData : null;
  const form = setupData?.form ?? loaderData.form;
  // Settings changed since the form came from the server and not yet saved: handing in now would
  // leave them out, so the hand-in says so first. Saving brings a new form, which clears this.
  const [changedForm, setChangedForm] = useState<typeof form>(null);
  const unsaved = !!form && changedForm === form;
  return (
    <div className="space-y-6">
      <Breadcrumbs
        trail={[
          { to: "/classes", label: "Classes" },
          { to: `/classes/${cls.id}`, label: cls.name },
          { to: `/classes/${cls.id}/lessons/${lesson.id}`, label: lesson.title },
        ]}
        current="Your copy"
      />
      <h1 className="text-2xl">{lesson.title}: your copy</h1>
      <section aria-labelledby="question-title" className="card space-y-2">
        <h2 id="question-title" className="text-lg">
          Question
        </h2>
        <p className="whitespace-pre-line">{lesson.question}</p>
      </section>
      {failure?.errors[""] ? <FormMessage>{failure.errors[""]}</FormMessage> : null}
      {params.get("saved") === "1" && !actionData && !handedIn ? (
        <FormMessage tone="success">
          Saved and run.{" "}
          <a href="#results" className="link">
            See your results
          </a>
        </FormMessage>
      ) : null}
      {handedIn ? (
        <FormMessage tone="success">
          Handed in {handedIn.at}. Your answer: “{handedIn.answer}”
        </FormMessage>
      ) : form ? (
        <section aria-labelledby="setup-title" className="space-y-3">
          <h2 id="setup-title" className="text-lg">
            Settings
          </h2>
          <p className="text-sm text-stone-700">
            Settings marked “locked by the lesson” stay as your teacher set them
            {plantGroupsFree ? "." : "; the plant groups are fixed too."} Change the others, then save and run.
          </p>
          <div onChange={() => setChangedForm(form)} onInput={() => setChangedForm(form)}>
            <ScenarioForm
              model={form}
              errors={setupData?.errors ?? {}}
              submitLabel="Save and run"
              locked={lockedSet}
              plantGroupsLocked={!plantGroupsFree}
              openSections={openSections}
              unitsNote={unitsNote}
            />
          </div>
        </section>
      ) : (
        <FormMessage>The settings of your copy can no longer be read. Ask your teacher.</FormMessage>
      )}
      <section id="results" aria-labelledby="results-title" className="space-y-3">
        <h2 id="results-title" className="text-xl">
          Results of your copy
        </h2>
        <ReadOnlyResults
          name={scenario.name}
          view={view}
          downloadName={`${lesson.title}-${scenario.name}`}
          showSettings={!!handedIn}
        />
      </section>
      {handedIn ? null : (
        <Form method="post" className="card space-y-3" noValidate>
          <h2 className="text-lg">Hand in</h2>
          <input type="hidden" name="intent" value="hand-in" />
          <div className="space-y-1">
            <label htmlFor="answer" className="block text-sm font-semibold text-stone-800">
              Your answer
            </label>
            <textarea
              id="answer"
              name="answer"
              rows={4}
              maxLength={4000}
              defaultValue={failure?.values.answer}
              className="input"
              aria-invalid={failure?.errors.answer ? true : undefined}
              aria-describedby={failure?.errors.answer ? "answer-error" : "answer-hint"}
            />
            <p id="answer-hint" className="text-xs text-stone-600">
              Your teacher sees your answer with your copy’s settings and results. After handing in, the copy no longer
              changes.
            </p>
            {failure?.errors.answer ? (
              <p id="answer-error" className="text-sm font-semibold text-red-800" role="alert">
                {failure.errors.answer}
              </p>
            ) : null}
          </div>
          {unsaved ? (
            <p
              className="rounded-md border border-amber-300 bg-amber-50 p-2 text-sm text-amber-900"
              role="alert"
              data-unsaved-warning=""
            >
              You changed settings without saving them. What you hand in is your copy as last saved and run, without
              those changes: press “Save and run” above first to include them.
            </p>
          ) : null}
          <button type="submit" className="btn" disabled={busy}>
            {unsaved ? "Hand in without my unsaved changes" : "Hand in"}
          </button>
        </Form>
      )}
    </div>
  );
}
