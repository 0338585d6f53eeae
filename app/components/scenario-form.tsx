import { useRef, useState } from "react";
import { Form, useNavigation } from "react-router";
import { FormMessage } from "~/components/ui/field";
import type { FieldErrors } from "~/utils/form-errors";
import { isSwitchField } from "~/features/scenarios/field-visibility";
import { FieldInput, type ValueOf } from "~/components/scenario-field-input";
import type { FormField, PlantRow, ScenarioFormModel } from "~/features/scenarios/scenario-form-types";

type Props = {
  model: ScenarioFormModel;
  errors: FieldErrors;
  submitLabel: string;
  /** Extra submit buttons (e.g. "Save as a new scenario"). */
  extraActions?: { intent: string; label: string }[];
  /** Sections open at first (those with errors open too). */
  openSections?: string[];
  /** Note above the form: which units are in use and where to change them. */
  unitsNote: React.ReactNode;
  /** Field names a lesson locks; drawn read-only. */
  locked?: ReadonlySet<string>;
  /** A lesson that fixes the plant groups: no adding or removing rows (their unlocked fields stay editable). */
  plantGroupsLocked?: boolean;
};

function PlantRowFields({
  row,
  errors,
  onGrowthForm,
  onRemove,
  locked,
  fixedRows,
  valueOf,
}: {
  valueOf: ValueOf;
  row: PlantRow;
  errors: FieldErrors;
  onGrowthForm: (index: number, form: string) => void;
  onRemove: (index: number) => void;
  locked?: ReadonlySet<string>;
  fixedRows?: boolean;
}) {
  const name = row.fields.find((f) => f.name.endsWith(".name"))?.value || `Plant group ${row.index + 1}`;
  const rowLocked = fixedRows || row.fields.every((f) => locked?.has(f.name));
  return (
    <fieldset className="rounded-md border border-stone-200 p-3 sm:p-4" data-plant-row={row.index}>
      <legend className="px-1 text-sm font-semibold text-fern-800">{name}</legend>
      <input type="hidden" name={`plants.${row.index}.id`} value={row.id} />
      <div
        className="grid gap-4 sm:grid-cols-2 lg:grid-cols-3"
        onChange={(e) => {
          const target = e.target as unknown as HTMLSelectElement;
          if (target.name === `plants.${row.index}.growthForm`) onGrowthForm(row.index, target.value);
        }}
      >
        {row.fields.map((f) => (
          <FieldInput key={f.name} field={f} error={errors[f.name]} locked={locked?.has(f.name)} valueOf={valueOf} />
        ))}
      </div>
      {rowLocked ? null : (
        <button
          type="submit"
          name="intent"
          value={`remove-plant:${row.index}`}
          className="btn-secondary mt-3"
          onClick={(e) => {
            e.preventDefault();
            onRemove(row.index);
          }}
        >
          Remove {name}
        </button>
      )}
    </fieldset>
  );
}

/** Day 0 on the calendar, so dated test readings line up with the model's days. */
function StartDateInput({ value, error }: { value: string; error?: string }) {
  return (
    <div className="space-y-1">
      <label htmlFor="f-startDate" className="block text-sm font-semibold text-stone-800">
        Run starts on
      </label>
      <input
        id="f-startDate"
        name="startDate"
        type="date"
        defaultValue={value}
        className="input"
        aria-invalid={error ? true : undefined}
        aria-describedby={`f-startDate-hint${error ? " f-startDate-error" : ""}`}
      />
      <p id="f-startDate-hint" className="text-xs text-stone-600">
        The calendar day of day 0, so your test readings line up with the chart. Empty: the day the scenario was made.
      </p>
      {error ? (
        <p id="f-startDate-error" className="text-sm font-semibold text-red-800" role="alert">
          {error}
        </p>
      ) : null}
    </div>
  );
}

/**
 * The scenario setup form. Works without JavaScript (adding and removing plant rows are
 * submit buttons the server answers); with JavaScript those happen in place and choosing a
 * growth form fills in its typical values.
 */
