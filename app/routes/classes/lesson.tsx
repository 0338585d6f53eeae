import { data, Form, Link, redirect, useNavigation } from "react-router";
import type { Route } from "./+types/lesson";
import { FormMessage } from "~/components/ui/field";
import {
  findCopy,
  handInTable,
  openSettingLabels,
  READ_ONLY_CLASS,
  requireClassAccess,
  requireLesson,
  startCopy,
} from "~/features/classes/classes.server";
import { displayKeyFigures, toxicPeaksAboveCaution } from "~/features/runs/display-figures";
import { AboveCaution, peakCell } from "~/components/above-caution";
import { requireUser } from "~/permissions.server";
import { displayUnitsFor, formatNumber, unitLabels } from "~/utils/display-units";
import { invalid, readForm, refusedForm } from "~/http/pages.server";
import { formValues } from "~/utils/form-errors";
import { Breadcrumbs } from "~/components/breadcrumbs";
import { ScrollTable } from "~/components/ui/scroll-table";

export const meta: Route.MetaFunction = ({ data }) => [{ title: `${data?.lesson.title ?? "Lesson"} · Fernwater` }];

export async function loader({ request, params }: Route.LoaderArgs) {
  const user = await requireUser(request);
  const { cls, as } = requireClassAccess(user, params.classId);
  const lesson = requireLesson(cls, params.lessonId);
  const base = {
    cls: { id: cls.id, name: cls.name },
    lesson: { id: lesson.id, title: lesson.title, question: lesson.question },
  };
  if (as === "former educator") {
    // Read-only: the lesson's question, not the students' hand-ins.
    return {
      ...base,
      as,
      started: false,
      handedIn: false,
      handIns: null,
      labels: null,
      openSettings: openSettingLabels(lesson.unlockedFields),
    };
  }
  if (as === "student") {
    const copy = findCopy(lesson.id, user.id);
    return {
      ...base,
      as,
      started: !!copy,
      handedIn: !!copy?.handedInAt,
      handIns: null,
      labels: null,
      openSettings: openSettingLabels(lesson.unlockedFields),
    };
  }
  const units = displayUnitsFor(user);
  return {
    ...base,
    as,
    started: false,
    handedIn: false,
    labels: unitLabels(units),
    openSettings: openSettingLabels(lesson.unlockedFields),
    handIns: handInTable(cls, lesson).map((row) => ({
      student: row.student,
      copy: row.copy
        ? {
            id: row.copy.id,
            answer: row.copy.answer,
            handedInAt: row.copy.handedInAt ? row.copy.handedInAt.toISOString().slice(0, 16).replace("T", " ") : null,
            figures: row.copy.keyFigures ? displayKeyFigures(row.copy.keyFigures, units) : null,
            above: row.copy.keyFigures ? toxicPeaksAboveCaution(row.copy.keyFigures) : null,
          }
        : null,
    })),
  };
}

export async function action({ request, params }: Route.ActionArgs) {
  const user = await requireUser(request);
  const { cls, as } = requireClassAccess(user, params.classId);
  if (as === "former educator") throw data({ message: READ_ONLY_CLASS }, { status: 403 });
  const lesson = requireLesson(cls, params.lessonId);
  const values = formValues(await readForm(request));
  if (values.intent !== "start") return invalid({ "": "Unknown action." }, values);
  if (as !== "student") return invalid({ "": "Only students of the class start a copy of the lesson." }, values);
  try {
    const copy = await startCopy(user, cls, lesson);
    if (!copy)
      return invalid(
        { "": "The lesson’s settings can no longer be read. Ask your teacher to hand it out again." },
        values,
      );
  } catch (error) {
    return refusedForm(error, values);
  }
  return redirect(`/classes/${cls.id}/lessons/${lesson.id}/work`);
}

const READ_ONLY_CLASS_TEXT =
  "You are no longer an educator, so this lesson is read-only and its hand-ins are hidden. An admin can hand the class to another educator.";

