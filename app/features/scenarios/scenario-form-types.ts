/** The setup form as the page draws it: built on the server (app/features/scenarios/scenario-form.server.ts), plain data. */

type FormFieldKind = "number" | "integer" | "boolean" | "enum" | "text";

export type FormField = {
  /** Input name: the scenario path, e.g. "water.volumeL" or "plants.0.startMassG". */
  name: string;
  label: string;
  hint: string;
  kind: FormFieldKind;
  /** What the input shows: a number in the viewer's units, "true"/"false", or an enum value. */
  value: string;
  /** Unit label beside the input ("L", "%", "g/day"…), empty for none. */
  unit: string;
  /** Bounds in display units (inputs' min/max hints; the server checks them too). */
  min: number | null;
  max: number | null;
  options: { value: string; label: string }[] | null;
};

export type FormSection = {
  id: "water" | "fish" | "plants" | "filter" | "maintenance" | "tapWater" | "lowOxygen" | "run" | "multipliers";
  title: string;
  intro: string;
  fields: FormField[];
};

export type PlantRow = {
  index: number;
  id: string;
  fields: FormField[];
};

/** Typical values of each growth form in display units, keyed by field suffix ("startMassG"…). */
type GrowthFormPresets = Record<string, Record<string, string>>;

export type ScenarioFormModel = {
  name: string;
  sections: FormSection[];
  plants: PlantRow[];
  growthForms: { value: string; label: string }[];
  growthFormPresets: GrowthFormPresets;
  /** "Run starts on" (YYYY-MM-DD, "" = the day the scenario is saved); the field is drawn only when set. */
  startDate?: string;
};
