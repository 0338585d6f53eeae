/**
 * The scenario: everything a keeper describes about one tank, validated by zod 4.
 *
 * Canonical units inside (convert at the edges with models/units.ts):
 * volume litres; temperature °C; dissolved nitrogen mg N/L (TAN, nitrite-N, nitrate-N);
 * pools mg N; feed g/day; plant dry mass g; KH dKH; time days.
 *
 * Every leaf field carries `.meta({ label, hint, quantity, unit })` so the web form can render
 * labels, hints and unit pickers from the schema itself; see {@link listScenarioFields}.
 */
import { z } from "zod";
import { GROWTH_FORM_DEFAULTS, GROWTH_FORMS, SCENARIO_DEFAULTS as D } from "./parameters";

/** Current scenario file format. Bump it and add a migration when a field changes meaning. */
export const SCHEMA_VERSION = 1;

/** What kind of quantity a field holds; the form picks a unit selector from it. */
export type Quantity =
  | "volume"
  | "temperature"
  | "nitrate"
  | "nitrite"
  | "ammonia"
  | "kh"
  | "mass"
  | "fraction"
  | "days"
  | "ph"
  | "rate"
  | "count"
  | "none";

/** Form metadata attached to each leaf field. */
export interface FieldMeta {
  /** Short label, e.g. "Water volume". */
  label: string;
  /** One-sentence help a keeper understands. */
  hint: string;
  quantity: Quantity;
  /** Canonical unit as shown next to the number, e.g. "L", "mg N/L", "" for none. */
  unit: string;
  [k: string]: unknown;
}

interface NumOpts {
  min: number;
  max: number;
  int?: boolean;
}

function fmt(n: number): string {
  return Number.isInteger(n) ? String(n) : String(Number(n.toPrecision(4)));
}

/** A bounded number with keeper-readable messages and form metadata. */
function num(def: number, meta: FieldMeta, o: NumOpts) {
  const u = meta.unit ? ` ${meta.unit}` : "";
  let s = z.number({ error: `${meta.label} must be a number` });
  if (o.int) s = s.int({ error: `${meta.label} must be a whole number` });
  s = s
    .min(o.min, { error: `${meta.label} must be at least ${fmt(o.min)}${u}` })
    .max(o.max, { error: `${meta.label} must be at most ${fmt(o.max)}${u}` });
  return s.default(def).meta(meta);
}

function bool(def: boolean, meta: Omit<FieldMeta, "quantity" | "unit">) {
  return z
    .boolean({ error: `${meta.label} must be yes or no` })
    .default(def)
    .meta({ ...meta, quantity: "none", unit: "" });
}

/**
 * Days between repeated events: 0 for never, else at least a day. A positive interval below
 * a day would schedule thousands of water changes or cleanings (and was never meant).
 */
function intervalDays(def: number, meta: FieldMeta) {
  return z
    .number({ error: `${meta.label} must be a number` })
    .min(0, { error: `${meta.label} must be at least 0 days (0 for never)` })
    .max(365, { error: `${meta.label} must be at most 365 days` })
    .refine((v) => v === 0 || v >= 1, { error: `${meta.label} must be 0 (never) or at least 1 day` })
    .default(def)
    .meta(meta);
}

const fraction = (def: number, label: string, hint: string, max = 1) =>
  num(def, { label, hint, quantity: "fraction", unit: "" }, { min: 0, max });

// ---------------------------------------------------------------------------------------------

