import { useState } from "react";
import { Form, useNavigation } from "react-router";
import { SelectField, TextField } from "~/components/ui/field";
import {
  ENTRY_KINDS,
  fieldLabel,
  KIND_FIELDS,
  THOROUGHNESS,
  type EntryKind,
  type FieldUnits,
} from "~/features/journal/journal-entries";

/** The page action's answer, as far as the form redraws it. */
type EntryFormAnswer = {
  intent: string;
  errors?: Record<string, string>;
  values?: Record<string, string>;
  message?: string;
};

/** The entry form; amounts (tap nitrate, ammonia dosed) typed in the person's own units. */
/** `today`: the keeper's day ("2026-12-05", their time zone), the date until they change it. */
export function EntryForm({
  answer,
  units,
  today,
}: {
  answer: EntryFormAnswer | undefined;
  units: FieldUnits;
  today: string;
}) {
  const values = answer?.intent === "add" ? (answer.values ?? {}) : {};
  const errors = answer?.intent === "add" ? (answer.errors ?? {}) : {};
  const [kind, setKind] = useState<EntryKind>((values.kind as EntryKind) || "water_change");
  const busy = useNavigation().state === "submitting";
  return (
    <Form
      method="post"
      className="space-y-3"
      key={answer?.intent === "add" && !answer.errors ? answer.message : "form"}
    >
      <input type="hidden" name="intent" value="add" />
      <div className="grid gap-3 sm:grid-cols-2">
        <TextField
          label="Date"
          name="date"
          type="date"
          required
          defaultValue={values.date ?? today}
          error={errors.date}
        />
        <SelectField
          label="What was done"
          name="kind"
          value={kind}
          onChange={(e) => setKind(e.target.value as EntryKind)}
          options={Object.entries(ENTRY_KINDS).map(([value, label]) => ({ value, label }))}
          error={errors.kind}
        />
        {KIND_FIELDS[kind].map((f) =>
          f === "filter_thoroughness" ? (
            <SelectField
              key={f}
              label={fieldLabel(f, units)}
              name={f}
              defaultValue={values[f] ?? "thorough"}
              options={Object.entries(THOROUGHNESS).map(([value, label]) => ({ value, label }))}
              error={errors[f]}
            />
          ) : (
            <TextField
              key={f}
              label={fieldLabel(f, units)}
              name={f}
              defaultValue={values[f] ?? ""}
              error={errors[f]}
              inputMode={f === "plant_group" ? "text" : "decimal"}
            />
          ),
        )}
        <TextField label="Note" name="note" defaultValue={values.note ?? ""} error={errors.note} maxLength={500} />
      </div>
      <button type="submit" className="btn btn-primary" disabled={busy}>
        Add to the journal
      </button>
    </Form>
  );
}
