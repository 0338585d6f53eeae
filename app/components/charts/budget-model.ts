/**
 * The nitrogen budget arranged for display (pure): the segments of "where the nitrogen went"
 * and the rows of the budget table.
 */
import { SERIES_COLORS } from "~/components/charts/palette";
import type { ChartBudget } from "~/utils/chart-data";

export type BudgetSegment = {
  key: string;
  label: string;
  /** "out": left the tank over the run; "stock": still in the tank at the end. */
  group: "out" | "stock";
  mg: number;
  color: string;
  /** Colour of a label drawn on the segment (dark or white, whichever reads). */
  textColor: string;
};

/**
 * Our neutral palette for the ways out and the pools that are not a species: earth and slate
 * tones, each a step apart in lightness from its neighbours in the bar. The dissolved species
 * and plants keep their chart colours.
 */
const BUDGET_COLORS = {
  waterChanges: "#475569",
  drip: "#94a3b8",
  trims: "#a3b18a",
  denitrificationN2: "#cbd5e1",
  anammoxN2: "#64748b",
  fishGrowth: "#d6c29b",
  leftoversRemoved: "#a8a29e",
  filterCleaning: "#78716c",
  gravelCleaning: "#c4b5a5",
  bacteria: "#57534e",
  detritus: "#8a6a4f",
  fishGut: "#e7ddc8",
} as const;

/** Relative luminance (WCAG 2) of a #rrggbb colour. */
export function luminance(hex: string): number {
  const c = [1, 3, 5].map((k) => parseInt(hex.slice(k, k + 2), 16) / 255);
  const lin = c.map((v) => (v <= 0.03928 ? v / 12.92 : ((v + 0.055) / 1.055) ** 2.4));
  return 0.2126 * lin[0] + 0.7152 * lin[1] + 0.0722 * lin[2];
}

/** Dark ink or white, whichever contrasts more with the background. */
export function textOn(hex: string): string {
  const L = luminance(hex);
  // Contrast with white (1.05 / (L + 0.05)) vs with #1c1917 (L ≈ 0.0116).
  return 1.05 / (L + 0.05) >= (L + 0.05) / 0.0616 ? "#ffffff" : "#1c1917";
}

/**
 * Where the nitrogen went: every way out over the run, then every pool at the end. Together
 * they add up to what was there at the start plus what came in (less the imbalance, which is at
 * solver tolerance). Zero segments are left out; tiny negative stocks (solver noise) count as 0.
 */
export function budgetSegments(budget: ChartBudget, plantNames: readonly string[] = []): BudgetSegment[] {
  const o = budget.outputs;
  const s = budget.stockEnd;
  const raw: Omit<BudgetSegment, "textColor">[] = [
    {
      key: "waterChanges",
      label: "Water changes",
      group: "out",
      mg: o.waterChanges,
      color: BUDGET_COLORS.waterChanges,
    },
    { key: "drip", label: "Drip overflow", group: "out", mg: o.drip, color: BUDGET_COLORS.drip },
    { key: "trims", label: "Plant trims", group: "out", mg: o.trims, color: BUDGET_COLORS.trims },
    {
      key: "denitrificationN2",
      label: "N2 gas (denitrification)",
      group: "out",
      mg: o.denitrificationN2,
      color: BUDGET_COLORS.denitrificationN2,
    },
    { key: "anammoxN2", label: "N2 gas (anammox)", group: "out", mg: o.anammoxN2, color: BUDGET_COLORS.anammoxN2 },
    { key: "fishGrowth", label: "Fish growth", group: "out", mg: o.fishGrowth, color: BUDGET_COLORS.fishGrowth },
    {
      key: "leftoversRemoved",
      label: "Leftover food removed",
      group: "out",
      mg: o.leftoversRemoved,
      color: BUDGET_COLORS.leftoversRemoved,
    },
    {
      key: "filterCleaning",
      label: "Filter cleaning",
      group: "out",
      mg: o.filterCleaning,
      color: BUDGET_COLORS.filterCleaning,
    },
    {
      key: "gravelCleaning",
      label: "Gravel cleaning",
      group: "out",
      mg: o.gravelCleaning,
      color: BUDGET_COLORS.gravelCleaning,
    },
    { key: "waterTan", label: "In the water: TAN", group: "stock", mg: s.water.tan, color: SERIES_COLORS.tan },
    { key: "waterNitrite", label: "In the water: NO2", group: "stock", mg: s.water.nitrite, color: SERIES_COLORS.no2 },
    { key: "waterNitrate", label: "In the water: NO3", group: "stock", mg: s.water.nitrate, color: SERIES_COLORS.no3 },
    {
      key: "plants",
      label: plantNames.length === 1 ? `In plants (${plantNames[0]})` : "In plants",
      group: "stock",
      mg: s.plants,
      color: SERIES_COLORS.plants,
    },
    { key: "bacteria", label: "In bacteria", group: "stock", mg: s.bacteria.total, color: BUDGET_COLORS.bacteria },
    { key: "detritus", label: "In detritus", group: "stock", mg: s.detritus.total, color: BUDGET_COLORS.detritus },
    { key: "fishGut", label: "In the fish (undigested)", group: "stock", mg: s.fishGut, color: BUDGET_COLORS.fishGut },
  ];
  return raw
    .map((seg) => ({ ...seg, mg: Number.isFinite(seg.mg) && seg.mg > 0 ? seg.mg : 0, textColor: textOn(seg.color) }))
    .filter((seg) => seg.mg > 0);
}

