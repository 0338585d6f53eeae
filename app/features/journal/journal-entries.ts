/**
 * Journal entries: the kinds of thing a keeper does to a tank, their fields, and one flat record
 * of text fields shared by the form, the CSV file and the API (the CSV's header names are the
 * form's field names, with the unit in the name). Client-safe: the page's form uses the labels.
 *
 * Stored canonical: shares as fractions, nitrate and ammonia in mg N/L, plant dry mass in g,
 * feed in g a day. Amounts of nitrate and ammonia are typed and read in the units of the text
 * they come in: a person's own units on the page's form, the column's own unit (its name says
 * it: `tap_nitrate_no3_mg_l`, `ammonia_n_mg_l`) in the CSV file and the API.
 */
import { z } from "zod";
import { toCanonical, fromCanonical, unitSymbol, type DisplayUnits } from "~models/units";

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

const FIELD_NAMES: Record<EntryField, string> = {
  water_changed_percent: "Water changed, %",
  water_changed_l: "or water changed, litres",
  tap_nitrate_no3_mg_l: "Tap water nitrate if measured",
  ro_percent: "RO water in the change water, %",
  filter_thoroughness: "How thoroughly",
  gravel_cleaned_percent: "Detritus siphoned, % of the gravel",
  plant_group: "Plant group (as named in the scenario)",
  plant_dry_g: "Dry mass, g",
  feed_g_per_day: "Food from this date, g a day",
  fish_count: "How many fish",
  ammonia_n_mg_l: "Ammonia dosed",
};

/** The units amounts of nitrate and ammonia are written in (unit ids of models/units.ts). */
export type FieldUnits = Pick<DisplayUnits, "nitrate" | "ammonia">;

/** The CSV file's and the API's units, as the columns' names say: nitrate as NO3, ammonia as N. */
export const FILE_UNITS: FieldUnits = { nitrate: "asNO3", ammonia: "asN" };

/**
 * Fields that hold an amount of a dissolved species: which quantity, its name in messages, and
 * the range accepted, in the file's units (a person's units get the same range, converted).
 */
const SPECIES_FIELDS: Partial<
  Record<EntryField, { quantity: keyof FieldUnits; name: string; min: number; max: number }>
> = {
  tap_nitrate_no3_mg_l: { quantity: "nitrate", name: "Tap water nitrate", min: 0, max: 400 },
  ammonia_n_mg_l: { quantity: "ammonia", name: "Ammonia dosed", min: 0.01, max: 10 },
};

/** A field's label, an amount's with its unit in `units`: "Tap water nitrate if measured, mg/L NO3-N". */
export function fieldLabel(f: EntryField, units: FieldUnits = FILE_UNITS): string {
  const sp = SPECIES_FIELDS[f];
  return sp ? `${FIELD_NAMES[f]}, ${unitSymbol(sp.quantity, units[sp.quantity])}` : FIELD_NAMES[f];
}

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

const num = (label: string, min: number, max: number, unit = "") =>
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
        ctx.addIssue({ code: "custom", message: `${label} must be between ${min} and ${max}${unit && ` ${unit}`}` });
        return z.NEVER;
      }
      return n;
    });

/** An amount field's check in `units`: the file's range converted, to 3 significant figures, named with its unit. */
function amount(f: EntryField, units: FieldUnits) {
  const sp = SPECIES_FIELDS[f]!;
  const unit = units[sp.quantity];
  const bound = (v: number) =>
    v === 0
      ? 0
      : Number(fromCanonical(sp.quantity, toCanonical(sp.quantity, v, FILE_UNITS[sp.quantity]), unit).toPrecision(3));
  return num(sp.name, bound(sp.min), bound(sp.max), unitSymbol(sp.quantity, unit));
}

function flatSchema(units: FieldUnits) {
  return z.object({
    kind: z.enum(KIND_IDS, { error: `Kind must be one of: ${KIND_IDS.join(", ")}` }),
    water_changed_percent: num("Water changed (%)", 1, 95),
    water_changed_l: num("Water changed (litres)", 0.1, 100000),
    tap_nitrate_no3_mg_l: amount("tap_nitrate_no3_mg_l", units),
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
    ammonia_n_mg_l: amount("ammonia_n_mg_l", units),
  });
}

/** One schema per pair of units (a file's thousands of rows share one). */
const schemas = new Map<string, ReturnType<typeof flatSchema>>();
function schemaFor(units: FieldUnits) {
  const key = `${units.nitrate}|${units.ammonia}`;
  let hit = schemas.get(key);
  if (!hit) schemas.set(key, (hit = flatSchema(units)));
  return hit;
}

