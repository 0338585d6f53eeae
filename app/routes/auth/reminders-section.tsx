import { Form } from "react-router";
import { FormMessage, SelectField, TextField } from "~/components/ui/field";
import { REMINDER_MODES } from "~/features/reminders/reminder-preferences";

type TankReminder = { tankId: number; name: string; mode: string; hour: number };
const MODE_OPTIONS = Object.entries(REMINDER_MODES).map(([value, label]) => ({ value, label }));

/** Per tank: off, a mail on days a planned task is due, or a weekly digest, at an hour on the keeper's clock (their time zone). */
export function RemindersSection(props: {
  tanks: TankReminder[];
  errors: Record<string, string>;
  values: Record<string, string>;
  saved: boolean;
}) {
  const { tanks, errors, values, saved } = props;
  return (
    <section className="card space-y-4" aria-labelledby="reminders-title">
      <h2 id="reminders-title" className="text-lg">
        E-mail reminders
      </h2>
      <p className="text-sm text-stone-600">
        Opt in per tank: a mail on days a planned task is due, or a weekly digest of the next two weeks with the
        forecast. Every mail has a link to stop it. The model is not a water test: keep testing your water.
      </p>
      {saved ? <FormMessage tone="success">Your reminder settings were saved.</FormMessage> : null}
      {errors.tankId && values.intent === "reminders" ? <FormMessage>{errors.tankId}</FormMessage> : null}
      {tanks.length === 0 ? <p>You have no tanks yet.</p> : null}
      {tanks.map((t) => {
        const mine = values.intent === "reminders" && values.tankId === String(t.tankId);
        return (
          <Form
            key={t.tankId}
            method="post"
            className="grid items-end gap-4 sm:grid-cols-3"
            noValidate
            aria-label={`Reminders for ${t.name}`}
          >
            <input type="hidden" name="intent" value="reminders" />
            <input type="hidden" name="tankId" value={t.tankId} />
            <SelectField
              label={`Reminders for ${t.name}`}
              name="mode"
              defaultValue={mine ? values.mode : t.mode}
              options={MODE_OPTIONS}
              error={mine ? errors.mode : undefined}
            />
            <TextField
              label="Hour (0–23, your time zone)"
              name="hour"
              inputMode="numeric"
              defaultValue={mine ? values.hour : String(t.hour)}
              error={mine ? errors.hour : undefined}
            />
            <div>
              <button type="submit" className="btn">
                Save reminders
              </button>
            </div>
          </Form>
        );
      })}
    </section>
  );
}