export const WaterSchema = z.object({
  volumeL: num(
    D.water.volumeL.value,
    {
      label: "Water volume",
      hint: "Actual water in the tank, after gravel and decorations.",
      quantity: "volume",
      unit: "L",
    },
    { min: 1, max: 10000 },
  ),
  temperatureC: num(
    D.water.temperatureC.value,
    { label: "Temperature", hint: "Held steady by a heater or the room.", quantity: "temperature", unit: "°C" },
    { min: 0, max: 40 },
  ),
  pH: num(
    D.water.pH.value,
    {
      label: "pH",
      hint: "Measured pH; it sets how much of the ammonia is in the toxic free form.",
      quantity: "ph",
      unit: "",
    },
    { min: 4, max: 10 },
  ),
  khDkh: num(
    D.water.khDkh.value,
    {
      label: "KH (carbonate hardness)",
      hint: "Buffer that nitrifying bacteria use up; water changes restore it.",
      quantity: "kh",
      unit: "dKH",
    },
    { min: 0, max: 30 },
  ),
  startTan: num(
    D.water.startTan.value,
    {
      label: "Ammonia at the start",
      hint: "Total ammonia (NH3 + NH4) on the first day.",
      quantity: "ammonia",
      unit: "mg N/L",
    },
    { min: 0, max: 50 },
  ),
  startNitrite: num(
    D.water.startNitrite.value,
    { label: "Nitrite at the start", hint: "Nitrite on the first day.", quantity: "nitrite", unit: "mg N/L" },
    { min: 0, max: 50 },
  ),
  startNitrate: num(
    D.water.startNitrate.value,
    { label: "Nitrate at the start", hint: "Nitrate on the first day.", quantity: "nitrate", unit: "mg N/L" },
    { min: 0, max: 200 },
  ),
  phFollowsKh: bool(false, {
    label: "pH follows KH",
    hint: "If on, pH drops as KH is used up (assumes steady CO2); if off, pH stays as entered.",
  }),
});

export const FishSchema = z.object({
  feedGPerDay: num(
    D.fish.feedGPerDay.value,
    {
      label: "Food per day",
      hint: "Grams of dry food given each day, all feeds together.",
      quantity: "mass",
      unit: "g/day",
    },
    { min: 0, max: 1000 },
  ),
  proteinFraction: fraction(
    D.fish.proteinFraction.value,
    "Protein share of the food",
    "From the food label, e.g. 0.45 for 45 % protein.",
    0.8,
  ),
  feedsPerDay: num(
    D.fish.feedsPerDay.value,
    { label: "Feeds per day", hint: "How many times a day the fish are fed.", quantity: "count", unit: "" },
    { min: 1, max: 12, int: true },
  ),
  fractionEaten: fraction(
    D.fish.fractionEaten.value,
    "Share of food eaten",
    "The rest sinks and rots unless you remove it.",
  ),
  leftoversRemoved: bool(false, {
    label: "Leftovers removed",
    hint: "If on, uneaten food is taken out after the meal and adds no nitrogen.",
  }),
  pulsedFeeding: bool(false, {
    label: "Model each meal",
    hint: "If on, each feed is a separate pulse (shows the ammonia bump after meals); slower to compute.",
  }),
});

export const TrimSchema = z.object({
  rule: z
    .enum(["none", "whenFull", "everyDays"], { error: "Trimming rule must be none, when full or every N days" })
    .default("whenFull")
    .meta({
      label: "Trimming",
      hint: "When you cut this group back: never, when it fills its space, or on a fixed schedule.",
      quantity: "none",
      unit: "",
    }),
  fullAtFraction: fraction(0.9, "Counts as full at", "Share of the maximum mass at which you trim.", 1),
  trimToFraction: fraction(0.6, "Trim back to", "Share of the maximum mass left after trimming."),
  everyDays: num(
    14,
    { label: "Trim every", hint: "Days between trims (for the fixed schedule).", quantity: "days", unit: "days" },
    { min: 1, max: 365 },
  ),
});

const stem = GROWTH_FORM_DEFAULTS.stem;

