import { readFileSync } from "node:fs";
import { join } from "node:path";
import { describe, expect, it } from "vitest";
import { ScenarioSchema, simulate } from "../../models/index";

// An independent reference kept in the repository: tools/reference_model.py re-implements the
// state, right-hand side and events from docs/engine.md and integrates them with scipy's LSODA
// at rtol 1e-10; its output for four scenarios is stored in tools/reference-output.json
// (regenerate with `python3 tools/reference_model.py`). Every state component must agree within
// 0.1 % at days 7, 30 and 180 (just before that day's events), or within a floor far below
// anything measurable for components that are all but zero.
const tools = join(__dirname, "../../tools");
const scenarios = JSON.parse(readFileSync(join(tools, "reference-scenarios.json"), "utf8")) as Record<string, unknown>;
const reference = JSON.parse(readFileSync(join(tools, "reference-output.json"), "utf8")) as {
  scenarios: Record<string, Record<string, number[]>>;
};

/** Absolute floors per component unit: mg N/L and mg O2/L 1e-6, mg N pools 1e-5, dKH 1e-6, g 1e-6. */
const floorFor = (name: string) => (name.includes("(mg N)") ? 1e-5 : 1e-6);

describe("the engine against the independent scipy reference", () => {
  it.each(Object.keys(scenarios))("%s: every state component within 0.1 % at days 7, 30 and 180", (name) => {
    const s = ScenarioSchema.parse(scenarios[name]);
    const r = simulate(s, { rawSeries: true });
    const { names, t, rows } = r.rawSeries;
    for (const [day, expected] of Object.entries(reference.scenarios[name])) {
      const d = Number(day);
      const k = t.findIndex((x) => Math.abs(x - d) < 1e-9); // the first sample at that day: before its events
      expect(k, `${name} day ${day}`).toBeGreaterThanOrEqual(0);
      expected.forEach((value, i) => {
        const got = rows[k][i];
        const allowed = Math.max(1e-3 * Math.abs(value), floorFor(names[i]));
        expect(
          Math.abs(got - value),
          `${name} day ${day} ${names[i]}: engine ${got}, reference ${value}`,
        ).toBeLessThanOrEqual(allowed);
      });
    }
  });
});
