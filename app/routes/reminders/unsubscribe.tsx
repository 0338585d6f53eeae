import { eq } from "drizzle-orm";
import { data, Form } from "react-router";
import type { Route } from "./+types/unsubscribe";
import { FormMessage } from "~/components/ui/field";
import { getDb } from "~/db/client.server";
import { tanks } from "~/db/schema";
import { subscriptionById, unsubscribe } from "~/features/reminders/reminder-schedule.server";
import { readUnsubscribeToken } from "~/features/reminders/unsubscribe-token.server";

export const meta: Route.MetaFunction = () => [
  { title: "Stop reminders · Fernwater" },
  { name: "robots", content: "noindex" },
];

const refused = () => data({ error: "This unsubscribe link is not valid." }, { status: 404 });

/** GET /reminders/unsubscribe/:token — no sign-in: the signed token is the permission. Shows a confirm button. */
export async function loader({ params }: Route.LoaderArgs) {
  const id = readUnsubscribeToken(params.token ?? "");
  if (id === null) throw refused();
  const row = subscriptionById(id);
  const tank = row ? getDb().select({ name: tanks.name }).from(tanks).where(eq(tanks.id, row.tankId)).get() : undefined;
  return { tankName: tank?.name ?? null };
}

/** POST — unsubscribes; also the RFC 8058 one-click POST a mail client sends (List-Unsubscribe=One-Click). */
export async function action({ params }: Route.ActionArgs) {
  const id = readUnsubscribeToken(params.token ?? "");
  if (id === null) throw refused();
  unsubscribe(id);
  return { done: true };
}

export default function UnsubscribePage({ loaderData, actionData }: Route.ComponentProps) {
  if (actionData?.done || loaderData.tankName === null) {
    return (
      <div className="mx-auto max-w-xl space-y-4">
        <h1 className="text-2xl">Reminders stopped</h1>
        <FormMessage tone="success">You will get no more reminder e-mails for this tank.</FormMessage>
        <p>You can turn them on again on your account page.</p>
      </div>
    );
  }
  return (
    <div className="mx-auto max-w-xl space-y-4">
      <h1 className="text-2xl">Stop reminders for {loaderData.tankName}?</h1>
      <Form method="post">
        <button type="submit" className="rounded bg-fern-700 px-4 py-2 text-white">
          Stop reminder e-mails
        </button>
      </Form>
    </div>
  );
}