export const PlantGroupSchema = z
  .object({
    id: z
      .string({ error: "Plant group id must be text" })
      .min(1, { error: "Plant group id must not be empty" })
      .max(40, { error: "Plant group id must be at most 40 characters" })
      .default("plants")
      .meta({ label: "Id", hint: "Short unique key for this group.", quantity: "none", unit: "" }),
    name: z
      .string({ error: "Plant group name must be text" })
      .max(80, { error: "Plant group name must be at most 80 characters" })
      .default(stem.label)
      .meta({ label: "Name", hint: "What you call this group of plants.", quantity: "none", unit: "" }),
    growthForm: z
      .enum(GROWTH_FORMS, { error: "Growth form must be stem, floating, rosette, moss or custom" })
      .default("stem")
      .meta({
        label: "Growth form",
        hint: "Sets typical growth rate and nitrogen content.",
        quantity: "none",
        unit: "",
      }),
    startMassG: num(
      stem.startMassG.value,
      {
        label: "Plant mass at the start",
        hint: "Dry mass; fresh plants are roughly ten times heavier.",
        quantity: "mass",
        unit: "g",
      },
      { min: 0, max: 5000 },
    ),
    maxMassG: num(
      stem.maxMassG.value,
      {
        label: "Most the tank holds",
        hint: "Dry mass at which the group fills its space.",
        quantity: "mass",
        unit: "g",
      },
      { min: 0.01, max: 5000 },
    ),
    nitrogenContent: fraction(
      stem.nitrogenContent.value,
      "Nitrogen content",
      "Share of dry mass that is nitrogen, typically 0.02–0.04.",
      0.08,
    ),
    growthRatePerDay: num(
      stem.growthRatePerDay.value,
      {
        label: "Growth rate",
        hint: "Relative growth per day with plenty of nitrogen, e.g. 0.05 doubles in two weeks.",
        quantity: "rate",
        unit: "/day",
      },
      { min: 0, max: 1 },
    ),
    trim: TrimSchema.prefault({}),
  })
  .superRefine((g, ctx) => {
    if (g.startMassG > g.maxMassG) {
      ctx.addIssue({
        code: "custom",
        path: ["startMassG"],
        message: "Plant mass at the start cannot be more than the most the tank holds",
      });
    }
    if (g.trim.rule === "whenFull" && g.trim.trimToFraction >= g.trim.fullAtFraction) {
      ctx.addIssue({
        code: "custom",
        path: ["trim", "trimToFraction"],
        message: "Trim back to a smaller share than the one that counts as full",
      });
    }
  });

export const FilterSchema = z.object({
  capacityMgTanPerDay: num(
    D.filter.capacityMgTanPerDay.value,
    {
      label: "Filter capacity",
      hint: "Ammonia-N a fully grown filter clears per day at 1 mg/L and 25 °C; about 600 per m² of media surface.",
      quantity: "none",
      unit: "mg N/day",
    },
    { min: 1, max: 100000 },
  ),
  establishedAtStart: bool(true, {
    label: "Filter already cycled",
    hint: "Off for a new filter: bacteria must grow first, so ammonia and nitrite peak.",
  }),
  cleaningIntervalDays: intervalDays(D.filter.cleaningIntervalDays.value, {
    label: "Clean filter every",
    hint: "Days between filter cleanings; 0 for never.",
    quantity: "days",
    unit: "days",
  }),
  organicsRemovedFraction: fraction(
    D.filter.organicsRemovedFraction.value,
    "Sludge removed per cleaning",
    "Share of the trapped muck a cleaning takes out.",
  ),
  cleanedInTapWater: bool(false, {
    label: "Rinsed in tap water",
    hint: "Chlorinated tap water kills many of the filter bacteria; old tank water does not.",
  }),
});

export const MaintenanceSchema = z.object({
  waterChangeIntervalDays: intervalDays(D.maintenance.waterChangeIntervalDays.value, {
    label: "Change water every",
    hint: "Days between water changes; 0 for none.",
    quantity: "days",
    unit: "days",
  }),
  waterChangeFraction: fraction(
    D.maintenance.waterChangeFraction.value,
    "Share of water changed",
    "e.g. 0.25 for a quarter of the tank.",
    0.95,
  ),
  gravelCleaningFraction: fraction(
    D.maintenance.gravelCleaningFraction.value,
    "Detritus siphoned per change",
    "Share of the muck in the gravel removed at each water change.",
  ),
  dripLPerDay: num(
    D.maintenance.dripLPerDay.value,
    {
      label: "Continuous drip",
      hint: "Litres a day replaced by a drip or overflow system; 0 for none.",
      quantity: "volume",
      unit: "L/day",
    },
    { min: 0, max: 10000 },
  ),
});

export const TapWaterSchema = z.object({
  nitrate: num(
    D.tapWater.nitrate.value,
    {
      label: "Tap water nitrate",
      hint: "From your water supplier's report or a test.",
      quantity: "nitrate",
      unit: "mg N/L",
    },
    { min: 0, max: 100 },
  ),
  tan: num(
    D.tapWater.tan.value,
    {
      label: "Tap water ammonia",
      hint: "Chloramine-treated water often shows some ammonia.",
      quantity: "ammonia",
      unit: "mg N/L",
    },
    { min: 0, max: 10 },
  ),
  khDkh: num(
    D.tapWater.khDkh.value,
    { label: "Tap water KH", hint: "Carbonate hardness of the tap water.", quantity: "kh", unit: "dKH" },
    { min: 0, max: 30 },
  ),
  roShare: fraction(
    D.tapWater.roShare.value,
    "Reverse-osmosis share",
    "Share of the change water that is RO water (no nitrate, no KH).",
  ),
});

