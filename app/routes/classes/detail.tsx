import { eq } from "drizzle-orm";
import { Form, Link, useNavigation, useSearchParams } from "react-router";
import { z } from "zod";
import type { Route } from "./+types/detail";
import { FormMessage, TextField } from "~/components/ui/field";
import {
  findCopy,
  inviteByEmail,
  listLessons,
  pendingInvites,
  removeStudent,
  requireClassAccess,
  requireOwnClass,
  roster,
} from "~/features/classes/classes.server";
import { getDb } from "~/db/client.server";
import { users } from "~/db/schema";
import { dayWriter } from "~/features/accounts/time-zone.server";
import { requireUser } from "~/permissions.server";
import { READ_ONLY_CLASS } from "~/features/classes/class-messages";
import { fieldErrors, formValues } from "~/utils/form-errors";
import { invalid, readForm } from "~/http/pages.server";
import { Breadcrumbs } from "~/components/breadcrumbs";

export const meta: Route.MetaFunction = ({ data }) => [{ title: `${data?.cls.name ?? "Class"} · Fernwater` }];

export async function loader({ request, params }: Route.LoaderArgs) {
  const user = await requireUser(request);
  const { cls, as } = requireClassAccess(user, params.classId);
  const dayOf = dayWriter(request, user);
  const lessons = listLessons(cls.id);
  const base = { cls: { id: cls.id, name: cls.name } };
  if (as === "former educator") {
    // Read-only: what the class was, without the students' e-mails, the join code or invitations.
    return {
      ...base,
      as,
      educatorName: user.name,
      lessons: lessons.map((l) => ({ id: l.id, title: l.title, status: "" })),
      teacher: null,
      formerStudents: roster(cls.id).map((s) => ({ id: s.id, name: s.name })),
    };
  }
  if (as === "student") {
    const educator = getDb().select({ name: users.name }).from(users).where(eq(users.id, cls.educatorId)).get();
    return {
      ...base,
      as,
      educatorName: educator?.name ?? "",
      lessons: lessons.map((l) => {
        const copy = findCopy(l.id, user.id);
        return { id: l.id, title: l.title, status: copy?.handedInAt ? "handed in" : copy ? "started" : "not started" };
      }),
      teacher: null,
      formerStudents: null,
    };
  }
  return {
    ...base,
    as,
    educatorName: user.name,
    lessons: lessons.map((l) => ({ id: l.id, title: l.title, status: "" })),
    teacher: {
      joinCode: cls.joinCode,
      students: roster(cls.id).map((s) => ({
        id: s.id,
        name: s.name,
        email: s.email,
        joinedAt: dayOf(s.joinedAt),
      })),
      invites: pendingInvites(cls.id).map((i) => ({
        id: i.id,
        email: i.email,
        expiresAt: dayOf(i.expiresAt),
      })),
    },
    formerStudents: null,
  };
}

const InviteSchema = z.object({
  intent: z.literal("invite"),
  email: z
    .string({ error: "Enter the student’s e-mail address." })
    .trim()
    .toLowerCase()
    .min(1, "Enter the student’s e-mail address.")
    .max(254, "That e-mail address is too long.")
    .pipe(z.email("Enter an e-mail address like name@example.org.")),
});
const RemoveSchema = z.object({
  intent: z.literal("remove"),
  studentId: z.coerce.number().int().positive(),
  confirm: z.literal("yes", { error: "Tick the box to confirm." }),
});

export async function action({ request, params }: Route.ActionArgs) {
  const user = await requireUser(request);
  const cls = requireOwnClass(user, params.classId);
  const values = formValues(await readForm(request));
  if (values.intent === "invite") {
    const parsed = InviteSchema.safeParse(values);
    if (!parsed.success) return invalid(fieldErrors(parsed.error), values);
    const sent = await inviteByEmail(request, cls, user, parsed.data.email);
    if (!sent.ok) return invalid({ email: sent.message }, values, sent.status ?? 400);
    return { done: `Invitation sent to ${parsed.data.email}.` };
  }
  if (values.intent === "remove") {
    const parsed = RemoveSchema.safeParse(values);
    if (!parsed.success)
      return invalid(
        { [`remove-${values.studentId}`]: "Tick the box to confirm.", ...fieldErrors(parsed.error) },
        values,
      );
    if (!removeStudent(cls.id, parsed.data.studentId))
      return invalid({ "": "That student is not in this class." }, values);
    return { done: "The student was taken out of the class. Their copies stay in their own tanks." };
  }
  return invalid({ "": "Unknown action." }, values);
}

