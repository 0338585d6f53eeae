import { asc, eq } from "drizzle-orm";
import type { Route } from "./+types/list";
import { getDb } from "~/db/client.server";
import { tanks } from "~/db/schema";
import { requireUser } from "~/permissions.server";

export const meta: Route.MetaFunction = () => [{ title: "Your tanks · Fernwater" }];

export async function loader({ request }: Route.LoaderArgs) {
  const user = await requireUser(request);
  const list = getDb()
    .select({ id: tanks.id, name: tanks.name, notes: tanks.notes })
    .from(tanks)
    .where(eq(tanks.ownerId, user.id))
    .orderBy(asc(tanks.name))
    .all();
  return { tanks: list };
}

export default function TanksPage({ loaderData }: Route.ComponentProps) {
  return (
    <div className="space-y-4">
      <h1 className="text-2xl">Your tanks</h1>
      {loaderData.tanks.length === 0 ? <p>You have no tanks yet.</p> : null}
      <ul className="grid gap-4 sm:grid-cols-2">
        {loaderData.tanks.map((t) => (
          <li key={t.id} className="card">
            <h2 className="text-lg">{t.name}</h2>
            <p className="text-sm text-stone-600">{t.notes}</p>
          </li>
        ))}
      </ul>
    </div>
  );
}
