/**
 * Settings sent to the API: names the schema does not know are refused by name (zod would drop
 * them silently, so a typo such as `volumeLitres` reset nothing and changed nothing), and a
 * PATCH merges a partial `settings` into the saved ones instead of resetting the rest to defaults.
 */
import type { z } from "zod";
import { ScenarioSchema } from "~models";

type Def = {
  type: string;
  shape?: Record<string, z.ZodType>;
  innerType?: z.ZodType;
  element?: z.ZodType;
  in?: z.ZodType;
};
const defOf = (schema: z.ZodType): Def => (schema as unknown as { _zod: { def: Def } })._zod.def;

/** The object or array schema under wrappers (defaults, prefaults, pipes, optionals). */
function unwrap(schema: z.ZodType): Def {
  let def = defOf(schema);
  for (let i = 0; i < 10 && (def.innerType || (def.type === "pipe" && def.in)); i++)
    def = defOf(def.innerType ?? def.in!);
  return def;
}

const isPlainObject = (v: unknown): v is Record<string, unknown> =>
  v !== null && typeof v === "object" && !Array.isArray(v);

/** Dotted paths of keys in `value` that `schema` does not have (at most 20). */
export function unknownSettingKeys(value: unknown, schema: z.ZodType = ScenarioSchema, path = ""): string[] {
  const def = unwrap(schema);
  const out: string[] = [];
  if (def.type === "object" && def.shape && isPlainObject(value)) {
    for (const [key, child] of Object.entries(value)) {
      const here = path ? `${path}.${key}` : key;
      const known = Object.prototype.hasOwnProperty.call(def.shape, key) ? def.shape[key] : undefined;
      if (!known) out.push(here);
      else out.push(...unknownSettingKeys(child, known, here));
    }
  } else if (def.type === "array" && def.element && Array.isArray(value)) {
    value.slice(0, 100).forEach((item, i) => out.push(...unknownSettingKeys(item, def.element!, `${path}.${i}`)));
  }
  return out.slice(0, 20);
}

/**
 * `patch` laid over `saved`: objects merge key by key, anything else (numbers, text, the list of
 * plant groups) replaces what was there. Neither input changes.
 */
export function mergeSettings(saved: unknown, patch: unknown): unknown {
  if (!isPlainObject(saved) || !isPlainObject(patch)) return patch;
  const out: Record<string, unknown> = { ...saved };
  for (const [key, value] of Object.entries(patch)) {
    if (key === "__proto__" || key === "constructor" || key === "prototype") continue;
    out[key] = mergeSettings(saved[key], value);
  }
  return out;
}
