import { Form, Link, redirect, useNavigation, useSearchParams } from "react-router";
import type { Route } from "./+types/sign-up";
import { takeSignUpAttempt } from "~/auth.server";
import { FormMessage, TextField } from "~/components/ui/field";
import { clientIpContext } from "~/context";
import { waitText } from "~/rate-limits.server";
import { getSessionUser, safeRedirect } from "~/session.server";
import { requestSignUp, SIGN_UP_LINK_HOURS } from "~/features/accounts/sign-up.server";
import { SignUpSchema } from "~/utils/account-schemas";
import { fieldErrors, formValues } from "~/utils/form-errors";
import { invalid, readForm } from "~/http/pages.server";

export const meta: Route.MetaFunction = () => [{ title: "Create an account · Fernwater" }];

export async function loader({ request }: Route.LoaderArgs) {
  if (await getSessionUser(request)) throw redirect(safeRedirect(new URL(request.url).searchParams.get("redirectTo")));
  return null;
}

export async function action({ request, context }: Route.ActionArgs) {
  const form = await readForm(request);
  const values = formValues(form);
  const parsed = SignUpSchema.safeParse(values);
  if (!parsed.success) return invalid(fieldErrors(parsed.error), values);
  const wait = await takeSignUpAttempt(context.get(clientIpContext));
  if (wait > 0) {
    return invalid({ "": `Too many sign-ups from your network for now. Try again in ${waitText(wait)}.` }, values, 429);
  }
  const { name, email, password } = parsed.data;
  // The same answer whether or not the address has an account (the mail tells its owner which).
  await requestSignUp(request, { name, email, password, redirectTo: safeRedirect(values.redirectTo) });
  return { sent: true as const, email, hours: SIGN_UP_LINK_HOURS };
}

export default function SignUpPage({ actionData }: Route.ComponentProps) {
  const [params] = useSearchParams();
  const failure = actionData && "errors" in actionData ? actionData : null;
  const sent = actionData && "sent" in actionData ? actionData : null;
  const redirectTo = failure?.values.redirectTo ?? params.get("redirectTo") ?? "/tanks";
  const errors = failure?.errors ?? {};
  const values = failure?.values ?? {};
  const busy = useNavigation().state === "submitting";
  if (sent) {
    return (
      <section className="card mx-auto max-w-md space-y-4" aria-live="polite">
        <h1 className="text-2xl">Check your e-mail</h1>
        <FormMessage tone="success">
          We have sent a mail to {sent.email}. Open the link in it within {sent.hours} hours to finish creating your
          account. If the address already has an account, the mail says so instead.
        </FormMessage>
        <p className="text-sm">
          No mail after a few minutes? Look in the spam folder, or{" "}
          <Link to="/sign-up" className="link">
            sign up again
          </Link>
          .
        </p>
      </section>
    );
  }
  return (
    <section className="card mx-auto max-w-md space-y-4">
      <h1 className="text-2xl">Create an account</h1>
      {errors[""] ? <FormMessage>{errors[""]}</FormMessage> : null}
      <Form method="post" className="space-y-4" noValidate>
        <input type="hidden" name="redirectTo" value={redirectTo} />
        <TextField
          label="Name"
          name="name"
          autoComplete="name"
          defaultValue={values.name}
          error={errors.name}
          required
        />
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
          autoComplete="new-password"
          hint="At least 10 characters. A few unrelated words make a good one."
          error={errors.password}
          required
        />
        <TextField
          label="Password again"
          name="confirmPassword"
          type="password"
          autoComplete="new-password"
          error={errors.confirmPassword}
          required
        />
        <button type="submit" className="btn w-full" disabled={busy}>
          {busy ? "Creating…" : "Create account"}
        </button>
      </Form>
      <p className="text-sm">
        Already have an account?{" "}
        <Link
          to={redirectTo === "/tanks" ? "/sign-in" : `/sign-in?redirectTo=${encodeURIComponent(redirectTo)}`}
          className="link"
        >
          Sign in
        </Link>
      </p>
    </section>
  );
}