export function ScenarioForm({
  model,
  errors,
  submitLabel,
  extraActions = [],
  openSections = ["water"],
  unitsNote,
  locked,
  plantGroupsLocked = false,
}: Props) {
  const busy = useNavigation().state === "submitting";
  const formRef = useRef<HTMLFormElement>(null);
  const [rows, setRows] = useState(model.plants);
  const [rowsFrom, setRowsFrom] = useState(model);
  const [nextId, setNextId] = useState(model.plants.length + 1);
  // Values of the fields that show or hide others, as changed since the model came.
  const [switched, setSwitched] = useState<Record<string, string>>({});
  if (rowsFrom !== model) {
    // A new model came from the server (a refused save, a preset): start again from it.
    setRowsFrom(model);
    setRows(model.plants);
    setSwitched({});
  }
  const valueOf: ValueOf = (name) =>
    switched[name] ??
    [...model.sections.flatMap((s) => s.fields), ...rows.flatMap((r) => r.fields)].find((f) => f.name === name)?.value;
  const errorNames = Object.keys(errors).filter((k) => k !== "");
  const labelOf = (name: string) => {
    if (name === "name") return "Scenario name";
    const field = [...model.sections.flatMap((s) => s.fields), ...rows.flatMap((r) => r.fields)].find(
      (f) => f.name === name,
    );
    const row = /^plants\.(\d+)\./.exec(name);
    return field ? (row ? `${field.label} (plant group ${Number(row[1]) + 1})` : field.label) : name;
  };
  const sectionHasError = (id: string) =>
    errorNames.some((n) =>
      id === "plants"
        ? n.startsWith("plants")
        : model.sections.find((s) => s.id === id)?.fields.some((f) => f.name === n),
    );

  const fillGrowthForm = (index: number, form: string) => {
    const preset = model.growthFormPresets[form];
    const el = formRef.current;
    if (!preset || !el) return;
    for (const [suffix, value] of Object.entries(preset)) {
      const input = el.elements.namedItem(`plants.${index}.${suffix}`) as HTMLInputElement | null;
      if (input && suffix !== "name") input.value = value;
    }
  };

  const addRow = (form: string) => {
    const template = rows[0] ?? model.plants[0];
    const preset = model.growthFormPresets[form] ?? {};
    const index = rows.length ? Math.max(...rows.map((r) => r.index)) + 1 : 0;
    const fields: FormField[] = (template?.fields ?? []).map((f) => {
      const suffix = f.name.split(".").slice(2).join(".");
      const value = suffix === "growthForm" ? form : (preset[suffix] ?? f.value);
      return { ...f, name: `plants.${index}.${suffix}`, value };
    });
    if (!fields.length) return; // no template row: fall back to the server round trip
    setRows([...rows, { index, id: `group-new-${nextId}`, fields }]);
    setNextId(nextId + 1);
  };

  return (
    <Form
      method="post"
      ref={formRef}
      noValidate
      className="space-y-4"
      onChange={(e) => {
        const input = e.target as unknown as HTMLInputElement;
        if (!isSwitchField(input.name)) return;
        const value = input.type === "checkbox" ? String(input.checked) : input.value;
        setSwitched((was) => ({ ...was, [input.name]: value }));
      }}
    >
      {errors[""] ? <FormMessage>{errors[""]}</FormMessage> : null}
      {errorNames.length ? (
        <FormMessage>
          {errorNames.length === 1 ? "One setting needs" : `${errorNames.length} settings need`} attention:{" "}
          {errorNames.slice(0, 6).map((n, i) => (
            <span key={n}>
              {i ? ", " : ""}
              <a className="link" href={`#f-${n.replace(/\./g, "-")}`}>
                {labelOf(n)}
              </a>
            </span>
          ))}
          {errorNames.length > 6 ? "…" : ""}
        </FormMessage>
      ) : null}
      <div className="text-sm text-stone-600">{unitsNote}</div>
      <div className="space-y-1">
        <label htmlFor="f-name" className="block text-sm font-semibold text-stone-800">
          Scenario name
        </label>
        <input
          id="f-name"
          name="name"
          defaultValue={model.name}
          className="input"
          maxLength={120}
          aria-invalid={errors.name ? true : undefined}
          aria-describedby={errors.name ? "f-name-error" : undefined}
        />
        {errors.name ? (
          <p id="f-name-error" className="text-sm font-semibold text-red-800" role="alert">
            {errors.name}
          </p>
        ) : null}
      </div>
      {model.sections.map((section) => (
        <details
          key={section.id}
          open={openSections.includes(section.id) || sectionHasError(section.id)}
          className="card group"
          id={`section-${section.id}`}
        >
          <summary className="cursor-pointer text-lg font-semibold text-fern-900">{section.title}</summary>
          <p className="mt-1 text-sm text-stone-600">{section.intro}</p>
          {section.id === "plants" ? (
            <div className="mt-4 space-y-4">
              {rows.length === 0 ? (
                <p className="text-sm">No plant groups: nothing takes nitrogen up but bacteria and water changes.</p>
              ) : null}
              {rows.map((row) => (
                <PlantRowFields
                  key={row.id}
                  row={row}
                  errors={errors}
                  locked={locked}
                  fixedRows={plantGroupsLocked}
                  valueOf={valueOf}
                  onGrowthForm={fillGrowthForm}
                  onRemove={(index) => setRows(rows.filter((r) => r.index !== index))}
                />
              ))}
              {plantGroupsLocked ? null : (
                <div className="flex flex-wrap items-end gap-2">
                  <div className="space-y-1">
                    <label htmlFor="new-plant-form" className="block text-sm font-semibold text-stone-800">
                      Growth form of the new group
                    </label>
                    <select id="new-plant-form" name="newPlantForm" className="input" defaultValue="floating">
                      {model.growthForms.map((g) => (
                        <option key={g.value} value={g.value}>
                          {g.label}
                        </option>
                      ))}
                    </select>
                  </div>
                  <button
                    type="submit"
                    name="intent"
                    value="add-plant"
                    className="btn-secondary"
                    disabled={rows.length >= 12}
                    onClick={(e) => {
                      const select = formRef.current?.elements.namedItem("newPlantForm") as HTMLSelectElement | null;
                      if (rows.length > 0 && select) {
                        e.preventDefault();
                        addRow(select.value);
                      }
                    }}
                  >
                    Add a plant group
                  </button>
                </div>
              )}
            </div>
          ) : (
            <div className="mt-4 grid gap-4 sm:grid-cols-2 lg:grid-cols-3">
              {section.fields.map((f) => (
                <FieldInput
                  key={f.name}
                  field={f}
                  error={errors[f.name]}
                  locked={locked?.has(f.name)}
                  valueOf={valueOf}
                />
              ))}
              {section.id === "run" && model.startDate !== undefined ? (
                <StartDateInput value={model.startDate} error={errors.startDate} />
              ) : null}
            </div>
          )}
        </details>
      ))}
      <div className="flex flex-wrap gap-3">
        <button type="submit" name="intent" value="save" className="btn" disabled={busy}>
          {busy ? "Running the model…" : submitLabel}
        </button>
        {extraActions.map((a) => (
          <button key={a.intent} type="submit" name="intent" value={a.intent} className="btn-secondary" disabled={busy}>
            {a.label}
          </button>
        ))}
      </div>
    </Form>
  );
}
