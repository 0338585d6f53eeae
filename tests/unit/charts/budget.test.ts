import { describe, expect, it } from "vitest";
import { budgetSections, budgetSegments, luminance, stockRows, textOn } from "~/components/charts/budget-model";
import { differs } from "~/components/charts/budget";
import type { ChartBudget } from "~/utils/chart-data";
import { ScenarioSchema, getPreset, simulate } from "../../../models";

function runPreset(id: string, lengthDays = 120): ChartBudget & { names: string[] } {
  const s = ScenarioSchema.parse({ ...getPreset(id)!.scenario, run: { lengthDays, outputIntervalDays: 1 } });
  const r = simulate(s);
  return Object.assign(r.budget, { names: r.series.plants.map((p) => p.name) });
}

describe("budgetSegments", () => {
  // Conservation, as the product brief states it: inputs − outputs − change in stock = 0, so
  // what went out plus what is left equals what was there plus what came in (less the tiny
  // imbalance). Checked on the engine's own output.
  it.each(["crowded-reach", "fern-hollow", "first-light-fishless"])("adds up to start + inputs for %s", (id) => {
    const b = runPreset(id);
    const segs = budgetSegments(b, b.names);
    const sum = segs.reduce((s, x) => s + x.mg, 0);
    const whole = b.stockStart.total + b.inputs.total;
    // Stocks that come out negative by solver noise are dropped, so allow for those and the imbalance.
    expect(Math.abs(sum - (whole - b.imbalance))).toBeLessThan(1e-6 * whole + 1e-6);
    expect(segs.every((s) => s.mg > 0)).toBe(true);
    expect(new Set(segs.map((s) => s.color)).size).toBe(segs.length);
  });

  it("lists the ways out before the pools, and names the only plant group", () => {
    const b = runPreset("crowded-reach");
    const segs = budgetSegments(b, ["A few rosettes"]);
    const firstStock = segs.findIndex((s) => s.group === "stock");
    expect(segs.slice(0, firstStock).every((s) => s.group === "out")).toBe(true);
    expect(segs.slice(firstStock).every((s) => s.group === "stock")).toBe(true);
    expect(segs.find((s) => s.key === "plants")?.label).toBe("In plants (A few rosettes)");
  });
});

describe("budget tables", () => {
  it("totals the sections as the engine does", () => {
    const b = runPreset("fern-hollow");
    const [inputs, outputs, stocks] = budgetSections(b, b.names);
    const sum = (rows: { mg: number; total?: boolean }[]) => rows.filter((r) => !r.total).reduce((s, r) => s + r.mg, 0);
    expect(sum(inputs.rows)).toBeCloseTo(b.inputs.total, 6);
    expect(sum(outputs.rows)).toBeCloseTo(b.outputs.total, 6);
    // Three plant groups: a row each, indented under "In plants".
    const rows = stockRows(b, b.names);
    expect(rows.filter((r) => r.key.startsWith("plants-")).map((r) => r.label)).toEqual(b.names);
    expect(stocks.rows.at(-1)).toMatchObject({ key: "stocksTotal", mg: b.stockEnd.total, total: true });
  });

  it("marks differences above 1 % and 0.5 mg N only", () => {
    expect(differs(1000, 1011)).toBe(true);
    expect(differs(1000, 1009)).toBe(false);
    expect(differs(10, 10.4)).toBe(false);
    expect(differs(0, 2)).toBe(true);
  });
});

describe("segment text colour", () => {
  // Relative luminance as defined in WCAG 2.2 (§ "relative luminance"): white 1, black 0.
  it("computes relative luminance per WCAG", () => {
    expect(luminance("#ffffff")).toBeCloseTo(1, 10);
    expect(luminance("#000000")).toBe(0);
    expect(luminance("#808080")).toBeCloseTo(0.2158605, 6);
  });

  it("puts white on the dark species colours and dark ink on the band yellow", () => {
    expect(textOn("#4338ca")).toBe("#ffffff");
    expect(textOn("#9d174d")).toBe("#ffffff");
    expect(textOn("#fef3c7")).toBe("#1c1917");
  });
});