type BudgetRow = {
  key: string;
  label: string;
  /** Indent level: 1 for a part of the row above (e.g. TAN within "In the water"). */
  level: 0 | 1;
  mg: number;
  /** Totals are set in bold. */
  total?: boolean;
};

export type BudgetSection = { key: "inputs" | "outputs" | "stocks"; title: string; rows: BudgetRow[] };

/** The budget as table sections. Stock rows carry the end value; `stockRows` adds start and change. */
export function budgetSections(b: ChartBudget, plantNames: readonly string[] = []): BudgetSection[] {
  return [
    {
      key: "inputs",
      title: "Came in",
      rows: [
        { key: "feed", label: "Fish food", level: 0, mg: b.inputs.feed },
        { key: "tapWater", label: "Tap water", level: 0, mg: b.inputs.tapWater },
        { key: "dosing", label: "Ammonia dosing", level: 0, mg: b.inputs.dosing },
        // Only a replayed journal puts plants in (older stored runs lack the figure).
        ...(b.inputs.plantsAdded
          ? [{ key: "plantsAdded", label: "Plants put in (journal)", level: 0 as const, mg: b.inputs.plantsAdded }]
          : []),
        { key: "inputsTotal", label: "Total in", level: 0, mg: b.inputs.total, total: true },
      ],
    },
    {
      key: "outputs",
      title: "Went out",
      rows: [
        { key: "waterChanges", label: "Water changes", level: 0, mg: b.outputs.waterChanges },
        { key: "drip", label: "Drip overflow", level: 0, mg: b.outputs.drip },
        { key: "trims", label: "Plant trims", level: 0, mg: b.outputs.trims },
        { key: "denitrificationN2", label: "N2 gas from denitrification", level: 0, mg: b.outputs.denitrificationN2 },
        { key: "anammoxN2", label: "N2 gas from anammox", level: 0, mg: b.outputs.anammoxN2 },
        { key: "fishGrowth", label: "Fish growth", level: 0, mg: b.outputs.fishGrowth },
        { key: "leftoversRemoved", label: "Leftover food removed", level: 0, mg: b.outputs.leftoversRemoved },
        { key: "filterCleaning", label: "Filter cleaning", level: 0, mg: b.outputs.filterCleaning },
        { key: "gravelCleaning", label: "Gravel cleaning", level: 0, mg: b.outputs.gravelCleaning },
        { key: "outputsTotal", label: "Total out", level: 0, mg: b.outputs.total, total: true },
      ],
    },
    {
      key: "stocks",
      title: "In the tank",
      rows: stockRows(b, plantNames).map((r) => ({
        key: r.key,
        label: r.label,
        level: r.level,
        mg: r.end,
        total: r.total,
      })),
    },
  ];
}

export type StockRow = { key: string; label: string; level: 0 | 1; start: number; end: number; total?: boolean };

export function stockRows(b: ChartBudget, plantNames: readonly string[] = []): StockRow[] {
  const a = b.stockStart;
  const z = b.stockEnd;
  const rows: StockRow[] = [
    { key: "water", label: "In the water", level: 0, start: a.water.total, end: z.water.total },
    { key: "waterTan", label: "TAN", level: 1, start: a.water.tan, end: z.water.tan },
    { key: "waterNitrite", label: "Nitrite", level: 1, start: a.water.nitrite, end: z.water.nitrite },
    { key: "waterNitrate", label: "Nitrate", level: 1, start: a.water.nitrate, end: z.water.nitrate },
    { key: "plants", label: "In plants", level: 0, start: a.plants, end: z.plants },
  ];
  if (z.plantsByGroup.length > 1) {
    z.plantsByGroup.forEach((end, i) =>
      rows.push({
        key: `plants-${i}`,
        label: plantNames[i] ?? `Group ${i + 1}`,
        level: 1,
        start: a.plantsByGroup[i] ?? 0,
        end,
      }),
    );
  }
  rows.push(
    { key: "bacteria", label: "In bacteria", level: 0, start: a.bacteria.total, end: z.bacteria.total },
    { key: "detritus", label: "In detritus", level: 0, start: a.detritus.total, end: z.detritus.total },
    { key: "detritusTank", label: "In the gravel and water", level: 1, start: a.detritus.tank, end: z.detritus.tank },
    { key: "detritusFilter", label: "In the filter", level: 1, start: a.detritus.filter, end: z.detritus.filter },
    { key: "fishGut", label: "In the fish (undigested)", level: 0, start: a.fishGut, end: z.fishGut },
    { key: "stocksTotal", label: "Total in the tank", level: 0, start: a.total, end: z.total, total: true },
  );
  return rows;
}
