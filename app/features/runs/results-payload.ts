/**
 * What a results view draws for one run, in the viewer's units (built on the server by
 * results.server.ts), written out so browser code can use it without a *.server import.
 */
import type { NitrogenBudget } from "~models";
import type { ResultWarning } from "~/features/runs/run-warnings";
import type { ChartEvent, ChartGuides, ChartSeries, DisplayKeyFigures } from "~/utils/chart-data";
import type { UnitLabels } from "~/utils/display-units";
import type { PackedSeries } from "~/features/runs/series-packing";
import type { ScenarioFormModel } from "~/features/scenarios/scenario-form-types";

export type ResultsPayload = {
  runId: number;
  labels: UnitLabels;
  series: ChartSeries;
  events: ChartEvent[];
  guides: ChartGuides;
  keyFigures: DisplayKeyFigures;
  budget: NitrogenBudget;
  stats: { steps: number; rhsEvals: number; wallMs: number };
  engineVersion: string;
  tapNitrateAboveDrinkingLimit: boolean;
  tapNitrateDisplay: number;
  /** The drinking-water limit the caution names, in the viewer's units (50 mg/L NO3 = 11.3 mg/L NO3-N). */
  tapNitrateLimitDisplay: number;
  lengthDays: number;
  /** What crosses a caution, in plain words (run-warnings.ts). */
  warnings: ResultWarning[];
};

/** The payload with its series packed into strings: far cheaper to send. */
export type PackedResultsPayload = Omit<ResultsPayload, "series"> & { packedSeries: PackedSeries };

/** A scenario's results for someone who may look but not change them. */
export type ReadOnlyView =
  | { error: string; results: null; settings: ScenarioFormModel | null }
  | { error: null; results: PackedResultsPayload; settings: ScenarioFormModel };
