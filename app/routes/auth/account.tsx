import { eq } from "drizzle-orm";
import { Form, redirect, useNavigation, useSearchParams } from "react-router";
import { z } from "zod";
import type { Route } from "./+types/account";
import { hashPassword, verifyPassword } from "~/auth.server";
import { FormMessage, SelectField, TextField } from "~/components/ui/field";
import { getDb } from "~/db/client.server";
import { users } from "~/db/schema";
import { spendResetLinks } from "~/features/accounts/password-reset.server";
import { requireUser } from "~/permissions.server";
import { usageOf } from "~/quotas.server";
import { giveBack, take, waitText } from "~/rate-limits.server";
import { createUserSession, revokeAllSessions } from "~/session.server";
import { ChangePasswordSchema, UnitPreferencesSchema } from "~/utils/account-schemas";
import { fieldErrors, formValues } from "~/utils/form-errors";
import { invalid, readForm } from "~/http/pages.server";
import { PREFERENCE_OPTIONS } from "~/utils/display-units";
import { zoneFor } from "~/features/accounts/time-zone.server";
import { reminderSettings, saveReminderSettings } from "~/routes/auth/account-reminders.server";
import { RemindersSection } from "~/routes/auth/reminders-section";

export const meta: Route.MetaFunction = () => [{ title: "Your account · Fernwater" }];

export async function loader({ request }: Route.LoaderArgs) {
  const user = await requireUser(request);
  const zone = zoneFor(request, user);
  return {
    user,
    zone,
    zones: typeof Intl.supportedValuesOf === "function" ? Intl.supportedValuesOf("timeZone") : [],
    usage: usageOf(getDb(), user.id),
    reminders: reminderSettings(user.id),
  };
}

const IntentSchema = z.enum(["preferences", "password", "reminders"]);

export async function action({ request }: Route.ActionArgs) {
  const user = await requireUser(request);
  const values = formValues(await readForm(request));
  const intent = IntentSchema.safeParse(values.intent);
  if (!intent.success) return invalid({ "": "Unknown action." }, values);

  if (intent.data === "reminders") return saveReminderSettings(user.id, values);

  if (intent.data === "preferences") {
    const parsed = UnitPreferencesSchema.safeParse(values);
    if (!parsed.success) return invalid(fieldErrors(parsed.error), values);
    getDb().update(users).set(parsed.data).where(eq(users.id, user.id)).run();
    return redirect("/account?saved=preferences");
  }

  const parsed = ChangePasswordSchema.safeParse(values);
  if (!parsed.success) return invalid(fieldErrors(parsed.error), { intent: "password" });
  // Guesses at the current password count like failed sign-ins (a borrowed session cannot try
  // passwords at will); a right one gives its point back.
  const wait = await take("signInPerEmail", user.email);
  if (wait > 0) {
    return invalid(
      { currentPassword: `Too many wrong passwords. Wait ${waitText(wait)} and try again.` },
      { intent: "password" },
      429,
    );
  }
  const row = getDb().select({ passwordHash: users.passwordHash }).from(users).where(eq(users.id, user.id)).get();
  if (!row || !(await verifyPassword(parsed.data.currentPassword, row.passwordHash))) {
    return invalid({ currentPassword: "That is not your current password." }, { intent: "password" });
  }
  await giveBack("signInPerEmail", user.email);
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

const ZONE_FROM = {
  setting: ", your choice",
  browser: ", your browser's",
  default: " (your browser has not told us its zone yet)",
} as const;

export default function AccountPage({ loaderData, actionData }: Route.ComponentProps) {
  const { user, usage } = loaderData;
  const [params] = useSearchParams();
  const saved = params.get("saved");
  const errors = actionData?.errors ?? {};
  const values = actionData?.values ?? {};
  const forPrefs = values.intent !== "password" && values.intent !== "reminders";
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
          <SelectField
            label="Volume"
            name="volumeUnit"
            defaultValue={user.volumeUnit}
            options={PREFERENCE_OPTIONS.volumeUnit}
            error={forPrefs ? errors.volumeUnit : undefined}
          />
          <SelectField
            label="Temperature"
            name="temperatureUnit"
            defaultValue={user.temperatureUnit}
            options={PREFERENCE_OPTIONS.temperatureUnit}
            error={forPrefs ? errors.temperatureUnit : undefined}
          />
          <SelectField
            label="Nitrate, nitrite and ammonia"
            name="nitrateUnit"
            defaultValue={user.nitrateUnit}
            options={PREFERENCE_OPTIONS.nitrateUnit}
            hint="Most hobby test kits read nitrate as NO3; lab reports often give it as N."
            error={forPrefs ? errors.nitrateUnit : undefined}
          />
          <SelectField
            label="Carbonate hardness (KH)"
            name="khUnit"
            defaultValue={user.khUnit}
            options={PREFERENCE_OPTIONS.khUnit}
            error={forPrefs ? errors.khUnit : undefined}
          />
          <div className="sm:col-span-2">
            <TextField
              label="Time zone"
              name="timeZone"
              list="time-zones"
              autoComplete="off"
              defaultValue={forPrefs ? (values.timeZone ?? user.timeZone ?? "") : (user.timeZone ?? "")}
              hint={`Days (due today, overdue, reminder hours) are counted in ${loaderData.zone.zone}${ZONE_FROM[loaderData.zone.from]}. Leave blank to use your browser's.`}
              error={forPrefs ? errors.timeZone : undefined}
            />
            <datalist id="time-zones">
              {loaderData.zones.map((z) => (
                <option key={z} value={z} />
              ))}
            </datalist>
          </div>
          <div className="sm:col-span-2">
            <button type="submit" className="btn" disabled={busy}>
              Save name, units and time zone
            </button>
          </div>
        </Form>
      </section>
      <RemindersSection tanks={loaderData.reminders} errors={errors} values={values} saved={saved === "reminders"} />
      <UsageSection usage={usage} />
      <section className="card space-y-4" aria-labelledby="password-title">
        <h2 id="password-title" className="text-lg">
          Change password
        </h2>
        {!forPrefs && errors[""] ? <FormMessage>{errors[""]}</FormMessage> : null}
        <Form method="post" className="space-y-4" noValidate>
          <input type="hidden" name="intent" value="password" />
          <TextField
            label="Current password"
            name="currentPassword"
            type="password"
            autoComplete="current-password"
            error={!forPrefs ? errors.currentPassword : undefined}
          />
          <TextField
            label="New password"
            name="password"
            type="password"
            autoComplete="new-password"
            hint="At least 10 characters."
            error={!forPrefs ? errors.password : undefined}
          />
          <TextField
            label="New password again"
            name="confirmPassword"
            type="password"
            autoComplete="new-password"
            error={!forPrefs ? errors.confirmPassword : undefined}
          />
          <button type="submit" className="btn" disabled={busy}>
            Change password
          </button>
        </Form>
      </section>
    </div>
  );
}