type FieldErrors = Partial<Record<EntryField | "kind", string>>;

/**
 * Text fields (a form or a CSV row) → the entry's kind and details, or field errors. Fields the
 * kind does not use must be empty; those it needs must be there. Amounts are read in `units`.
 */
export function readEntryFields(
  fields: Partial<Record<EntryField | "kind", string>>,
  units: FieldUnits = FILE_UNITS,
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
  const parsed = schemaFor(units).safeParse(raw);
  if (!parsed.success) {
    for (const i of parsed.error.issues) errors[i.path[0] as EntryField] ??= i.message;
    return { ok: false, errors };
  }
  const f = parsed.data;
  const need = (k: EntryField, ok: boolean) => {
    if (!ok && !errors[k])
      errors[k] = `${FIELD_NAMES[k].replace(/^or /, "")} is needed for ${ENTRY_KINDS[f.kind].toLowerCase()}`;
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
        tapNitrateMgN:
          f.tap_nitrate_no3_mg_l === null ? null : toCanonical("nitrate", f.tap_nitrate_no3_mg_l, units.nitrate),
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
      details = { ammoniaMgN: toCanonical("ammonia", f.ammonia_n_mg_l ?? 0, units.ammonia) };
      break;
    case "note":
      break;
  }
  if (Object.keys(errors).length) return { ok: false, errors };
  return { ok: true, kind: f.kind, details };
}

/**
 * A stored number as text, to 12 significant figures: far beyond what anyone types, far above the
 * ~1e-16 of a unit's round trip, so a value typed comes back as typed ("2.5", not "2.4999…").
 */
const text = (n: number | null | undefined) => (n === null || n === undefined ? "" : String(Number(n.toPrecision(12))));

/** An entry's details as the flat text fields (the export, and a form filled for editing), amounts in `units`. */
export function entryFields(
  kind: EntryKind,
  d: EntryDetails,
  units: FieldUnits = FILE_UNITS,
): Record<EntryField, string> {
  const out = Object.fromEntries(ENTRY_FIELDS.map((k) => [k, ""])) as Record<EntryField, string>;
  if (kind === "water_change") {
    out.water_changed_percent = d.share == null ? "" : text(d.share * 100);
    out.water_changed_l = text(d.litres);
    out.tap_nitrate_no3_mg_l =
      d.tapNitrateMgN == null ? "" : text(fromCanonical("nitrate", d.tapNitrateMgN, units.nitrate));
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
  if (kind === "ammonia_dosed") out.ammonia_n_mg_l = text(fromCanonical("ammonia", d.ammoniaMgN ?? 0, units.ammonia));
  return out;
}

/** A figure for a sentence: 4 significant figures (what was typed, unless typed to more). */
const short = (t: string) => (t === "" ? "" : String(Number(Number(t).toPrecision(4))));

/** One line for people, amounts in `units`: "50 % changed, tap water 2.5 mg/L NO3-N". */
export function describeEntry(kind: EntryKind, d: EntryDetails, units: FieldUnits = FILE_UNITS): string {
  const f = entryFields(kind, d, units);
  switch (kind) {
    case "water_change":
      return [
        f.water_changed_percent
          ? `${short(f.water_changed_percent)} % changed`
          : `${short(f.water_changed_l)} L changed`,
        f.tap_nitrate_no3_mg_l && `tap water ${short(f.tap_nitrate_no3_mg_l)} ${unitSymbol("nitrate", units.nitrate)}`,
        f.ro_percent && `${short(f.ro_percent)} % RO`,
      ]
        .filter(Boolean)
        .join(", ");
    case "filter_cleaned":
      return d.thoroughness ? THOROUGHNESS[d.thoroughness] : "";
    case "gravel_cleaned":
      return `${short(f.gravel_cleaned_percent)} % of the detritus siphoned`;
    case "feeding_changed":
      return `${short(f.feed_g_per_day)} g of food a day from now on`;
    case "ammonia_dosed":
      return `${short(f.ammonia_n_mg_l)} ${unitSymbol("ammonia", units.ammonia)}`;
    case "note":
      return "";
    default:
      return kind.startsWith("plants_") ? `${f.plant_group}: ${short(f.plant_dry_g)} g dry` : `${f.fish_count} fish`;
  }
}
