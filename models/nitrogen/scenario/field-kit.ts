/**
 * Building blocks for the scenario's leaf fields: bounded numbers, switches, choices and text,
 * each with keeper-readable messages and its form metadata. Every builder records what the form
 * needs (kind, bounds, options, default, label, hint, unit) in an explicit registry, so the field
 * list is read from here rather than from zod's internals.
 */
import { z } from "zod";

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
  /** Labels for the options of a choice, by option id. */
  optionLabels?: Readonly<Record<string, string>>;
  [k: string]: unknown;
}

/** Label, hint and (for choices) option labels: the metadata of a field without a unit. */
export interface LabelHint {
  label: string;
  hint: string;
  optionLabels?: Readonly<Record<string, string>>;
}

export type FieldKind = "number" | "integer" | "boolean" | "enum" | "string" | "literal";

/** What the registry knows about one leaf. */
export interface LeafInfo {
  kind: FieldKind;
  meta: FieldMeta;
  min: number | null;
  max: number | null;
  options: readonly string[] | null;
  defaultValue: unknown;
}

const registry = new WeakMap<z.ZodType, LeafInfo>();

/** The registered description of a leaf schema, or undefined for containers. */
export function leafInfo(schema: z.ZodType): LeafInfo | undefined {
  return registry.get(schema);
}

function register<T extends z.ZodType>(schema: T, info: LeafInfo): T {
  // .meta() returns a new schema: register the one that is handed out.
  const withMeta = schema.meta(info.meta) as T;
  registry.set(withMeta, info);
  return withMeta;
}

function fmt(n: number): string {
  return Number.isInteger(n) ? String(n) : String(Number(n.toPrecision(4)));
}

interface NumOpts {
  min: number;
  max: number;
  int?: boolean;
}

/** A bounded number with keeper-readable messages and form metadata. */
export function num(def: number, meta: FieldMeta, o: NumOpts) {
  const u = meta.unit ? ` ${meta.unit}` : "";
  let s = z.number({ error: `${meta.label} must be a number` });
  if (o.int) s = s.int({ error: `${meta.label} must be a whole number` });
  s = s
    .min(o.min, { error: `${meta.label} must be at least ${fmt(o.min)}${u}` })
    .max(o.max, { error: `${meta.label} must be at most ${fmt(o.max)}${u}` });
  const kind = o.int ? "integer" : "number";
  return register(s.default(def), { kind, meta, min: o.min, max: o.max, options: null, defaultValue: def });
}

/** A yes/no switch. */
export function bool(def: boolean, meta: LabelHint) {
  const full: FieldMeta = { ...meta, quantity: "none", unit: "" };
  const s = z.boolean({ error: `${meta.label} must be yes or no` }).default(def);
  return register(s, { kind: "boolean", meta: full, min: null, max: null, options: null, defaultValue: def });
}

/** One of a fixed list of options. */
export function choice<const T extends readonly [string, ...string[]]>(
  options: T,
  def: T[number],
  meta: LabelHint,
  error: string,
) {
  const full: FieldMeta = { ...meta, quantity: "none", unit: "" };
  const s = z.enum(options, { error }).default(def as never);
  return register(s, { kind: "enum", meta: full, min: null, max: null, options, defaultValue: def });
}

/**
 * Free text up to `max` characters (`min` 1 forbids empty text). `subject` names the field in
 * messages when the short label would be unclear ("Plant group name" for "Name").
 */
export function text(def: string, meta: LabelHint, o: { min?: number; max: number; subject?: string }) {
  const full: FieldMeta = { ...meta, quantity: "none", unit: "" };
  const who = o.subject ?? meta.label;
  let s = z.string({ error: `${who} must be text` });
  if (o.min) s = s.min(o.min, { error: `${who} must not be empty` });
  s = s.max(o.max, { error: `${who} must be at most ${o.max} characters` });
  return register(s.default(def), {
    kind: "string",
    meta: full,
    min: null,
    max: null,
    options: null,
    defaultValue: def,
  });
}

/** A fixed value (the schema version). */
export function literal<const V extends number>(value: V, meta: LabelHint, error: string) {
  const full: FieldMeta = { ...meta, quantity: "none", unit: "" };
  const s = z.literal(value, { error }).default(value as never);
  return register(s, { kind: "literal", meta: full, min: null, max: null, options: null, defaultValue: value });
}

/**
 * Days between repeated events: 0 for never, else at least a day. A positive interval below
 * a day would schedule thousands of water changes or cleanings (and was never meant).
 */
export function intervalDays(def: number, meta: FieldMeta) {
  const s = z
    .number({ error: `${meta.label} must be a number` })
    .min(0, { error: `${meta.label} must be at least 0 days (0 for never)` })
    .max(365, { error: `${meta.label} must be at most 365 days` })
    .refine((v) => v === 0 || v >= 1, { error: `${meta.label} must be 0 (never) or at least 1 day` })
    .default(def);
  return register(s, { kind: "number", meta, min: 0, max: 365, options: null, defaultValue: def });
}

/** A share between 0 and `max` (shown as a percentage by the form). */
export const fraction = (def: number, label: string, hint: string, max = 1) =>
  num(def, { label, hint, quantity: "fraction", unit: "" }, { min: 0, max });
