/** One input of the scenario setup form: label, control, unit, hint and error; hidden when it does not apply. */
import type { FormField } from "~/features/scenarios/scenario-form-types";
import { fieldApplies } from "~/features/scenarios/field-visibility";

/** The form's current value of a field, for deciding which fields apply. */
export type ValueOf = (name: string) => string | undefined;

export function FieldInput({
  field,
  error,
  locked,
  valueOf,
}: {
  field: FormField;
  error?: string;
  locked?: boolean;
  valueOf: ValueOf;
}) {
  const id = `f-${field.name.replace(/\./g, "-")}`;
  const describedBy =
    [field.hint ? `${id}-hint` : null, error ? `${id}-error` : null].filter(Boolean).join(" ") || undefined;
  const common = {
    id,
    name: field.name,
    "aria-invalid": error ? true : undefined,
    "aria-describedby": describedBy,
    disabled: locked,
  } as const;
  let control: React.ReactNode;
  if (field.kind === "boolean") {
    control = (
      <span className="flex items-center gap-2">
        {locked ? null : <input type="hidden" name={field.name} value="false" />}
        <input
          {...common}
          type="checkbox"
          value="true"
          defaultChecked={field.value === "true"}
          className="h-5 w-5 accent-fern-700"
        />
        <label htmlFor={id} className="text-sm font-semibold text-stone-800">
          {field.label}
        </label>
      </span>
    );
  } else if (field.kind === "text") {
    control = <input {...common} type="text" defaultValue={field.value} maxLength={80} className="input" />;
  } else if (field.kind === "enum") {
    control = (
      <select {...common} defaultValue={field.value} className="input">
        {field.options?.map((o) => (
          <option key={o.value} value={o.value}>
            {o.label}
          </option>
        ))}
      </select>
    );
  } else {
    control = (
      <span className="flex items-center gap-2">
        <input
          {...common}
          type="number"
          step="any"
          inputMode="decimal"
          min={field.min ?? undefined}
          max={field.max ?? undefined}
          defaultValue={field.value}
          className="input figure"
        />
        {field.unit ? <span className="shrink-0 text-sm text-stone-600">{field.unit}</span> : null}
      </span>
    );
  }
  // A setting that does not apply (field-visibility.ts) is hidden; its value still goes with the form.
  return (
    <div className="space-y-1" hidden={!fieldApplies(field.name, valueOf)} data-field={field.name}>
      {field.kind === "boolean" ? null : (
        <label htmlFor={id} className="block text-sm font-semibold text-stone-800">
          {field.label}
          {locked ? <span className="ml-2 text-xs font-normal text-stone-500">(locked by the lesson)</span> : null}
        </label>
      )}
      {locked && field.kind !== "boolean" ? <input type="hidden" name={field.name} value={field.value} /> : null}
      {locked && field.kind === "boolean" ? <input type="hidden" name={field.name} value={field.value} /> : null}
      {control}
      <p id={`${id}-hint`} className="text-xs text-stone-600">
        {field.hint}
      </p>
      {error ? (
        <p id={`${id}-error`} className="text-sm font-semibold text-red-800" role="alert">
          {error}
        </p>
      ) : null}
    </div>
  );
}
