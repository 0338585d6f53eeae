import { Form, Link, useNavigation } from "react-router";
import type { Route } from "./+types/forgot-password";
import { FormMessage, TextField } from "~/components/ui/field";
import { requestPasswordReset } from "~/features/accounts/password-reset.server";
import { ForgotPasswordSchema } from "~/utils/account-schemas";
import { fieldErrors, formValues } from "~/utils/form-errors";
import { invalid, readForm } from "~/http/pages.server";

export const meta: Route.MetaFunction = () => [{ title: "Forgot password · Fernwater" }];

export async function action({ request }: Route.ActionArgs) {
  const values = formValues(await readForm(request));
  const parsed = ForgotPasswordSchema.safeParse(values);
  if (!parsed.success) return invalid(fieldErrors(parsed.error), values);
  await requestPasswordReset(request, parsed.data.email);
  return { sent: true as const, email: parsed.data.email };
}

export default function ForgotPasswordPage({ actionData }: Route.ComponentProps) {
  const busy = useNavigation().state === "submitting";
  const sent = actionData && "sent" in actionData ? actionData : null;
  const failure = actionData && "errors" in actionData ? actionData : null;
  return (
    <section className="card mx-auto max-w-md space-y-4">
      <h1 className="text-2xl">Forgot your password?</h1>
      {sent ? (
        <FormMessage tone="success">
          If an account exists for {sent.email}, we have sent it a link to choose a new password. The link works for one
          hour.
        </FormMessage>
      ) : (
        <p className="text-sm text-stone-700">Enter the e-mail address of your account and we will send you a link.</p>
      )}
      <Form method="post" className="space-y-4" noValidate>
        <TextField
          label="E-mail"
          name="email"
          type="email"
          autoComplete="email"
          defaultValue={failure?.values.email ?? sent?.email}
          error={failure?.errors.email}
          required
        />
        <button type="submit" className="btn w-full" disabled={busy}>
          {busy ? "Sending…" : "Send the link"}
        </button>
      </Form>
      <p className="text-sm">
        <Link to="/sign-in" className="link">
          Back to sign in
        </Link>
      </p>
    </section>
  );
}
