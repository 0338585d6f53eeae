/**
 * Sweeps: run one scenario many times with one setting varied, and read named outcomes from
 * each result. Pure; the web app may run it in a worker and report progress via `onPoint`.
 */
import type { KeyFigures, SimulateOptions, SimulationResult } from "./simulate";
import { simulate } from "./simulate";
import type { Quantity, Scenario, SettingPath } from "./scenario";
import { ScenarioSchema, setScenarioValue } from "./scenario";

/** An outcome a sweep or comparison can plot. */
export interface SweepOutcome {
  id: string;
  label: string;
  quantity: Quantity;
  unit: string;
  get(result: SimulationResult): number | null;
}

const kf =
  <K extends keyof KeyFigures>(k: K) =>
  (r: SimulationResult) =>
    r.keyFigures[k] as unknown as number | null;

/** Outcomes offered by the sweep screen (values in canonical units). */
export const OUTCOMES: readonly SweepOutcome[] = [
  { id: "nitrateEnd", label: "Nitrate at the end", quantity: "nitrate", unit: "mg N/L", get: kf("nitrateEnd") },
  {
    id: "nitrateBeforeLastWaterChange",
    label: "Nitrate before the last water change",
    quantity: "nitrate",
    unit: "mg N/L",
    get: kf("nitrateBeforeLastWaterChange"),
  },
  {
    id: "peakNitrate",
    label: "Highest nitrate",
    quantity: "nitrate",
    unit: "mg N/L",
    get: (r) => r.keyFigures.peakNitrate.value,
  },
  {
    id: "peakFreeNh3",
    label: "Highest free ammonia",
    quantity: "ammonia",
    unit: "mg N/L",
    get: (r) => r.keyFigures.peakFreeNh3.value,
  },
  {
    id: "peakNitrite",
    label: "Highest nitrite",
    quantity: "nitrite",
    unit: "mg N/L",
    get: (r) => r.keyFigures.peakNitrite.value,
  },
  {
    id: "daysAboveNitrateTarget",
    label: "Days above the nitrate target",
    quantity: "days",
    unit: "days",
    get: kf("daysAboveNitrateTarget"),
  },
  {
    id: "cyclingFinishedDay",
    label: "Day cycling finished",
    quantity: "days",
    unit: "days",
    get: kf("cyclingFinishedDay"),
  },
  { id: "plantsTrimmedG", label: "Plants trimmed out", quantity: "mass", unit: "g", get: kf("plantsTrimmedG") },
  {
    id: "nitrogenToGas",
    label: "Nitrogen lost as gas",
    quantity: "none",
    unit: "mg N",
    get: (r) => r.budget.outputs.denitrificationN2 + r.budget.outputs.anammoxN2,
  },
];

export interface SweepPoint {
  value: number;
  /** Outcome values by id; null where an outcome does not apply. */
  outcomes: Record<string, number | null>;
  /** Set when this point could not be run (message for keepers). */
  error: string | null;
}

/**
 * Run the scenario once per value of the setting at `path`, returning the chosen outcomes.
 * A point whose settings are invalid or cannot be solved carries `error` instead of stopping the sweep.
 */
export function sweep(
  scenario: Scenario,
  path: SettingPath,
  values: readonly number[],
  options: SimulateOptions & {
    outcomes?: readonly string[];
    onPoint?: (index: number, point: SweepPoint) => void;
  } = {},
): SweepPoint[] {
  const wanted = OUTCOMES.filter((o) => !options.outcomes || options.outcomes.includes(o.id));
  return values.map((value, index) => {
    let point: SweepPoint;
    try {
      const parsed = ScenarioSchema.safeParse(setScenarioValue(scenario, path, value));
      if (!parsed.success) {
        point = { value, outcomes: {}, error: parsed.error.issues.map((i) => i.message).join("; ") };
      } else {
        const r = simulate(parsed.data, options);
        point = { value, outcomes: Object.fromEntries(wanted.map((o) => [o.id, o.get(r)])), error: null };
      }
    } catch (e) {
      point = { value, outcomes: {}, error: e instanceof Error ? e.message : String(e) };
    }
    options.onPoint?.(index, point);
    return point;
  });
}
