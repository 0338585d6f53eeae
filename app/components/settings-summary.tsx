import type { FormField, ScenarioFormModel } from "~/features/scenarios/scenario-form-types";

/** A form field's value as a person reads it: "yes"/"no", an option's label, or the number. */
export function fieldText(field: Pick<FormField, "kind" | "value" | "options">): string {
  if (field.kind === "boolean") return field.value === "true" ? "yes" : "no";
  if (field.kind === "enum") return field.options?.find((o) => o.value === field.value)?.label ?? field.value;
  return field.value === "" ? "–" : field.value;
}

function Fields({ fields }: { fields: FormField[] }) {
  return (
    <dl className="grid gap-x-6 gap-y-2 sm:grid-cols-2 lg:grid-cols-3">
      {fields.map((f) => (
        <div key={f.name} className="flex items-baseline justify-between gap-2 border-b border-stone-100 py-1">
          <dt className="text-sm text-stone-700">{f.label}</dt>
          <dd className="text-right text-sm">
            <span className={f.kind === "number" || f.kind === "integer" ? "figure" : ""}>{fieldText(f)}</span>
            {f.unit && f.kind !== "boolean" && f.kind !== "enum" ? (
              <span className="ml-1 text-xs text-stone-600">{f.unit}</span>
            ) : null}
          </dd>
        </div>
      ))}
    </dl>
  );
}

/**
 * The settings of a scenario, read-only, in the viewer's units (the setup form's model drawn as
 * definition lists). `open` names the sections shown unfolded.
 */
export function SettingsSummary({
  model,
  open = ["water", "fish", "plants"],
}: {
  model: ScenarioFormModel;
  open?: string[];
}) {
  return (
    <section aria-labelledby="settings-title" className="space-y-2">
      <h2 id="settings-title" className="text-lg">
        Settings
      </h2>
      {model.sections.map((s) => (
        <details key={s.id} open={open.includes(s.id)} className="rounded-md border border-stone-200 bg-white p-3">
          <summary className="cursor-pointer font-semibold text-fern-900">{s.title}</summary>
          <div className="mt-2">
            {s.id === "plants" ? (
              model.plants.length === 0 ? (
                <p className="text-sm">No plant groups.</p>
              ) : (
                <div className="space-y-3">
                  {model.plants.map((p) => (
                    <div key={p.id}>
                      <h3 className="text-sm font-semibold">
                        {p.fields.find((f) => f.name.endsWith(".name"))?.value || `Plant group ${p.index + 1}`}
                      </h3>
                      <Fields fields={p.fields} />
                    </div>
                  ))}
                </div>
              )
            ) : (
              <Fields fields={s.fields} />
            )}
          </div>
        </details>
      ))}
    </section>
  );
}
