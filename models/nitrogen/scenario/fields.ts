/**
 * The scenario's leaf fields as the web form needs them, in declaration order. Containers are
 * walked with zod's public API (object shapes, array elements, unwrapping defaults); what each
 * leaf is comes from the field kit's registry, not from zod's internals.
 */
import { z } from "zod";
import type { FieldKind, FieldMeta } from "./field-kit";
import { leafInfo } from "./field-kit";
import { ScenarioSchema } from "./schema";

/** A leaf field of the scenario, as the form needs it. */
export interface ScenarioField {
  /** Path from the scenario root; "*" stands for any element of a list (plant groups). */
  path: (string | "*")[];
  /** Dotted path, e.g. "plants.*.growthRatePerDay". */
  key: string;
  kind: FieldKind;
  meta: FieldMeta;
  min: number | null;
  max: number | null;
  /** Allowed values for enums. */
  options: readonly string[] | null;
  defaultValue: unknown;
}

/** List every leaf field of {@link ScenarioSchema} (or any section of it) with its metadata, bounds and default. */
export function listScenarioFields(schema: z.ZodType = ScenarioSchema): ScenarioField[] {
  const out: ScenarioField[] = [];
  const visit = (s: z.ZodType, path: (string | "*")[]): void => {
    const leaf = leafInfo(s);
    if (leaf) {
      out.push({ path, key: path.join("."), ...leaf });
      return;
    }
    if (s instanceof z.ZodObject) {
      for (const [k, child] of Object.entries(s.shape as Record<string, z.ZodType>)) visit(child, [...path, k]);
    } else if (s instanceof z.ZodArray) {
      visit(s.element as z.ZodType, [...path, "*"]);
    } else if (s instanceof z.ZodDefault || s instanceof z.ZodPrefault || s instanceof z.ZodOptional) {
      visit(s.unwrap() as z.ZodType, path);
    }
  };
  visit(schema, []);
  return out;
}
