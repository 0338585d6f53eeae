import { Form, Link, useNavigation } from "react-router";
import type { Route } from "./+types/confirm-sign-up";
import { FormMessage } from "~/components/ui/field";
import { createUserSession } from "~/session.server";
import { confirmSignUp, findSignUpRequest } from "~/features/accounts/sign-up.server";
import { formValues } from "~/utils/form-errors";
import { invalid, readForm } from "~/http/pages.server";

export const meta: Route.MetaFunction = () => [
  { title: "Finish creating your account · Fernwater" },
  { name: "robots", content: "noindex" },
];

/** The link from the sign-up mail. Opening it changes nothing (mail scanners open links too); the button does. */
export function loader({ request }: Route.LoaderArgs) {
  const token = new URL(request.url).searchParams.get("token");
  const pending = findSignUpRequest(token);
  return pending ? { token, email: pending.email, name: pending.name } : { token: null, email: null, name: null };
}

export async function action({ request }: Route.ActionArgs) {
  const values = formValues(await readForm(request));
  const done = confirmSignUp(values.token ?? "");
  if (!done.ok) return invalid({ "": done.message });
  return createUserSession(request, done.userId, done.redirectTo);
}

export default function ConfirmSignUpPage({ loaderData, actionData }: Route.ComponentProps) {
  const busy = useNavigation().state === "submitting";
  const error = actionData?.errors[""];
  if (!loaderData.token) {
    return (
      <section className="card mx-auto max-w-md space-y-4">
        <h1 className="text-2xl">This link no longer works</h1>
        <p>Sign-up links work once, for a day. Sign up again, or sign in if you already finished.</p>
        <p className="flex flex-wrap gap-3">
          <Link to="/sign-up" className="btn">
            Sign up
          </Link>
          <Link to="/sign-in" className="btn-secondary">
            Sign in
          </Link>
        </p>
      </section>
    );
  }
  return (
    <section className="card mx-auto max-w-md space-y-4">
      <h1 className="text-2xl">Finish creating your account</h1>
      {error ? <FormMessage>{error}</FormMessage> : null}
      <p>
        {loaderData.name}, your account will use <strong>{loaderData.email}</strong>.
      </p>
      <Form method="post">
        <input type="hidden" name="token" value={loaderData.token} />
        <button type="submit" className="btn w-full" disabled={busy}>
          {busy ? "Creating…" : "Create my account"}
        </button>
      </Form>
    </section>
  );
}
