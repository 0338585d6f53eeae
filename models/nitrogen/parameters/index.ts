/**
 * Every default number the engine uses, each with its source. This is the one place to look
 * up where a value comes from; the scenario schema, the presets and the processes read here.
 * Source words follow docs/sources.md (see ./sourced.ts).
 */
import { AOB, BACTERIA, GROWTH_FORM_DEFAULTS, LOW_OXYGEN, NOB, ORGANICS, PLANT_UPTAKE } from "./biology";
import { CARDINAL_TEMPERATURES, INHIBITION, LOW_OXYGEN_MEDIA, OXYGEN } from "./environment";
import { SCENARIO_DEFAULTS } from "./scenario-defaults";
import type { Sourced } from "./sourced";

export * from "./biology";
export * from "./environment";
export { SCENARIO_DEFAULTS } from "./scenario-defaults";

/**
 * Every sourced parameter, flattened to "group.name" → Sourced, for documentation and the
 * parameters table the web app may show.
 */
export function listParameters(): { key: string; value: number; unit: string; source: string }[] {
  const out: { key: string; value: number; unit: string; source: string }[] = [];
  const walk = (prefix: string, node: unknown): void => {
    if (node && typeof node === "object" && "value" in node && "source" in node) {
      const s = node as Sourced;
      out.push({ key: prefix, value: s.value, unit: s.unit, source: s.source });
      return;
    }
    if (node && typeof node === "object") {
      for (const [k, v] of Object.entries(node)) {
        if (k === "label") continue;
        walk(prefix ? `${prefix}.${k}` : k, v);
      }
    }
  };
  walk("", {
    AOB,
    NOB,
    BACTERIA,
    ORGANICS,
    PLANT_UPTAKE,
    GROWTH_FORM_DEFAULTS,
    LOW_OXYGEN,
    OXYGEN,
    INHIBITION,
    CARDINAL_TEMPERATURES,
    LOW_OXYGEN_MEDIA,
    SCENARIO_DEFAULTS,
  });
  return out;
}
