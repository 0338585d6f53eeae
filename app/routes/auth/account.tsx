import { eq } from "drizzle-orm";
import { Form, redirect, useNavigation, useSearchParams } from "react-router";
import { z } from "zod";
import type { Route } from "./+types/account";
import { hashPassword, verifyPassword } from "~/auth.server";
import { FormMessage, SelectField, TextField } from "~/components/ui/field";
import { getDb } from "~/db/client.server";
import { users } from "~/db/schema";
import { spendResetLinks } from "~/password-reset.server";
import { requireUser } from "~/permissions.server";
import { createUserSession, revokeAllSessions } from "~/session.server";
import { ChangePasswordSchema, UnitPreferencesSchema } from "~/utils/account-schemas";
import { fieldErrors, formValues } from "~/utils/form-errors";
import { invalid, readForm } from "~/utils/http.server";
import { KH_UNIT_OPTIONS, NITRATE_UNIT_OPTIONS, TEMPERATURE_UNIT_OPTIONS, VOLUME_UNIT_OPTIONS } from "~/utils/unit-options";

export const meta: Route.MetaFunction = () => [{ title: "Your account · Fernwater" }];

export async function loader({ request }: Route.LoaderArgs) {
  const user = await requireUser(request);
  return { user };
}

const IntentSchema = z.enum(["preferences", "password"]);

export async function action({ request }: Route.ActionArgs) {
  const user = await requireUser(request);
  const values = formValues(await readForm(request));
  const intent = IntentSchema.safeParse(values.intent);
  if (!intent.success) return invalid({ "": "Unknown action." }, values);

  if (intent.data === "preferences") {
    const parsed = UnitPreferencesSchema.safeParse(values);
    if (!parsed.success) return invalid(fieldErrors(parsed.error), values);
    getDb().update(users).set(parsed.data).where(eq(users.id, user.id)).run();
    return redirect("/account?saved=preferences");
  }

  const parsed = ChangePasswordSchema.safeParse(values);
  if (!parsed.success) return invalid(fieldErrors(parsed.error), { intent: "password" });
  const row = getDb().select({ passwordHash: users.passwordHash }).from(users).where(eq(users.id, user.id)).get();
  if (!row || !(await verifyPassword(parsed.data.currentPassword, row.passwordHash))) {
    return invalid({ currentPassword: "That is not your current password." }, { intent: "password" });
  }
  const passwordHash = await hashPassword(parsed.data.password);
  getDb().transaction((tx) => {
    tx.update(users).set({ passwordHash }).where(eq(users.id, user.id)).run();
    // Reset links asked for before the change stop working with the old password.
    spendResetLinks(tx, user.id);
  });
  // Every other device is signed out; this one gets a fresh session id.
  revokeAllSessions(user.id);
  return createUserSession(request, user.id, "/account?saved=password");
}

export default function AccountPage({ loaderData, actionData }: Route.ComponentProps) {
  const { user } = loaderData;
  const [params] = useSearchParams();
  const saved = params.get("saved");
  const errors = actionData?.errors ?? {};
  const values = actionData?.values ?? {};
  const forPrefs = values.intent !== "password";
  const busy = useNavigation().state === "submitting";
  return (
    <div className="mx-auto max-w-2xl space-y-6">
      <h1 className="text-2xl">Your account</h1>
      {saved === "preferences" ? <FormMessage tone="success">Your preferences were saved.</FormMessage> : null}
      {saved === "password" ? (
        <FormMessage tone="success">Your password was changed. Other devices were signed out.</FormMessage>
      ) : null}
      <section className="card space-y-4" aria-labelledby="prefs-title">
        <h2 id="prefs-title" className="text-lg">
          Name and units
        </h2>
        <p className="text-sm text-stone-600">
          Fernwater shows every figure in the units you choose here; you can type values in them too. Signed in as{" "}
          {user.email} ({user.role}).
        </p>
        <Form method="post" className="grid gap-4 sm:grid-cols-2" noValidate>
          <input type="hidden" name="intent" value="preferences" />
          <div className="sm:col-span-2">
            <TextField
              label="Name"
              name="name"
              defaultValue={forPrefs ? (values.name ?? user.name) : user.name}
              error={forPrefs ? errors.name : undefined}
            />
          </div>
          <SelectField label="Volume" name="volumeUnit" defaultValue={user.volumeUnit} options={VOLUME_UNIT_OPTIONS} error={forPrefs ? errors.volumeUnit : undefined} />
          <SelectField
            label="Temperature"
            name="temperatureUnit"
            defaultValue={user.temperatureUnit}
            options={TEMPERATURE_UNIT_OPTIONS}
            error={forPrefs ? errors.temperatureUnit : undefined}
          />
          <SelectField
            label="Nitrate, nitrite and ammonia"
            name="nitrateUnit"
            defaultValue={user.nitrateUnit}
            options={NITRATE_UNIT_OPTIONS}
            hint="Most hobby test kits read nitrate as NO3; lab reports often give it as N."
            error={forPrefs ? errors.nitrateUnit : undefined}
          />
          <SelectField label="Carbonate hardness (KH)" name="khUnit" defaultValue={user.khUnit} options={KH_UNIT_OPTIONS} error={forPrefs ? errors.khUnit : undefined} />
          <div className="sm:col-span-2">
            <button type="submit" className="btn" disabled={busy}>
              Save name and units
            </button>
          </div>
        </Form>
      </section>
      <section className="card space-y-4" aria-labelledby="password-title">
        <h2 id="password-title" className="text-lg">
          Change password
        </h2>
        {!forPrefs && errors[""] ? <FormMessage>{errors[""]}</FormMessage> : null}
        <Form method="post" className="space-y-4" noValidate>
          <input type="hidden" name="intent" value="password" />
          <TextField label="Current password" name="currentPassword" type="password" autoComplete="current-password" error={!forPrefs ? errors.currentPassword : undefined} />
          <TextField label="New password" name="password" type="password" autoComplete="new-password" hint="At least 10 characters." error={!forPrefs ? errors.password : undefined} />
          <TextField label="New password again" name="confirmPassword" type="password" autoComplete="new-password" error={!forPrefs ? errors.confirmPassword : undefined} />
          <button type="submit" className="btn" disabled={busy}>
            Change password
          </button>
        </Form>
      </section>
    </div>
  );
}
