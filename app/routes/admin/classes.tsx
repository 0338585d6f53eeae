import { asc, count, eq, inArray } from "drizzle-orm";
import { Form, useNavigation } from "react-router";
import { z } from "zod";
import type { Route } from "./+types/classes";
import { AdminNav } from "~/components/admin-nav";
import { FormMessage } from "~/components/ui/field";
import { handOverClass } from "~/features/classes/classes.server";
import { getDb } from "~/db/client.server";
import { classes, classMembers, users } from "~/db/schema";
import { hasRole, requireRole } from "~/permissions.server";
import { fieldErrors, formValues } from "~/utils/form-errors";
import { invalid, readForm } from "~/http/pages.server";

export const meta: Route.MetaFunction = () => [{ title: "Classes · Admin · Fernwater" }];

/** Every class with its educator; a class whose educator was demoted is read-only until handed over. */
export async function loader({ request }: Route.LoaderArgs) {
  await requireRole(request, "admin");
  const db = getDb();
  const list = db
    .select({
      id: classes.id,
      name: classes.name,
      educatorId: classes.educatorId,
      educatorName: users.name,
      educatorEmail: users.email,
      educatorRole: users.role,
    })
    .from(classes)
    .innerJoin(users, eq(users.id, classes.educatorId))
    .orderBy(asc(classes.name), asc(classes.id))
    .all();
  const counts = new Map(
    list.length
      ? db
          .select({ classId: classMembers.classId, n: count() })
          .from(classMembers)
          .where(
            inArray(
              classMembers.classId,
              list.map((c) => c.id),
            ),
          )
          .groupBy(classMembers.classId)
          .all()
          .map((r) => [r.classId, r.n] as const)
      : [],
  );
  const educators = db
    .select({ id: users.id, name: users.name, email: users.email, role: users.role })
    .from(users)
    .where(inArray(users.role, ["educator", "admin"]))
    .orderBy(asc(users.name))
    .all();
  return {
    classes: list.map((c) => ({
      ...c,
      students: counts.get(c.id) ?? 0,
      readOnly: !hasRole({ role: c.educatorRole }, "educator"),
    })),
    educators: educators.map((e) => ({ id: e.id, label: `${e.name} (${e.email}, ${e.role})` })),
  };
}

const HandOverSchema = z.object({
  intent: z.literal("hand-over"),
  classId: z.coerce.number().int().positive(),
  educatorId: z.coerce
    .number({ error: "Choose the educator who takes the class over." })
    .int()
    .positive("Choose the educator who takes the class over."),
});

export async function action({ request }: Route.ActionArgs) {
  await requireRole(request, "admin");
  const values = formValues(await readForm(request));
  const parsed = HandOverSchema.safeParse(values);
  if (!parsed.success) return invalid(fieldErrors(parsed.error), values);
  const done = handOverClass(parsed.data.classId, parsed.data.educatorId);
  if (!done.ok) return invalid({ "": done.message }, values);
  return { done: "The class was handed over. Its new educator sees its lessons, students and hand-ins." };
}

export default function AdminClassesPage({ loaderData, actionData }: Route.ComponentProps) {
  const busy = useNavigation().state === "submitting";
  const failure = actionData && "errors" in actionData ? actionData : null;
  const done = actionData && "done" in actionData ? actionData.done : null;
  return (
    <div className="space-y-4">
      <AdminNav />
      <h1 className="text-2xl">Classes</h1>
      <p className="text-sm text-stone-700">
        When an educator becomes a keeper again, their classes stay as they are but read-only: students keep their work,
        nobody new can join, and nobody sees the students’ e-mails or hand-ins until you hand the class to another
        educator.
      </p>
      {failure ? <FormMessage>{Object.values(failure.errors)[0]}</FormMessage> : null}
      {done ? <FormMessage tone="success">{done}</FormMessage> : null}
      {loaderData.classes.length === 0 ? <p className="text-sm">No classes yet.</p> : null}
      <ul className="space-y-3">
        {loaderData.classes.map((c) => (
          <li key={c.id} className="card space-y-2">
            <p>
              <span className="font-semibold">{c.name}</span>{" "}
              <span className="text-sm text-stone-600">
                {c.students} {c.students === 1 ? "student" : "students"} · run by {c.educatorName} ({c.educatorEmail})
              </span>{" "}
              {c.readOnly ? (
                <span className="text-sm font-semibold text-red-800">
                  read-only: its educator is no longer an educator
                </span>
              ) : null}
            </p>
            <Form method="post" className="flex flex-wrap items-center gap-2 text-sm">
              <input type="hidden" name="intent" value="hand-over" />
              <input type="hidden" name="classId" value={c.id} />
              <label htmlFor={`hand-over-${c.id}`}>Hand to</label>
              <select
                id={`hand-over-${c.id}`}
                name="educatorId"
                defaultValue=""
                className="input w-auto max-w-full py-1"
              >
                <option value="" disabled>
                  choose an educator
                </option>
                {loaderData.educators
                  .filter((e) => e.id !== c.educatorId)
                  .map((e) => (
                    <option key={e.id} value={e.id}>
                      {e.label}
                    </option>
                  ))}
              </select>
              <button type="submit" className="btn-secondary py-1" disabled={busy}>
                Hand over
              </button>
            </Form>
          </li>
        ))}
      </ul>
    </div>
  );
}