export default function LessonPage({ loaderData, actionData }: Route.ComponentProps) {
  const { cls, lesson, as, started, handedIn, handIns, labels, openSettings } = loaderData;
  const busy = useNavigation().state === "submitting";
  const base = `/classes/${cls.id}/lessons/${lesson.id}`;
  return (
    <div className="space-y-6">
      <Breadcrumbs
        trail={[
          { to: "/classes", label: "Classes" },
          { to: `/classes/${cls.id}`, label: cls.name },
        ]}
        current={lesson.title}
      />
      <h1 className="text-2xl">{lesson.title}</h1>
      <section aria-labelledby="question-title" className="card space-y-2">
        <h2 id="question-title" className="text-lg">
          Question
        </h2>
        <p className="whitespace-pre-line">{lesson.question}</p>
        <OpenSettings names={openSettings} />
      </section>
      {actionData?.errors[""] ? <FormMessage>{actionData.errors[""]}</FormMessage> : null}
      {as === "former educator" ? (
        <FormMessage tone="info">{READ_ONLY_CLASS_TEXT}</FormMessage>
      ) : as === "student" ? (
        started ? (
          <p className="flex flex-wrap items-center gap-3">
            <Link to={`${base}/work`} className="btn">
              {handedIn ? "See what you handed in" : "Continue the lesson"}
            </Link>
          </p>
        ) : (
          <Form method="post" className="space-y-2">
            <p className="text-sm text-stone-700">
              You get your own copy of the teacher’s scenario, in a tank of yours for this class. Change the settings
              the lesson leaves open, run it, and hand in your answer.
            </p>
            <input type="hidden" name="intent" value="start" />
            <button type="submit" className="btn" disabled={busy}>
              {busy ? "Making your copy…" : "Start the lesson"}
            </button>
          </Form>
        )
      ) : (
        <>
          <p className="flex flex-wrap items-center gap-3 text-sm">
            <Link to={`${base}/present`} className="btn">
              Present to the class
            </Link>
          </p>
          <section aria-labelledby="handins-title" className="space-y-2">
            <h2 id="handins-title" className="text-lg">
              Hand-ins
            </h2>
            {handIns && handIns.length === 0 ? <p className="text-sm">No students in the class yet.</p> : null}
            {handIns && handIns.length > 0 && labels ? (
              <ScrollTable label="Hand-ins table">
                <table className="w-full min-w-[44rem] border-collapse text-sm">
                  <caption className="sr-only">Each student’s copy with its key figures</caption>
                  <thead>
                    <tr className="border-b border-stone-300 text-left align-bottom">
                      <th scope="col" className="py-2 pr-3">
                        Student
                      </th>
                      <th scope="col" className="py-2 pr-3">
                        Handed in
                      </th>
                      <th scope="col" className="py-2 pr-3 text-right">
                        Nitrate at the end<span className="block text-xs font-normal">{labels.nitrate}</span>
                      </th>
                      <th scope="col" className="py-2 pr-3 text-right">
                        Peak free ammonia<span className="block text-xs font-normal">{labels.ammonia}</span>
                      </th>
                      <th scope="col" className="py-2 pr-3 text-right">
                        Peak nitrite<span className="block text-xs font-normal">{labels.nitrite}</span>
                      </th>
                      <th scope="col" className="py-2 pr-3 text-right">
                        Cycling finished
                      </th>
                      <th scope="col" className="py-2 pr-3">
                        Answer
                      </th>
                      <th scope="col" className="py-2">
                        <span className="sr-only">Open</span>
                      </th>
                    </tr>
                  </thead>
                  <tbody>
                    {handIns.map((row) => (
                      <tr key={row.student.id} className="border-b border-stone-200 align-top">
                        <th scope="row" className="py-2 pr-3 text-left font-semibold">
                          {row.student.name}
                        </th>
                        <td className="py-2 pr-3">{row.copy ? (row.copy.handedInAt ?? "started") : "not started"}</td>
                        <td className="num py-2 pr-3 text-right">{formatNumber(row.copy?.figures?.nitrateEnd)}</td>
                        <td className={peakCell(row.copy?.above?.peakFreeNh3)}>
                          {formatNumber(row.copy?.figures?.peakFreeNh3.value)}
                          <AboveCaution above={row.copy?.above?.peakFreeNh3} />
                        </td>
                        <td className={peakCell(row.copy?.above?.peakNitrite)}>
                          {formatNumber(row.copy?.figures?.peakNitrite.value)}
                          <AboveCaution above={row.copy?.above?.peakNitrite} />
                        </td>
                        <td className="num py-2 pr-3 text-right">
                          {row.copy?.figures
                            ? row.copy.figures.cyclingFinishedDay === null
                              ? "not yet"
                              : `day ${formatNumber(row.copy.figures.cyclingFinishedDay)}`
                            : "–"}
                        </td>
                        <td className="max-w-xs py-2 pr-3">
                          <span className="line-clamp-3">{row.copy?.answer ?? ""}</span>
                        </td>
                        <td className="py-2">
                          {row.copy ? (
                            <Link to={`${base}/copies/${row.copy.id}`} className="link">
                              Open<span className="sr-only"> {row.student.name}’s copy</span>
                            </Link>
                          ) : null}
                        </td>
                      </tr>
                    ))}
                  </tbody>
                </table>
              </ScrollTable>
            ) : null}
          </section>
        </>
      )}
    </div>
  );
}

/** The settings the lesson leaves open to students, named (the rest stay as the teacher set them). */
function OpenSettings({ names }: { names: string[] }) {
  if (names.length === 0)
    return <p className="text-sm text-stone-700">Every setting is locked: students change none.</p>;
  return (
    <div className="text-sm text-stone-700" data-open-settings="">
      <p>
        {names.length === 1 ? "One setting is" : `${names.length} settings are`} open to students; every other stays as
        the lesson sets it:
      </p>
      <ul className="ml-5 list-disc">
        {names.map((n) => (
          <li key={n}>{n}</li>
        ))}
      </ul>
    </div>
  );
}