const megabytes = (bytes: number) => `${(bytes / (1024 * 1024)).toFixed(1)} MB`;

/** What the account keeps against its limits (app/quotas.server.ts). */
function UsageSection({ usage }: { usage: Route.ComponentProps["loaderData"]["usage"] }) {
  const rows = [
    {
      label: "Tanks",
      used: String(usage.tanks.used),
      limit: String(usage.tanks.limit),
      share: usage.tanks.used / usage.tanks.limit,
    },
    {
      label: "Scenarios in your fullest tank",
      used: String(usage.scenariosInFullestTank.used),
      limit: String(usage.scenariosInFullestTank.limit),
      share: usage.scenariosInFullestTank.used / usage.scenariosInFullestTank.limit,
    },
    {
      label: "Test readings",
      used: usage.readings.used.toLocaleString("en"),
      limit: usage.readings.limit.toLocaleString("en"),
      share: usage.readings.used / usage.readings.limit,
    },
    {
      label: "Journal entries",
      used: usage.journalEntries.used.toLocaleString("en"),
      limit: usage.journalEntries.limit.toLocaleString("en"),
      share: usage.journalEntries.used / usage.journalEntries.limit,
    },
    {
      label: "Stored runs",
      used: megabytes(usage.storedRunBytes.used),
      limit: megabytes(usage.storedRunBytes.limit),
      share: usage.storedRunBytes.used / usage.storedRunBytes.limit,
    },
  ];
  return (
    <section className="card space-y-3" aria-labelledby="usage-title">
      <h2 id="usage-title" className="text-lg">
        What your account keeps
      </h2>
      <p className="text-sm text-stone-600">
        Each account has room for this much. When something is full, delete what you no longer need; long runs at hourly
        points take the most room.
      </p>
      <table className="w-full border-collapse text-sm">
        <caption className="sr-only">Your usage and its limits</caption>
        <tbody>
          {rows.map((r) => (
            <tr key={r.label} className="border-b border-stone-200">
              <th scope="row" className="py-2 pr-3 text-left font-normal">
                {r.label}
              </th>
              <td className="num py-2 pr-3 text-right">
                {r.used} of {r.limit}
              </td>
              <td className="w-1/3 py-2">
                <progress
                  className="h-2 w-full accent-fern-700"
                  max={1}
                  value={Math.min(1, r.share)}
                  aria-label={`${r.label}: ${r.used} of ${r.limit}`}
                />
              </td>
            </tr>
          ))}
        </tbody>
      </table>
    </section>
  );
}
