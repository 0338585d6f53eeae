/**
 * Journal entries: the kinds of thing a keeper does to a tank, their fields, and one flat record
 * of text fields shared by the form, the CSV file and the API (the CSV's header names are the
 * form's field names, with the unit in the name). Client-safe: the page's form uses the labels.
 *
 * Stored canonical: shares as fractions, nitrate and ammonia in mg N/L, plant dry mass in g,
 * feed in g a day.
 */
import { z } from "zod";
import { toCanonical, fromCanonical } from "~models/units";

export const ENTRY_KINDS = {
  water_change: "Water change",
  filter_cleaned: "Filter cleaned",
  gravel_cleaned: "Gravel cleaned",
  plants_added: "Plants added",
  plants_removed: "Plants removed",
  plants_trimmed: "Plants trimmed",
  feeding_changed: "Feeding changed",
  fish_added: "Fish added",
  fish_removed: "Fish removed",
  ammonia_dosed: "Ammonia dosed",
  note: "Note",
} as const;
export type EntryKind = keyof typeof ENTRY_KINDS;
const KIND_IDS = Object.keys(ENTRY_KINDS) as [EntryKind, ...EntryKind[]];

export const THOROUGHNESS = {
  light: "Light rinse in tank water",
  thorough: "Thorough rinse in tank water",
  tap_water: "Rinsed in tap water",
} as const;
type Thoroughness = keyof typeof THOROUGHNESS;

/** The flat fields (form names and CSV columns), after the date and the kind. */
export const ENTRY_FIELDS = [
  "water_changed_percent",
  "water_changed_l",
  "tap_nitrate_no3_mg_l",
  "ro_percent",
  "filter_thoroughness",
  "gravel_cleaned_percent",
  "plant_group",
  "plant_dry_g",
  "feed_g_per_day",
  "fish_count",
  "ammonia_n_mg_l",
] as const;
export type EntryField = (typeof ENTRY_FIELDS)[number];

export const FIELD_LABELS: Record<EntryField, string> = {
  water_changed_percent: "Water changed, %",
  water_changed_l: "or water changed, litres",
  tap_nitrate_no3_mg_l: "Tap water nitrate if measured, mg/L NO3",
  ro_percent: "RO water in the change water, %",
  filter_thoroughness: "How thoroughly",
  gravel_cleaned_percent: "Detritus siphoned, % of the gravel",
  plant_group: "Plant group (as named in the scenario)",
  plant_dry_g: "Dry mass, g",
  feed_g_per_day: "Food from this date, g a day",
  fish_count: "How many fish",
  ammonia_n_mg_l: "Ammonia dosed, mg/L as N",
};

/** Which fields each kind uses (the form shows only these; others must be empty). */
export const KIND_FIELDS: Record<EntryKind, readonly EntryField[]> = {
  water_change: ["water_changed_percent", "water_changed_l", "tap_nitrate_no3_mg_l", "ro_percent"],
  filter_cleaned: ["filter_thoroughness"],
  gravel_cleaned: ["gravel_cleaned_percent"],
  plants_added: ["plant_group", "plant_dry_g"],
  plants_removed: ["plant_group", "plant_dry_g"],
  plants_trimmed: ["plant_group", "plant_dry_g"],
  feeding_changed: ["feed_g_per_day"],
  fish_added: ["fish_count"],
  fish_removed: ["fish_count"],
  ammonia_dosed: ["ammonia_n_mg_l"],
  note: [],
};

/** What an entry holds, canonical units; null = not given. */
export type EntryDetails = {
  share?: number | null;
  litres?: number | null;
  tapNitrateMgN?: number | null;
  roShare?: number | null;
  thoroughness?: Thoroughness;
  gravelShare?: number;
  plantGroup?: string;
  plantDryG?: number;
  feedGPerDay?: number;
  fishCount?: number;
  ammoniaMgN?: number;
};

export type EntryInput = { doneAt: number; kind: EntryKind; details: EntryDetails; note: string };

export const MAX_JOURNAL_NOTE = 500;