export default function ClassPage({ loaderData, actionData }: Route.ComponentProps) {
  const { cls, as, lessons, teacher, educatorName, formerStudents } = loaderData;
  const [params] = useSearchParams();
  const busy = useNavigation().state === "submitting";
  const errors = actionData && "errors" in actionData ? actionData.errors : {};
  const values = actionData && "values" in actionData ? actionData.values : {};
  const done = actionData && "done" in actionData ? actionData.done : null;
  return (
    <div className="space-y-8">
      <Breadcrumbs trail={[{ to: "/classes", label: "Classes" }]} current={cls.name} />
      <header className="space-y-1">
        <h1 className="text-2xl">{cls.name}</h1>
        {as === "student" ? <p className="text-sm text-stone-700">Run by {educatorName}.</p> : null}
      </header>
      {params.get("joined") === "1" ? <FormMessage tone="success">You joined the class.</FormMessage> : null}
      {done ? <FormMessage tone="success">{done}</FormMessage> : null}
      {errors[""] ? <FormMessage>{errors[""]}</FormMessage> : null}
      {as === "former educator" ? <FormMessage tone="info">{READ_ONLY_CLASS}</FormMessage> : null}

      <section aria-labelledby="lessons-title" className="space-y-3">
        <div className="flex flex-wrap items-center justify-between gap-3">
          <h2 id="lessons-title" className="text-lg">
            Lessons
          </h2>
          {teacher ? (
            <Link to={`/classes/${cls.id}/lessons/new`} className="btn">
              New lesson
            </Link>
          ) : null}
        </div>
        {lessons.length === 0 ? (
          <p className="text-sm">{teacher ? "No lessons yet." : "Your teacher has not handed out a lesson yet."}</p>
        ) : (
          <ul className="space-y-2">
            {lessons.map((l) => (
              <li key={l.id} className="flex flex-wrap items-baseline gap-2">
                <Link to={`/classes/${cls.id}/lessons/${l.id}`} className="link font-semibold">
                  {l.title}
                </Link>
                {l.status ? <span className="text-sm text-stone-600">{l.status}</span> : null}
              </li>
            ))}
          </ul>
        )}
      </section>

      {formerStudents ? (
        <section aria-labelledby="former-roster-title" className="space-y-2">
          <h2 id="former-roster-title" className="text-lg">
            Students ({formerStudents.length})
          </h2>
          <ul className="text-sm">
            {formerStudents.map((s) => (
              <li key={s.id}>{s.name}</li>
            ))}
          </ul>
        </section>
      ) : null}

      {teacher ? (
        <>
          <section aria-labelledby="join-title" className="card space-y-2">
            <h2 id="join-title" className="text-lg">
              Join code
            </h2>
            <p className="figure text-3xl font-semibold tracking-wider">{teacher.joinCode}</p>
            <p className="text-sm text-stone-700">
              Students sign in (or create an account), open Classes and type this code. Or invite them by e-mail below.
            </p>
          </section>

          <section aria-labelledby="roster-title" className="space-y-3">
            <h2 id="roster-title" className="text-lg">
              Students ({teacher.students.length})
            </h2>
            {teacher.students.length === 0 ? (
              <p className="text-sm">No students yet.</p>
            ) : (
              <ul className="divide-y divide-stone-200 rounded-lg border border-stone-200 bg-white">
                {teacher.students.map((s) => (
                  <li key={s.id} className="flex flex-wrap items-center justify-between gap-3 p-3">
                    <span>
                      <span className="font-semibold">{s.name}</span>{" "}
                      <span className="text-sm text-stone-600">{s.email}</span>{" "}
                      <span className="text-xs text-stone-500">joined {s.joinedAt}</span>
                    </span>
                    <Form method="post" className="flex flex-wrap items-center gap-2 text-sm">
                      <input type="hidden" name="intent" value="remove" />
                      <input type="hidden" name="studentId" value={s.id} />
                      <label className="flex items-center gap-1">
                        <input type="checkbox" name="confirm" value="yes" className="h-4 w-4 accent-red-700" /> Yes,
                        remove <span className="sr-only">{s.name}</span>
                      </label>
                      <button type="submit" className="btn-secondary py-1" disabled={busy}>
                        Remove <span className="sr-only">{s.name}</span>
                      </button>
                      {errors[`remove-${s.id}`] ? (
                        <span className="font-semibold text-red-800" role="alert">
                          {errors[`remove-${s.id}`]}
                        </span>
                      ) : null}
                    </Form>
                  </li>
                ))}
              </ul>
            )}
          </section>

          <section aria-labelledby="invite-title" className="card space-y-3">
            <h2 id="invite-title" className="text-lg">
              Invite by e-mail
            </h2>
            <Form method="post" className="flex flex-wrap items-start gap-3" noValidate>
              <input type="hidden" name="intent" value="invite" />
              <div className="min-w-0 flex-1">
                <TextField
                  label="Student’s e-mail"
                  name="email"
                  type="email"
                  autoComplete="off"
                  defaultValue={values.intent === "invite" ? values.email : undefined}
                  error={values.intent === "invite" ? errors.email : undefined}
                  hint="They get a link that works once, for 14 days."
                />
              </div>
              <button type="submit" className="btn mt-6" disabled={busy}>
                Send invitation
              </button>
            </Form>
            {teacher.invites.length ? (
              <div>
                <h3 className="text-sm font-semibold">Waiting for an answer</h3>
                <ul className="text-sm">
                  {teacher.invites.map((i) => (
                    <li key={i.id}>
                      {i.email} <span className="text-xs text-stone-500">until {i.expiresAt}</span>
                    </li>
                  ))}
                </ul>
              </div>
            ) : null}
          </section>
        </>
      ) : null}
    </div>
  );
}
