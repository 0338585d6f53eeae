/**
 * Test kits and what a reading from one means. A drop test or a strip does not measure a
 * number: the keeper matches a colour to one value of a card, so "0.25" means "somewhere
 * nearer 0.25 than the card's neighbouring values". A reading is therefore an interval of
 * concentrations (interval censoring), and only a meter's or a lab's number is taken as it is.
 *
 * Kits are described in the unit the keeper reads them in (mg/L as NH3, NO2, NO3, or as N);
 * intervals come out in the engine's mg N/L.
 */
import { z } from "zod";
import { N_FRACTION } from "../chemistry";

export const SPECIES = ["tan", "no2", "no3"] as const;
export type Species = (typeof SPECIES)[number];

/** A kit's reading unit: a label and how many mg N/L one unit is (docs/sources.md §0). */
export type KitUnit = { id: string; label: string; mgNPerUnit: number };

/** Units a kit may read in, per species; the ion's own unit first (what hobby kits print). */
export const KIT_UNITS: Record<Species, readonly KitUnit[]> = {
  tan: [
    { id: "asNH3", label: "mg/L NH3", mgNPerUnit: N_FRACTION.NH3 },
    { id: "asNH4", label: "mg/L NH4", mgNPerUnit: N_FRACTION.NH4 },
    { id: "asN", label: "mg/L N", mgNPerUnit: 1 },
  ],
  no2: [
    { id: "asNO2", label: "mg/L NO2", mgNPerUnit: N_FRACTION.NO2 },
    { id: "asN", label: "mg/L NO2-N", mgNPerUnit: 1 },
  ],
  no3: [
    { id: "asNO3", label: "mg/L NO3", mgNPerUnit: N_FRACTION.NO3 },
    { id: "asN", label: "mg/L NO3-N", mgNPerUnit: 1 },
  ],
};

/**
 * The values of a typical hobby colour card, in the kit's unit: roughly doubling steps from 0.
 * Common practice, no source (the shape of the usual drop-test cards, not any one maker's).
 */
export const DEFAULT_CARDS: Record<Species, readonly number[]> = {
  tan: [0, 0.25, 0.5, 1, 2, 4, 8],
  no2: [0, 0.25, 0.5, 1, 2, 5],
  no3: [0, 5, 10, 20, 40, 80, 160],
};

/** Even steps a reading may be rounded to, in the kit's unit, coarsest first (meters, photometers, strips). */
const STEP_CHOICES = [20, 10, 5, 2, 1, 0.5, 0.25, 0.2, 0.1, 0.05, 0.02, 0.01] as const;

/**
 * How a species was tested: "exact" (a meter's or a lab's number), "steps" (rounded to even
 * steps of `step`), or "card" (matched to one of `values`); `unit` is the kit's reading unit id
 * (KIT_UNITS).
 */
export const KitSchema = z.discriminatedUnion("kind", [
  z.object({ kind: z.literal("exact") }),
  z.object({
    kind: z.literal("steps"),
    unit: z.string(),
    step: z.number({ error: "A kit's step must be a number." }).positive("A kit's step must be above zero."),
  }),
  z.object({
    kind: z.literal("card"),
    unit: z.string(),
    values: z
      .array(z.number().min(0, "A card's values cannot be negative."))
      .min(2, "A card has at least two values.")
      .max(20, "A card has at most 20 values."),
  }),
]);
export type Kit = z.infer<typeof KitSchema>;
export type Kits = Partial<Record<Species, Kit>>;

/** The kit's unit for `species`; the ion's own unit when the id is unknown. */
export function kitUnit(species: Species, id: string | undefined): KitUnit {
  return KIT_UNITS[species].find((u) => u.id === id) ?? KIT_UNITS[species][0];
}

/** A reading as an interval of mg N/L: lo = hi for an exact reading; ±Infinity for an open end. */
export type ReadingInterval = { lo: number; hi: number };

const onGrid = (v: number, step: number) => {
  const q = v / step;
  return Math.abs(q - Math.round(q)) <= 1e-6 * Math.max(1, Math.abs(q));
};

/**
 * What a reading of `valueMgN` (mg N/L) means under `kit`. A value of 0 (or the card's first
 * value) is open below: "less than half way to the next colour". A card's top value is open
 * above. A value between two card values (a keeper who wrote "between the colours") lies
 * between them.
 */