const num = (label: string, min: number, max: number) =>
  z
    .string()
    .trim()
    .transform((t, ctx) => {
      if (t === "") return null;
      const n = /^[-+]?(\d+\.?\d*|\.\d+)$/.test(t) ? Number(t) : NaN;
      if (!Number.isFinite(n)) {
        ctx.addIssue({ code: "custom", message: `${label} must be a number, e.g. 25` });
        return z.NEVER;
      }
      if (n < min || n > max) {
        ctx.addIssue({ code: "custom", message: `${label} must be between ${min} and ${max}` });
        return z.NEVER;
      }
      return n;
    });

const FlatSchema = z.object({
  kind: z.enum(KIND_IDS, { error: `Kind must be one of: ${KIND_IDS.join(", ")}` }),
  water_changed_percent: num("Water changed (%)", 1, 95),
  water_changed_l: num("Water changed (litres)", 0.1, 100000),
  tap_nitrate_no3_mg_l: num("Tap water nitrate", 0, 400),
  ro_percent: num("RO share (%)", 0, 100),
  filter_thoroughness: z
    .string()
    .trim()
    .refine((t) => t === "" || t in THOROUGHNESS, {
      message: `How thoroughly must be one of: ${Object.keys(THOROUGHNESS).join(", ")}`,
    }),
  gravel_cleaned_percent: num("Detritus siphoned (%)", 1, 100),
  plant_group: z.string().trim().max(60, { error: "The plant group's name is at most 60 characters" }),
  plant_dry_g: num("Dry mass (g)", 0.01, 10000),
  feed_g_per_day: num("Food (g a day)", 0, 1000),
  fish_count: num("How many fish", 1, 1000),
  ammonia_n_mg_l: num("Ammonia dosed", 0.01, 10),
});

type FieldErrors = Partial<Record<EntryField | "kind", string>>;

/**
 * Text fields (a form or a CSV row) → the entry's kind and details, or field errors. Fields the
 * kind does not use must be empty; those it needs must be there.
 */
export function readEntryFields(
  fields: Partial<Record<EntryField | "kind", string>>,
): { ok: true; kind: EntryKind; details: EntryDetails } | { ok: false; errors: FieldErrors } {
  const raw = Object.fromEntries(["kind", ...ENTRY_FIELDS].map((k) => [k, fields[k as EntryField] ?? ""]));
  const errors: FieldErrors = {};
  const kindId = raw.kind.trim() as EntryKind;
  if (Object.hasOwn(KIND_FIELDS, kindId)) {
    const uses = new Set(KIND_FIELDS[kindId]);
    for (const k of ENTRY_FIELDS) {
      if (!uses.has(k) && raw[k].trim() !== "")
        errors[k] = `${ENTRY_KINDS[kindId]} does not use this field: leave it empty`;
    }
  }
  const parsed = FlatSchema.safeParse(raw);
  if (!parsed.success) {
    for (const i of parsed.error.issues) errors[i.path[0] as EntryField] ??= i.message;
    return { ok: false, errors };
  }
  const f = parsed.data;
  const need = (k: EntryField, ok: boolean) => {
    if (!ok && !errors[k])
      errors[k] = `${FIELD_LABELS[k].replace(/^or /, "")} is needed for ${ENTRY_KINDS[f.kind].toLowerCase()}`;
  };
  let details: EntryDetails = {};
  switch (f.kind) {
    case "water_change":
      need("water_changed_percent", f.water_changed_percent !== null || f.water_changed_l !== null);
      if (f.water_changed_percent !== null && f.water_changed_l !== null)
        errors.water_changed_l = "Give the share or the litres, not both";
      details = {
        share: f.water_changed_percent === null ? null : f.water_changed_percent / 100,
        litres: f.water_changed_l,
        tapNitrateMgN: f.tap_nitrate_no3_mg_l === null ? null : toCanonical("nitrate", f.tap_nitrate_no3_mg_l, "asNO3"),
        roShare: f.ro_percent === null ? null : f.ro_percent / 100,
      };
      break;
    case "filter_cleaned":
      need("filter_thoroughness", f.filter_thoroughness !== "");
      details = { thoroughness: f.filter_thoroughness as Thoroughness };
      break;
    case "gravel_cleaned":
      need("gravel_cleaned_percent", f.gravel_cleaned_percent !== null);
      details = { gravelShare: (f.gravel_cleaned_percent ?? 0) / 100 };
      break;
    case "plants_added":
    case "plants_removed":
    case "plants_trimmed":
      need("plant_group", f.plant_group !== "");
      need("plant_dry_g", f.plant_dry_g !== null);
      details = { plantGroup: f.plant_group, plantDryG: f.plant_dry_g ?? 0 };
      break;
    case "feeding_changed":
      need("feed_g_per_day", f.feed_g_per_day !== null);
      details = { feedGPerDay: f.feed_g_per_day ?? 0 };
      break;
    case "fish_added":
    case "fish_removed":
      need("fish_count", f.fish_count !== null && Number.isInteger(f.fish_count));
      details = { fishCount: f.fish_count ?? 0 };
      break;
    case "ammonia_dosed":
      need("ammonia_n_mg_l", f.ammonia_n_mg_l !== null);
      details = { ammoniaMgN: f.ammonia_n_mg_l ?? 0 };
      break;
    case "note":
      break;
  }
  if (Object.keys(errors).length) return { ok: false, errors };
  return { ok: true, kind: f.kind, details };
}

