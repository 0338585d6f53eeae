import { eq } from "drizzle-orm";
import { Form, Link, redirect, useNavigation, useSearchParams } from "react-router";
import type { Route } from "./+types/sign-up";
import { hashPassword } from "~/auth.server";
import { FormMessage, TextField } from "~/components/ui/field";
import { getDb } from "~/db/client.server";
import { users } from "~/db/schema";
import { createUserSession, getSessionUser, safeRedirect } from "~/session.server";
import { SignUpSchema } from "~/utils/account-schemas";
import { fieldErrors, formValues } from "~/utils/form-errors";
import { invalid, readForm } from "~/utils/http.server";

export const meta: Route.MetaFunction = () => [{ title: "Create an account · Fernwater" }];

export async function loader({ request }: Route.LoaderArgs) {
  if (await getSessionUser(request)) throw redirect(safeRedirect(new URL(request.url).searchParams.get("redirectTo")));
  return null;
}

export async function action({ request }: Route.ActionArgs) {
  const form = await readForm(request);
  const values = formValues(form);
  const parsed = SignUpSchema.safeParse(values);
  if (!parsed.success) return invalid(fieldErrors(parsed.error), values);
  const { name, email, password } = parsed.data;
  const db = getDb();
  const taken = db.select({ id: users.id }).from(users).where(eq(users.email, email)).get();
  if (taken) {
    return invalid({ email: "An account with this e-mail already exists. Sign in, or reset your password." }, values);
  }
  const passwordHash = await hashPassword(password);
  // The unique index settles a race between two sign-ups with the same address.
  const created = db.insert(users).values({ name, email, passwordHash }).onConflictDoNothing().returning({ id: users.id }).get();
  if (!created) return invalid({ email: "An account with this e-mail already exists." }, values);
  // Back to where sign-up started (a share link, a class invitation), same-site paths only.
  return createUserSession(request, created.id, safeRedirect(values.redirectTo));
}

export default function SignUpPage({ actionData }: Route.ComponentProps) {
  const [params] = useSearchParams();
  const redirectTo = actionData?.values.redirectTo ?? params.get("redirectTo") ?? "/tanks";
  const errors = actionData?.errors ?? {};
  const values = actionData?.values ?? {};
  const busy = useNavigation().state === "submitting";
  return (
    <section className="card mx-auto max-w-md space-y-4">
      <h1 className="text-2xl">Create an account</h1>
      {errors[""] ? <FormMessage>{errors[""]}</FormMessage> : null}
      <Form method="post" className="space-y-4" noValidate>
        <input type="hidden" name="redirectTo" value={redirectTo} />
        <TextField label="Name" name="name" autoComplete="name" defaultValue={values.name} error={errors.name} required />
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
        <Link to={redirectTo === "/tanks" ? "/sign-in" : `/sign-in?redirectTo=${encodeURIComponent(redirectTo)}`} className="link">
          Sign in
        </Link>
      </p>
    </section>
  );
}
