import { Form, Link, redirect, useNavigation } from "react-router";
import { z } from "zod";
import type { Route } from "./+types/list";
import { FormMessage, TextField } from "~/components/ui/field";
import { classesOf, createClass, joinWithCode } from "~/features/classes/classes.server";
import { hasRole, requireRole, requireUser } from "~/permissions.server";
import { fieldErrors, formValues } from "~/utils/form-errors";
import { invalid, readForm } from "~/http/pages.server";

export const meta: Route.MetaFunction = () => [{ title: "Classes · Fernwater" }];

export async function loader({ request }: Route.LoaderArgs) {
  const user = await requireUser(request);
  const { running, member } = classesOf(user.id);
  const canRun = hasRole(user, "educator");
  // A former educator's join codes no longer work: they are not shown.
  return { canRun, running: canRun ? running : running.map((c) => ({ ...c, joinCode: "" })), member };
}

const CreateSchema = z.object({
  intent: z.literal("create"),
  name: z
    .string({ error: "Give the class a name." })
    .trim()
    .min(1, "Give the class a name.")
    .max(100, "Keep the name under 100 characters."),
});
const JoinSchema = z.object({
  intent: z.literal("join"),
  code: z
    .string({ error: "Type the code your teacher gave you." })
    .trim()
    .min(1, "Type the code your teacher gave you.")
    .max(40, "A join code is 8 letters and digits."),
});

export async function action({ request }: Route.ActionArgs) {
  const values = formValues(await readForm(request));
  if (values.intent === "create") {
    const educator = await requireRole(request, "educator");
    const parsed = CreateSchema.safeParse(values);
    if (!parsed.success) return invalid(fieldErrors(parsed.error), values);
    return redirect(`/classes/${createClass(educator.id, parsed.data.name)}`);
  }
  const user = await requireUser(request);
  const parsed = JoinSchema.safeParse(values);
  if (!parsed.success)
    return invalid(values.intent === "join" ? fieldErrors(parsed.error) : { "": "Unknown action." }, values);
  const joined = await joinWithCode(user, parsed.data.code);
  if (!joined.ok) return invalid({ code: joined.message }, values, joined.status ?? 400);
  return redirect(`/classes/${joined.classId}?joined=1`);
}

export default function ClassesPage({ loaderData, actionData }: Route.ComponentProps) {
  const { canRun, running, member } = loaderData;
  const busy = useNavigation().state === "submitting";
  const errors = actionData?.errors ?? {};
  const values = actionData?.values ?? {};
  return (
    <div className="space-y-8">
      <h1 className="text-2xl">Classes</h1>
      {errors[""] ? <FormMessage>{errors[""]}</FormMessage> : null}
      {canRun ? (
        <section aria-labelledby="running-title" className="space-y-3">
          <h2 id="running-title" className="text-lg">
            Classes you run
          </h2>
          {running.length === 0 ? (
            <p className="text-sm">
              No classes yet. Create one, then give your students its join code or invite them by e-mail.
            </p>
          ) : (
            <ul className="grid gap-3 sm:grid-cols-2">
              {running.map((c) => (
                <li key={c.id} className="card space-y-1">
                  <Link to={`/classes/${c.id}`} className="link text-lg font-semibold">
                    {c.name}
                  </Link>
                  <p className="text-sm text-stone-700">
                    Join code <span className="figure font-semibold">{c.joinCode}</span> · {c.students}{" "}
                    {c.students === 1 ? "student" : "students"}
                  </p>
                </li>
              ))}
            </ul>
          )}
          <Form method="post" className="card flex flex-wrap items-start gap-3" noValidate>
            <input type="hidden" name="intent" value="create" />
            <div className="min-w-0 flex-1">
              <TextField
                label="New class name"
                name="name"
                maxLength={100}
                defaultValue={values.intent === "create" ? values.name : undefined}
                error={values.intent === "create" ? errors.name : undefined}
              />
            </div>
            <button type="submit" className="btn mt-6" disabled={busy}>
              Create class
            </button>
          </Form>
        </section>
      ) : null}
      {!canRun && running.length > 0 ? (
        <section aria-labelledby="former-title" className="space-y-3">
          <h2 id="former-title" className="text-lg">
            Classes you ran (read-only)
          </h2>
          <p className="text-sm text-stone-700">
            You are no longer an educator, so these classes are read-only. An admin can hand them to another educator.
          </p>
          <ul className="space-y-2">
            {running.map((c) => (
              <li key={c.id}>
                <Link to={`/classes/${c.id}`} className="link font-semibold">
                  {c.name}
                </Link>{" "}
                <span className="text-sm text-stone-600">
                  {c.students} {c.students === 1 ? "student" : "students"}
                </span>
              </li>
            ))}
          </ul>
        </section>
      ) : null}
      <section aria-labelledby="member-title" className="space-y-3">
        <h2 id="member-title" className="text-lg">
          {canRun ? "Classes you belong to" : "Your classes"}
        </h2>
        {member.length === 0 ? (
          <p className="text-sm">You are not in a class. If your teacher gave you a join code, type it below.</p>
        ) : (
          <ul className="space-y-2">
            {member.map((c) => (
              <li key={c.id}>
                <Link to={`/classes/${c.id}`} className="link font-semibold">
                  {c.name}
                </Link>{" "}
                <span className="text-sm text-stone-600">with {c.educator}</span>
              </li>
            ))}
          </ul>
        )}
        <Form method="post" className="card flex flex-wrap items-start gap-3" noValidate>
          <input type="hidden" name="intent" value="join" />
          <div className="min-w-0 flex-1">
            <TextField
              label="Join code"
              name="code"
              autoComplete="off"
              autoCapitalize="characters"
              hint="Eight letters and digits, like ABCD-EF23."
              defaultValue={values.intent === "join" ? values.code : undefined}
              error={values.intent === "join" ? errors.code : undefined}
            />
          </div>
          <button type="submit" className="btn mt-6" disabled={busy}>
            Join class
          </button>
        </Form>
      </section>
    </div>
  );
}
