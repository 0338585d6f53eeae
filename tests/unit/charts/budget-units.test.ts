/**
 * The budget's tables use one unit per column, named in the column's header (issue 12, item 12):
 * never "850 mg N" above "12.3 g N" in the same column. Common practice, no source.
 */
import { createElement } from "react";
import { renderToStaticMarkup } from "react-dom/server";
import { describe, expect, it } from "vitest";
import { stockRows } from "~/components/charts/budget-model";
import { BudgetTable } from "~/components/charts/budget";
import { columnUnit, formatInUnit } from "~/components/charts/format";
import type { ChartBudget } from "~/utils/chart-data";
import { ScenarioSchema, getPreset, simulate } from "../../../models";

function runPreset(id: string, lengthDays = 180): ChartBudget {
  const s = ScenarioSchema.parse({ ...getPreset(id)!.scenario, run: { lengthDays, outputIntervalDays: 1 } });
  return simulate(s).budget;
}

/** The cells of each column of every table in the markup, as text, and the header texts. */
function columns(html: string): { headers: string[]; cells: string[][] }[] {
  const doc = html.split("<table").slice(1);
  return doc.map((t) => {
    const headers = [...t.matchAll(/<th scope="col"[^>]*>(.*?)<\/th>/g)].map((m) => m[1].replace(/<[^>]+>/g, " "));
    const rows = [...t.matchAll(/<tr[^>]*>(.*?)<\/tr>/g)].map((m) =>
      [...m[1].matchAll(/<td[^>]*>(.*?)<\/td>/g)].map((c) => c[1].replace(/<[^>]+>/g, " ").trim()),
    );
    const width = Math.max(0, ...rows.map((r) => r.length));
    return { headers, cells: Array.from({ length: width }, (_v, k) => rows.map((r) => r[k]).filter(Boolean)) };
  });
}

describe("one unit per budget column", () => {
  it("chooses g N for a column whose largest amount is 10 g or more, else mg N", () => {
    expect(columnUnit([12, 850, 12_300])).toBe("g N");
    expect(columnUnit([12, 850, 9_999])).toBe("mg N");
    expect(formatInUnit(850, "g N")).toBe("0.85");
    expect(formatInUnit(12_300, "g N")).toBe("12.3");
    expect(formatInUnit(850, "mg N")).toBe("850");
  });

  it.each(["crowded-reach", "fern-hollow"])("%s: no cell carries a unit, and every amount header names one", (id) => {
    const b = runPreset(id);
    // The run must mix small and large amounts, or the check could not fail.
    const ends = stockRows(b)
      .map((r) => Math.abs(r.end))
      .filter((x) => x > 0);
    expect(Math.max(...ends) / Math.min(...ends)).toBeGreaterThan(100);
    for (const budgets of [
      [{ label: "Run", budget: b }],
      [
        { label: "A", budget: b },
        { label: "B", budget: runPreset(id, 60) },
      ],
    ]) {
      const html = renderToStaticMarkup(createElement(BudgetTable, { budgets }));
      for (const table of columns(html)) {
        for (const cell of table.cells.flat()) expect(cell).not.toMatch(/\bm?g N\b/);
        const amountHeaders = table.headers.filter((h) => !/^(Pool|Flow)$/.test(h.trim()));
        expect(amountHeaders.length).toBeGreaterThan(0);
        for (const h of amountHeaders) expect(h).toMatch(/\b(mg N|g N)\b/);
      }
    }
  });

  it("a column mixing milligrams and grams is shown all in grams", () => {
    const b = runPreset("crowded-reach");
    const html = renderToStaticMarkup(createElement(BudgetTable, { budgets: [{ label: "Run", budget: b }] }));
    const stocks = columns(html)[1];
    const endHeader = stocks.headers.find((h) => h.startsWith("End"))!;
    const unit = columnUnit(stockRows(b).map((r) => r.end));
    expect(endHeader).toContain(unit);
  });
});
