import { Form, Link, redirect, useNavigation } from "react-router";
import type { Route } from "./+types/invite";
import { FormMessage } from "~/components/ui/field";
import { acceptInvite, findOpenInvite } from "~/features/classes/classes.server";
import { notFound, requireUser } from "~/permissions.server";
import { getSessionUser } from "~/session.server";
import { invalid } from "~/http/pages.server";

const USED = "This invitation has been used or has expired. Ask your teacher for the class’s join code.";

export const meta: Route.MetaFunction = ({ data }) => [
  { title: `Join ${data?.className ?? "a class"} · Fernwater` },
  { name: "robots", content: "noindex" },
];

export async function loader({ request, params }: Route.LoaderArgs) {
  const invite = findOpenInvite(params.token);
  if (!invite) notFound(USED);
  const user = await getSessionUser(request);
  return {
    className: invite.className,
    email: invite.email,
    signedInAs: user ? { email: user.email, matches: user.email.toLowerCase() === invite.email.toLowerCase() } : null,
    here: `/classes/invite/${params.token}`,
  };
}

export async function action({ request, params }: Route.ActionArgs) {
  const user = await requireUser(request);
  if (!findOpenInvite(params.token)) notFound(USED);
  const outcome = acceptInvite(user, params.token);
  if (!outcome.ok) return invalid({ "": outcome.message }, {}, outcome.status ?? 400);
  return redirect(`/classes/${outcome.classId}?joined=1`);
}

export default function InvitePage({ loaderData, actionData }: Route.ComponentProps) {
  const { className, email, signedInAs, here } = loaderData;
  const busy = useNavigation().state === "submitting";
  const back = encodeURIComponent(here);
  return (
    <section className="card mx-auto max-w-lg space-y-4" aria-labelledby="invite-title">
      <h1 id="invite-title" className="text-2xl">
        Join “{className}”
      </h1>
      <p>
        This invitation was sent to <strong>{email}</strong>.
      </p>
      {actionData?.errors[""] ? <FormMessage>{actionData.errors[""]}</FormMessage> : null}
      {!signedInAs ? (
        <>
          <p>Sign in with that address, or create a free account with it, and you come back here to join.</p>
          <p className="flex flex-wrap gap-3">
            <Link className="btn" to={`/sign-up?redirectTo=${back}`}>
              Create an account
            </Link>
            <Link className="btn-secondary" to={`/sign-in?redirectTo=${back}`}>
              Sign in
            </Link>
          </p>
        </>
      ) : signedInAs.matches ? (
        <Form method="post">
          <button type="submit" className="btn" disabled={busy}>
            Join the class
          </button>
        </Form>
      ) : (
        <FormMessage tone="info">
          You are signed in as {signedInAs.email}. Sign out and sign in with {email}, or join with the class’s code on
          the{" "}
          <Link to="/classes" className="link">
            Classes
          </Link>{" "}
          page.
        </FormMessage>
      )}
    </section>
  );
}