export const LowOxygenSchema = z.object({
  enabled: bool(false, {
    label: "Low-oxygen zones",
    hint: "Deep sand, dense media or a reactor where bacteria turn nitrate into nitrogen gas.",
  }),
  denitrificationCapacityMgNPerDay: num(
    D.lowOxygen.denitrificationCapacityMgNPerDay.value,
    {
      label: "Denitrification capacity",
      hint: "Most nitrate-N the zones remove per day when nitrate is plentiful.",
      quantity: "none",
      unit: "mg N/day",
    },
    { min: 0, max: 10000 },
  ),
  anammoxEnabled: bool(false, {
    label: "Anammox",
    hint: "Bacteria that turn ammonium and nitrite together into nitrogen gas.",
  }),
  anammoxCapacityMgNPerDay: num(
    D.lowOxygen.anammoxCapacityMgNPerDay.value,
    {
      label: "Anammox capacity",
      hint: "Most ammonium-N the anammox bacteria use per day.",
      quantity: "none",
      unit: "mg N/day",
    },
    { min: 0, max: 10000 },
  ),
});

export const RunSchema = z.object({
  lengthDays: num(
    D.run.lengthDays.value,
    { label: "Run length", hint: "How many days to simulate (up to two years).", quantity: "days", unit: "days" },
    { min: 1, max: 730 },
  ),
  outputIntervalDays: num(
    D.run.outputIntervalDays.value,
    {
      label: "Chart point every",
      hint: "Spacing of chart points, from one hour (1/24 day) to one week.",
      quantity: "days",
      unit: "days",
    },
    { min: 1 / 24, max: 7 },
  ),
});

export const FishlessCyclingSchema = z.object({
  enabled: bool(false, {
    label: "Fishless cycling",
    hint: "Dose ammonia into a tank without fish to grow the filter bacteria.",
  }),
  doseMgNPerL: num(
    D.fishlessCycling.doseMgNPerL.value,
    { label: "Ammonia per dose", hint: "Rise in total ammonia from each dose.", quantity: "ammonia", unit: "mg N/L" },
    { min: 0, max: 10 },
  ),
  doseIntervalDays: num(
    D.fishlessCycling.doseIntervalDays.value,
    { label: "Dose every", hint: "Days between doses.", quantity: "days", unit: "days" },
    { min: 0.25, max: 30 },
  ),
  stopRule: z
    .enum(["whenCycled", "afterDays", "never"], { error: "Stop rule must be when cycled, after some days or never" })
    .default("whenCycled")
    .meta({
      label: "Stop dosing",
      hint: "When cycled: stop once a dose is cleared (ammonia and nitrite below 0.1) by the next dose.",
      quantity: "none",
      unit: "",
    }),
  stopAfterDays: num(
    D.fishlessCycling.stopAfterDays.value,
    { label: "Stop after", hint: "Day of the last dose (for the fixed rule).", quantity: "days", unit: "days" },
    { min: 0, max: 730 },
  ),
});

export const TargetsSchema = z
  .object({
    nitrateLow: num(
      D.targets.nitrateLow.value,
      {
        label: "Nitrate target, low",
        hint: "Bottom of the band you aim for; plants starve below it.",
        quantity: "nitrate",
        unit: "mg N/L",
      },
      { min: 0, max: 100 },
    ),
    nitrateHigh: num(
      D.targets.nitrateHigh.value,
      { label: "Nitrate target, high", hint: "Top of the band you aim for.", quantity: "nitrate", unit: "mg N/L" },
      { min: 0, max: 100 },
    ),
  })
  .refine((t) => t.nitrateLow <= t.nitrateHigh, {
    path: ["nitrateLow"],
    message: "The low nitrate target must not be above the high one",
  });

const mult = (label: string, hint: string) =>
  num(1, { label, hint, quantity: "none", unit: "×" }, { min: 0.1, max: 10 });

