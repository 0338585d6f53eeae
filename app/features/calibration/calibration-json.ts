/**
 * What the calibration page and API show: the kits, the fitted multipliers with their ranges and
 * verdicts, and the assessment before a fit. Built on the server (calibration.server.ts), written
 * out here so browser code can use it without a *.server import.
 */
import type { MultiplierKey, Species, Verdict } from "~models/nitrogen/calibrate";

/** The kit choices on the form: inferred from the values, exact, the default card, or even steps (in display units). */
type KitChoice = "auto" | "exact" | "card" | "steps";

/** How the form shows a kit: its choice, its step in the person's units, and a sentence. */
export type KitView = {
  species: Species;
  name: string;
  choice: Exclude<KitChoice, "auto">;
  step: number | null;
  /** "rounded to steps of 0.113 mg/L NO3-N", in the person's units. */
  text: string;
  /** The unit the step is typed in: the person's ("mg/L NO3-N"). */
  unit: string;
  inferred: boolean;
};

type MultiplierReport = {
  key: MultiplierKey;
  label: string;
  fitted: boolean;
  start: number;
  value: number;
  low95: number | null;
  high95: number | null;
  lowOpen: boolean;
  highOpen: boolean;
  atBound: boolean;
  determined: boolean | null;
  reason: Verdict["reason"] | null;
  correlatedWith: { label: string; correlation: number } | null;
  /** Largest change a doubling makes to a measured value, % of its level. */
  effectPercent: number | null;
  suggestion: string | null;
};

export type CalibrationJson = {
  scenario: { id: number; name: string };
  /** What the fit ran against, in words: the scenario's periodic schedule or the journal as it happened (older results lack it). */
  schedule?: string;
  readingsUsed: number;
  residualCount: number;
  kits: KitView[];
  multipliers: MultiplierReport[];
  rmse: { species: Species; name: string; unit: string; before: number | null; after: number | null }[];
  weightedRmseBefore: number;
  weightedRmseAfter: number;
  /** The readings' error the fit settled on, % of each species' level. */
  noisePercent: number;
  /** Residuals (reading − model) per species, display units, before and after, for the residual plot. */
  residuals: { species: Species; day: number; before: number; after: number }[];
  evaluations: number;
  localFits: number;
  converged: boolean;
  /**
   * Whether the fitted model follows the readings at all; when not, no multiplier is called
   * determined and `text` says why and what to check (older results lack it).
   */
  fitQuality?: { good: boolean; reason: "scatter" | "systematic" | null; text: string | null };
};

export type CalibrationAssessment = {
  kits: KitView[];
  multipliers: {
    key: MultiplierKey;
    determinable: boolean;
    expectedPercent: number | null;
    reason: Verdict["reason"];
    suggestion: string | null;
  }[];
};
