import { asc, eq } from "drizzle-orm";
import { Form, useNavigation } from "react-router";
import { z } from "zod";
import type { Route } from "./+types/users";
import { AdminNav } from "~/components/admin-nav";
import { FormMessage } from "~/components/ui/field";
import { getDb } from "~/db/client.server";
import { ROLES, users } from "~/db/schema";
import { dayWriter } from "~/features/accounts/time-zone.server";
import { requireRole } from "~/permissions.server";
import { fieldErrors, formValues } from "~/utils/form-errors";
import { invalid, readForm } from "~/http/pages.server";
import { ScrollTable } from "~/components/ui/scroll-table";

export const meta: Route.MetaFunction = () => [{ title: "Users · Admin · Fernwater" }];

export async function loader({ request }: Route.LoaderArgs) {
  const me = await requireRole(request, "admin");
  const list = getDb()
    .select({ id: users.id, email: users.email, name: users.name, role: users.role, createdAt: users.createdAt })
    .from(users)
    .orderBy(asc(users.email))
    .all();
  const dayOf = dayWriter(request, me);
  return { me: { id: me.id }, users: list.map((u) => ({ ...u, joined: dayOf(u.createdAt) })) };
}

const RoleChangeSchema = z.object({
  intent: z.literal("role"),
  userId: z.coerce.number().int().positive(),
  role: z.enum(ROLES, { error: "Choose keeper, educator or admin." }),
});

export async function action({ request }: Route.ActionArgs) {
  const me = await requireRole(request, "admin");
  const values = formValues(await readForm(request));
  const parsed = RoleChangeSchema.safeParse(values);
  if (!parsed.success) return invalid(fieldErrors(parsed.error), values);
  const { userId, role } = parsed.data;
  if (userId === me.id && role !== "admin") {
    return invalid({ "": "You cannot take away your own admin role; ask another admin." }, values);
  }
  const done = getDb().update(users).set({ role }).where(eq(users.id, userId)).run();
  if (done.changes === 0) return invalid({ "": "That user no longer exists." }, values);
  return { ok: true as const, userId, role };
}

export default function AdminUsersPage({ loaderData, actionData }: Route.ComponentProps) {
  const busy = useNavigation().state === "submitting";
  const failure = actionData && "errors" in actionData ? actionData : null;
  const done = actionData && "ok" in actionData ? actionData : null;
  return (
    <div className="space-y-4">
      <AdminNav />
      <h1 className="text-2xl">Users and roles</h1>
      <p className="text-sm text-stone-700">
        A role change takes effect on that person’s next request. Educators can run classes; admins can manage users and
        public links.
      </p>
      {failure ? <FormMessage>{Object.values(failure.errors)[0]}</FormMessage> : null}
      {done ? <FormMessage tone="success">Role saved.</FormMessage> : null}
      <ScrollTable label="Users table">
        <table className="w-full min-w-[32rem] border-collapse text-sm">
          <caption className="sr-only">All users with their roles</caption>
          <thead>
            <tr className="border-b border-stone-300 text-left">
              <th scope="col" className="py-2 pr-3">
                Name
              </th>
              <th scope="col" className="py-2 pr-3">
                E-mail
              </th>
              <th scope="col" className="py-2 pr-3">
                Joined
              </th>
              <th scope="col" className="py-2">
                Role
              </th>
            </tr>
          </thead>
          <tbody>
            {loaderData.users.map((u) => (
              <tr key={u.id} className="border-b border-stone-200">
                <td className="py-2 pr-3">{u.name}</td>
                <td className="py-2 pr-3">{u.email}</td>
                <td className="num py-2 pr-3">{u.joined}</td>
                <td className="py-2">
                  <Form method="post" className="flex items-center gap-2">
                    <input type="hidden" name="intent" value="role" />
                    <input type="hidden" name="userId" value={u.id} />
                    <label className="sr-only" htmlFor={`role-${u.id}`}>
                      Role of {u.name}
                    </label>
                    <select id={`role-${u.id}`} name="role" defaultValue={u.role} className="input w-auto py-1">
                      <option value="keeper">keeper</option>
                      <option value="educator">educator</option>
                      <option value="admin">admin</option>
                    </select>
                    <button type="submit" className="btn-secondary py-1" disabled={busy || u.id === loaderData.me.id}>
                      Save
                    </button>
                  </Form>
                </td>
              </tr>
            ))}
          </tbody>
        </table>
      </ScrollTable>
    </div>
  );
}