const text = (n: number | null | undefined, digits = 4) =>
  n === null || n === undefined ? "" : String(Number(n.toPrecision(digits)));

/** An entry's details as the flat text fields (the export, and a form filled for editing). */
export function entryFields(kind: EntryKind, d: EntryDetails): Record<EntryField, string> {
  const out = Object.fromEntries(ENTRY_FIELDS.map((k) => [k, ""])) as Record<EntryField, string>;
  if (kind === "water_change") {
    out.water_changed_percent = d.share == null ? "" : text(d.share * 100);
    out.water_changed_l = text(d.litres);
    out.tap_nitrate_no3_mg_l = d.tapNitrateMgN == null ? "" : text(fromCanonical("nitrate", d.tapNitrateMgN, "asNO3"));
    out.ro_percent = d.roShare == null ? "" : text(d.roShare * 100);
  }
  if (kind === "filter_cleaned") out.filter_thoroughness = d.thoroughness ?? "";
  if (kind === "gravel_cleaned") out.gravel_cleaned_percent = text((d.gravelShare ?? 0) * 100);
  if (kind.startsWith("plants_")) {
    out.plant_group = d.plantGroup ?? "";
    out.plant_dry_g = text(d.plantDryG);
  }
  if (kind === "feeding_changed") out.feed_g_per_day = text(d.feedGPerDay);
  if (kind.startsWith("fish_")) out.fish_count = text(d.fishCount);
  if (kind === "ammonia_dosed") out.ammonia_n_mg_l = text(d.ammoniaMgN);
  return out;
}

/** One line for people: "50 % changed (tap 10 mg/L NO3)". */
export function describeEntry(kind: EntryKind, d: EntryDetails): string {
  const f = entryFields(kind, d);
  switch (kind) {
    case "water_change":
      return [
        f.water_changed_percent ? `${f.water_changed_percent} % changed` : `${f.water_changed_l} L changed`,
        f.tap_nitrate_no3_mg_l && `tap water ${f.tap_nitrate_no3_mg_l} mg/L NO3`,
        f.ro_percent && `${f.ro_percent} % RO`,
      ]
        .filter(Boolean)
        .join(", ");
    case "filter_cleaned":
      return d.thoroughness ? THOROUGHNESS[d.thoroughness] : "";
    case "gravel_cleaned":
      return `${f.gravel_cleaned_percent} % of the detritus siphoned`;
    case "feeding_changed":
      return `${f.feed_g_per_day} g of food a day from now on`;
    case "ammonia_dosed":
      return `${f.ammonia_n_mg_l} mg/L as N`;
    case "note":
      return "";
    default:
      return kind.startsWith("plants_") ? `${f.plant_group}: ${f.plant_dry_g} g dry` : `${f.fish_count} fish`;
  }
}