export const MultipliersSchema = z.object({
  feedLoad: mult("Feed load multiplier", "Scales the nitrogen the food brings in; set by calibration."),
  plantUptake: mult("Plant uptake multiplier", "Scales plant growth and uptake; set by calibration."),
  nitrifierCapacity: mult("Filter capacity multiplier", "Scales the filter bacteria's capacity; set by calibration."),
});

const MAX_PLANT_GROUPS = 12;

export const ScenarioSchema = z
  .object({
    schemaVersion: z
      .literal(SCHEMA_VERSION, { error: `Schema version must be ${SCHEMA_VERSION}` })
      .default(SCHEMA_VERSION)
      .meta({ label: "Schema version", hint: "File format version.", quantity: "none", unit: "" }),
    water: WaterSchema.prefault({}),
    fish: FishSchema.prefault({}),
    plants: z
      .array(PlantGroupSchema, { error: "Plants must be a list of plant groups" })
      .max(MAX_PLANT_GROUPS, { error: `At most ${MAX_PLANT_GROUPS} plant groups` })
      .default(() => [PlantGroupSchema.parse({ id: "stems", name: "Stem plants" })]),
    filter: FilterSchema.prefault({}),
    maintenance: MaintenanceSchema.prefault({}),
    tapWater: TapWaterSchema.prefault({}),
    lowOxygen: LowOxygenSchema.prefault({}),
    run: RunSchema.prefault({}),
    fishlessCycling: FishlessCyclingSchema.prefault({}),
    targets: TargetsSchema.prefault({}),
    multipliers: MultipliersSchema.prefault({}),
  })
  .superRefine((s, ctx) => {
    const seen = new Set<string>();
    s.plants.forEach((g, i) => {
      if (seen.has(g.id)) {
        ctx.addIssue({
          code: "custom",
          path: ["plants", i, "id"],
          message: `Two plant groups share the id "${g.id}"; give each group its own id`,
        });
      }
      seen.add(g.id);
    });
    if (s.water.phFollowsKh && s.water.khDkh <= 0) {
      ctx.addIssue({
        code: "custom",
        path: ["water", "khDkh"],
        message: "pH can only follow KH if KH at the start is above 0 dKH",
      });
    }
  });

/** A validated scenario with every default filled in (canonical units). */
export type Scenario = z.output<typeof ScenarioSchema>;
/** What a caller may pass in: any field may be left out and gets its default. */
export type ScenarioInput = z.input<typeof ScenarioSchema>;
export type PlantGroup = Scenario["plants"][number];

// ---------------------------------------------------------------------------------------------
// Versions and migration
// ---------------------------------------------------------------------------------------------

/** One migration step: takes a raw object of version `from` and returns version `from + 1`. */
export type Migration = (raw: Record<string, unknown>) => Record<string, unknown>;

/**
 * Migrations keyed by the version they upgrade from. Empty while the format is at version 1;
 * when version 2 arrives, add `1: (raw) => ({ ...raw, schemaVersion: 2, ... })`.
 */
export const MIGRATIONS: Readonly<Record<number, Migration>> = {};

/** Thrown by {@link migrateScenario}; {@link parseScenario} turns it into a zod issue. */
export class ScenarioVersionError extends Error {
  constructor(
    message: string,
    readonly version: unknown,
  ) {
    super(message);
    this.name = "ScenarioVersionError";
  }
}

/**
 * Bring a raw scenario object up to {@link SCHEMA_VERSION}. A missing version counts as current.
 * Does not mutate its input. Throws {@link ScenarioVersionError} for a newer or unreadable version.
 */
export function migrateScenario(
  raw: unknown,
  migrations: Readonly<Record<number, Migration>> = MIGRATIONS,
  target: number = SCHEMA_VERSION,
): unknown {
  if (raw === null || typeof raw !== "object" || Array.isArray(raw)) return raw;
  const obj = raw as Record<string, unknown>;
  if (obj.schemaVersion === undefined) return raw;
  const v = obj.schemaVersion;
  if (typeof v !== "number" || !Number.isInteger(v) || v < 1) {
    throw new ScenarioVersionError(`The schema version must be a whole number from 1 to ${target}.`, v);
  }
  if (v > target) {
    throw new ScenarioVersionError(
      `This file was made by a newer version of Fernwater (schema ${v}); this version reads up to ${target}.`,
      v,
    );
  }
  let cur: Record<string, unknown> = { ...obj };
  for (let from = v; from < target; from++) {
    const step = migrations[from];
    if (!step) {
      throw new ScenarioVersionError(`There is no way to read schema ${from} files; this version reads ${target}.`, v);
    }
    cur = step(cur);
  }
  return cur;
}

