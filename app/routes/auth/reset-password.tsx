import { Form, Link, redirect, useNavigation } from "react-router";
import type { Route } from "./+types/reset-password";
import { FormMessage, TextField } from "~/components/ui/field";
import { completePasswordReset, findLiveResetToken } from "~/features/accounts/password-reset.server";
import { ResetPasswordSchema } from "~/utils/account-schemas";
import { fieldErrors, formValues } from "~/utils/form-errors";
import { invalid, readForm } from "~/http/pages.server";

export const meta: Route.MetaFunction = () => [{ title: "Choose a new password · Fernwater" }];

export function loader({ request }: Route.LoaderArgs) {
  const token = new URL(request.url).searchParams.get("token") ?? "";
  const live = token.length >= 10 && token.length <= 200 && findLiveResetToken(token) !== null;
  return { token: live ? token : null };
}

export async function action({ request }: Route.ActionArgs) {
  const values = formValues(await readForm(request));
  const parsed = ResetPasswordSchema.safeParse(values);
  if (!parsed.success) return invalid(fieldErrors(parsed.error), values);
  const done = await completePasswordReset(parsed.data.token, parsed.data.password);
  if (!done) return invalid({ "": "This link has expired or was already used. Ask for a new one." }, values);
  return redirect("/sign-in?reset=1");
}

export default function ResetPasswordPage({ loaderData, actionData }: Route.ComponentProps) {
  const busy = useNavigation().state === "submitting";
  const errors = actionData?.errors ?? {};
  if (!loaderData.token) {
    return (
      <section className="card mx-auto max-w-md space-y-4">
        <h1 className="text-2xl">This link no longer works</h1>
        <p>Reset links work once, for one hour. Ask for a new one and use the newest mail.</p>
        <Link to="/forgot-password" className="btn">
          Send a new link
        </Link>
      </section>
    );
  }
  return (
    <section className="card mx-auto max-w-md space-y-4">
      <h1 className="text-2xl">Choose a new password</h1>
      {errors[""] ? <FormMessage>{errors[""]}</FormMessage> : null}
      <Form method="post" className="space-y-4" noValidate>
        <input type="hidden" name="token" value={loaderData.token} />
        <TextField
          label="New password"
          name="password"
          type="password"
          autoComplete="new-password"
          hint="At least 10 characters."
          error={errors.password}
          required
        />
        <TextField
          label="New password again"
          name="confirmPassword"
          type="password"
          autoComplete="new-password"
          error={errors.confirmPassword}
          required
        />
        <button type="submit" className="btn w-full" disabled={busy}>
          {busy ? "Saving…" : "Save the new password"}
        </button>
      </Form>
    </section>
  );
}
