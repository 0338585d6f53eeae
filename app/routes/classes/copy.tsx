import { eq } from "drizzle-orm";
import {} from "react-router";
import type { Route } from "./+types/copy";
import { ReadOnlyResults } from "~/components/read-only-results";
import { FormMessage } from "~/components/ui/field";
import {
  changedFields,
  copyScenario,
  lockedNames,
  requireCopyOfLesson,
  requireLesson,
  requireOwnClass,
} from "~/features/classes/classes.server";
import { getDb } from "~/db/client.server";
import { users } from "~/db/schema";
import { requireUser } from "~/permissions.server";
import { readOnlyScenarioView } from "~/features/runs/read-only-view.server";
import { buildScenarioForm } from "~/features/scenarios/scenario-form.server";
import { readStoredSettings } from "~/features/runs/simulation.server";
import { displayUnitsFor } from "~/utils/display-units";
import { Breadcrumbs } from "~/components/breadcrumbs";
import { ScrollTable } from "~/components/ui/scroll-table";

export const meta: Route.MetaFunction = ({ data }) => [
  { title: `${data?.student ?? "Student"}’s copy · ${data?.lesson.title ?? "Lesson"} · Fernwater` },
];

/** The class's educator reads a student's copy: what they changed, their answer, their results. Read-only. */
export async function loader({ request, params }: Route.LoaderArgs) {
  const user = await requireUser(request);
  const cls = requireOwnClass(user, params.classId);
  const lesson = requireLesson(cls, params.lessonId);
  const copy = requireCopyOfLesson(lesson, params.copyId);
  const { scenario, tank } = copyScenario(copy);
  const units = displayUnitsFor(user);
  const student = getDb().select({ name: users.name }).from(users).where(eq(users.id, copy.studentId)).get();
  const lessonSettings = readStoredSettings(lesson.settings);
  const copySettings = readStoredSettings(scenario.settings);
  let changes = null;
  if (lessonSettings && copySettings) {
    const before = buildScenarioForm(lesson.title, lessonSettings, units);
    const after = buildScenarioForm(scenario.name, copySettings, units);
    changes = changedFields(before, after, lockedNames(before, lesson.unlockedFields));
  }
  return {
    cls: { id: cls.id, name: cls.name },
    lesson: { id: lesson.id, title: lesson.title, question: lesson.question },
    student: student?.name ?? "A student",
    scenarioName: scenario.name,
    answer: copy.answer,
    handedInAt: copy.handedInAt ? copy.handedInAt.toISOString().slice(0, 16).replace("T", " ") : null,
    changes,
    view: await readOnlyScenarioView(scenario, tank, units),
  };
}

export default function StudentCopyPage({ loaderData }: Route.ComponentProps) {
  const { cls, lesson, student, scenarioName, answer, handedInAt, changes, view } = loaderData;
  return (
    <div className="space-y-6">
      <Breadcrumbs
        trail={[
          { to: "/classes", label: "Classes" },
          { to: `/classes/${cls.id}`, label: cls.name },
          { to: `/classes/${cls.id}/lessons/${lesson.id}`, label: lesson.title },
        ]}
        current={student}
      />
      <h1 className="text-2xl">{student}’s copy</h1>
      <p className="text-sm text-stone-700">Read-only: this is the student’s own scenario.</p>
      <section aria-labelledby="answer-title" className="card space-y-2">
        <h2 id="answer-title" className="text-lg">
          Answer
        </h2>
        <p className="text-sm text-stone-600">{lesson.question}</p>
        {handedInAt ? (
          <>
            <p className="whitespace-pre-line">{answer}</p>
            <p className="text-xs text-stone-500">Handed in {handedInAt}</p>
          </>
        ) : (
          <p className="italic">Not handed in yet.</p>
        )}
      </section>
      <section aria-labelledby="changes-title" className="card space-y-2">
        <h2 id="changes-title" className="text-lg">
          What {student} changed
        </h2>
        {!changes ? (
          <FormMessage>The settings can no longer be compared.</FormMessage>
        ) : changes.fields.length === 0 && changes.plantGroups.from === changes.plantGroups.to ? (
          <p className="text-sm">Nothing yet: the copy still has the lesson’s settings.</p>
        ) : (
          <ScrollTable label="Key figures table">
            {changes.plantGroups.from !== changes.plantGroups.to ? (
              <p className="text-sm">
                Plant groups: {changes.plantGroups.from} → {changes.plantGroups.to}
              </p>
            ) : null}
            <table className="w-full min-w-[28rem] border-collapse text-sm">
              <caption className="sr-only">Settings that differ from the lesson</caption>
              <thead>
                <tr className="border-b border-stone-300 text-left">
                  <th scope="col" className="py-1 pr-3">
                    Setting
                  </th>
                  <th scope="col" className="py-1 pr-3 text-right">
                    Lesson
                  </th>
                  <th scope="col" className="py-1 pr-3 text-right">
                    {student}
                  </th>
                  <th scope="col" className="py-1">
                    Unit
                  </th>
                </tr>
              </thead>
              <tbody>
                {changes.fields.map((c) => (
                  <tr key={c.name} className="border-b border-stone-200">
                    <th scope="row" className="py-1 pr-3 text-left font-normal">
                      {c.label}
                      {c.locked ? (
                        <span className="ml-2 text-xs font-semibold text-red-800">locked in the lesson</span>
                      ) : null}
                    </th>
                    <td className="num py-1 pr-3 text-right">{c.from}</td>
                    <td className="num py-1 pr-3 text-right font-semibold">{c.to}</td>
                    <td className="py-1 text-xs text-stone-600">{c.unit}</td>
                  </tr>
                ))}
              </tbody>
            </table>
          </ScrollTable>
        )}
      </section>
      <ReadOnlyResults name={scenarioName} view={view} downloadName={`${lesson.title}-${student}`} />
    </div>
  );
}
