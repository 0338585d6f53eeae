import { Form, Link, redirect, useNavigation, useSearchParams } from "react-router";
import type { Route } from "./+types/sign-in";
import { authenticateSignIn, SignInError } from "~/auth.server";
import { FormMessage, TextField } from "~/components/ui/field";
import { clientIpContext } from "~/context";
import { createUserSession, getSessionUser, safeRedirect } from "~/session.server";
import { invalid, readForm } from "~/http/pages.server";

export const meta: Route.MetaFunction = () => [{ title: "Sign in · Fernwater" }];

export async function loader({ request }: Route.LoaderArgs) {
  if (await getSessionUser(request)) throw redirect("/tanks");
  return null;
}

export async function action({ request, context }: Route.ActionArgs) {
  // The strategy reads the body itself; peek at a clone for the redirect.
  const peek = await readForm(request.clone());
  const redirectTo = safeRedirect(peek.get("redirectTo"));
  try {
    const user = await authenticateSignIn(request, context.get(clientIpContext));
    return createUserSession(request, user.id, redirectTo);
  } catch (error) {
    if (error instanceof SignInError) return invalid(error.errors, { ...error.values, redirectTo }, error.status);
    throw error;
  }
}

export default function SignInPage({ actionData }: Route.ComponentProps) {
  const [params] = useSearchParams();
  const errors = actionData?.errors ?? {};
  const values = actionData?.values ?? {};
  const redirectTo = values.redirectTo ?? params.get("redirectTo") ?? "/tanks";
  const busy = useNavigation().state === "submitting";
  return (
    <section className="card mx-auto max-w-md space-y-4">
      <h1 className="text-2xl">Sign in</h1>
      {params.get("reset") === "1" ? (
        <FormMessage tone="success">Your password was changed. Sign in with the new one.</FormMessage>
      ) : null}
      {errors[""] ? <FormMessage>{errors[""]}</FormMessage> : null}
      <Form method="post" className="space-y-4" noValidate>
        <input type="hidden" name="redirectTo" value={redirectTo} />
        <TextField
          label="E-mail"
          name="email"
          type="email"
          autoComplete="email"
          defaultValue={values.email}
          error={errors.email}
          required
        />
        <TextField
          label="Password"
          name="password"
          type="password"
          autoComplete="current-password"
          error={errors.password}
          required
        />
        <button type="submit" className="btn w-full" disabled={busy}>
          {busy ? "Signing in…" : "Sign in"}
        </button>
      </Form>
      <p className="flex flex-wrap justify-between gap-2 text-sm">
        <Link to="/forgot-password" className="link">
          Forgot your password?
        </Link>
        <Link
          to={redirectTo === "/tanks" ? "/sign-up" : `/sign-up?redirectTo=${encodeURIComponent(redirectTo)}`}
          className="link"
        >
          Create an account
        </Link>
      </p>
    </section>
  );
}