export function readingInterval(species: Species, valueMgN: number, kit: Kit): ReadingInterval {
  if (kit.kind === "exact") return { lo: valueMgN, hi: valueMgN };
  const f = kitUnit(species, kit.unit).mgNPerUnit;
  const v = valueMgN / f;
  if (kit.kind === "steps") {
    const q = Math.round(v / kit.step);
    if (!onGrid(v, kit.step)) {
      // Not on the kit's grid: between the two steps around it.
      const below = Math.floor(v / kit.step) * kit.step;
      return { lo: below * f, hi: (below + kit.step) * f };
    }
    return { lo: q <= 0 ? -Infinity : (q - 0.5) * kit.step * f, hi: (q + 0.5) * kit.step * f };
  }
  const card = [...kit.values].sort((a, b) => a - b);
  const k = card.findIndex((c) => Math.abs(c - v) <= 1e-6 * Math.max(1, c));
  if (k < 0) {
    const above = card.findIndex((c) => c > v);
    if (above < 0) return { lo: card[card.length - 1] * f, hi: Infinity };
    if (above === 0) return { lo: -Infinity, hi: card[0] * f };
    return { lo: card[above - 1] * f, hi: card[above] * f };
  }
  const lo = k === 0 ? -Infinity : ((card[k - 1] + card[k]) / 2) * f;
  const hi = k === card.length - 1 ? Infinity : ((card[k] + card[k + 1]) / 2) * f;
  return { lo, hi };
}

/**
 * The kit the readings' values suggest (all in mg N/L): the default card if every value is one
 * of its values (in one of the species' units, preferred unit first), else the coarsest even
 * step that every value sits on, else "exact". With no values, "exact".
 */
export function inferKit(species: Species, valuesMgN: readonly number[], preferredUnit?: string): Kit {
  if (valuesMgN.length === 0) return { kind: "exact" };
  const units = [...KIT_UNITS[species]].sort((a, b) => Number(b.id === preferredUnit) - Number(a.id === preferredUnit));
  for (const u of units) {
    const card = DEFAULT_CARDS[species];
    const onCard = valuesMgN.every((v) => card.some((c) => Math.abs(c - v / u.mgNPerUnit) <= 1e-6 * Math.max(1, c)));
    if (onCard) return { kind: "card", unit: u.id, values: [...card] };
  }
  let best: { unit: string; step: number; mgN: number } | null = null;
  for (const u of units) {
    const step = STEP_CHOICES.find((s) => valuesMgN.every((v) => onGrid(v / u.mgNPerUnit, s)));
    if (step !== undefined && (!best || step * u.mgNPerUnit > best.mgN * (1 + 1e-9)))
      best = { unit: u.id, step, mgN: step * u.mgNPerUnit };
  }
  return best ? { kind: "steps", unit: best.unit, step: best.step } : { kind: "exact" };
}

/**
 * One line for people, e.g. "colour card 0, 0.25, 0.5, 1, 2, 4, 8 mg/L NH3" or "rounded to steps
 * of 0.5 mg/L NO3", in the unit `shownIn` (a KIT_UNITS id; default the kit's own): a kit read in
 * NO3 steps of 0.5 is, to someone who reads nitrate as N, steps of 0.113 mg/L NO3-N. Converted
 * values to 3 significant figures.
 */
export function describeKit(species: Species, kit: Kit, shownIn?: string): string {
  if (kit.kind === "exact") return "exact numbers (a meter or a lab)";
  const own = kitUnit(species, kit.unit);
  const shown = shownIn === undefined ? own : kitUnit(species, shownIn);
  const v = (x: number) => (shown === own ? x : Number(((x * own.mgNPerUnit) / shown.mgNPerUnit).toPrecision(3)));
  if (kit.kind === "steps") return `rounded to steps of ${v(kit.step)} ${shown.label}`;
  return `colour card ${kit.values.map(v).join(", ")} ${shown.label}`;
}

/**
 * A kit's step in the unit `shownIn` (a KIT_UNITS id), as the calibration form's step field
 * holds it: to 12 significant figures, so the kit's own step comes back as it was.
 */
export function kitStepIn(species: Species, kit: Kit & { kind: "steps" }, shownIn: string): number {
  const mgN = kit.step * kitUnit(species, kit.unit).mgNPerUnit;
  return Number((mgN / kitUnit(species, shownIn).mgNPerUnit).toPrecision(12));
}