/**
 * Migrate then validate a raw scenario (e.g. JSON from a file, a form or the database).
 * Returns zod's SafeParse result; a newer schema version comes back as a failure on
 * `schemaVersion` with a message the keeper can act on.
 */
export function parseScenario(raw: unknown): z.ZodSafeParseResult<Scenario> {
  let migrated: unknown;
  try {
    migrated = migrateScenario(raw);
  } catch (e) {
    if (e instanceof ScenarioVersionError) {
      return {
        success: false,
        error: new z.ZodError([
          { code: "custom", path: ["schemaVersion"], message: e.message, input: e.version },
        ]) as z.ZodError<Scenario>,
      };
    }
    throw e;
  }
  return ScenarioSchema.safeParse(migrated);
}

/** One line per problem: "water.volumeL: Water volume must be at least 1 L". */
export function describeScenarioIssues(error: z.ZodError): string[] {
  return error.issues.map((i) => `${i.path.length ? i.path.join(".") : "(scenario)"}: ${i.message}`);
}

// ---------------------------------------------------------------------------------------------
// Field listing for forms
// ---------------------------------------------------------------------------------------------

/** A leaf field of the scenario, as the form needs it. */
export interface ScenarioField {
  /** Path from the scenario root; "*" stands for any element of a list (plant groups). */
  path: (string | "*")[];
  /** Dotted path, e.g. "plants.*.growthRatePerDay". */
  key: string;
  kind: "number" | "integer" | "boolean" | "enum" | "string" | "literal";
  meta: FieldMeta;
  min: number | null;
  max: number | null;
  /** Allowed values for enums. */
  options: readonly string[] | null;
  defaultValue: unknown;
}

type AnySchema = z.ZodType & { _zod: { def: { type: string } & Record<string, unknown> } };

/**
 * Walk {@link ScenarioSchema} (or any section of it) and list every leaf field with its
 * metadata, bounds and default, in declaration order.
 */
export function listScenarioFields(schema: z.ZodType = ScenarioSchema): ScenarioField[] {
  const out: ScenarioField[] = [];
  const visit = (s: AnySchema, path: (string | "*")[], meta: FieldMeta | undefined, dflt: unknown): void => {
    const own = (s.meta() as FieldMeta | undefined) ?? meta;
    const def = s._zod.def;
    switch (def.type) {
      case "default":
      case "prefault": {
        const dv = (def as unknown as { defaultValue: unknown }).defaultValue;
        visit(def.innerType as AnySchema, path, own, dflt ?? (typeof dv === "function" ? (dv as () => unknown)() : dv));
        return;
      }
      case "optional":
      case "nullable":
      case "readonly":
        visit(def.innerType as AnySchema, path, own, dflt);
        return;
      case "pipe":
        visit(def.in as AnySchema, path, own, dflt);
        return;
      case "object": {
        const shape = (s as unknown as z.ZodObject).shape as Record<string, AnySchema>;
        for (const [k, child] of Object.entries(shape)) {
          const childDefault = dflt && typeof dflt === "object" ? (dflt as Record<string, unknown>)[k] : undefined;
          visit(child, [...path, k], undefined, childDefault);
        }
        return;
      }
      case "array":
        visit(def.element as AnySchema, [...path, "*"], undefined, undefined);
        return;
      default: {
        if (!own) return;
        const n = s as unknown as {
          minValue?: number | null;
          maxValue?: number | null;
          isInt?: boolean;
          options?: string[];
        };
        const kind: ScenarioField["kind"] =
          def.type === "number" ? (n.isInt ? "integer" : "number") : (def.type as ScenarioField["kind"]);
        out.push({
          path,
          key: path.join("."),
          kind,
          meta: own,
          min: def.type === "number" ? (n.minValue ?? null) : null,
          max: def.type === "number" ? (n.maxValue ?? null) : null,
          options: def.type === "enum" ? (n.options ?? null) : null,
          defaultValue: dflt,
        });
      }
    }
  };
  visit(schema as AnySchema, [], undefined, undefined);
  return out;
}
