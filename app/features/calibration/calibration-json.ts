/**
 * What a calibration reports, built on the server (calibration.server.ts) and written out here
 * so browser code can use it without a *.server import.
 */
import type { MultiplierKey, Species } from "~models/nitrogen/calibrate";

export type CalibrationJson = {
  scenario: { id: number; name: string };
  readingsUsed: number;
  residualCount: number;
  multipliers: {
    key: MultiplierKey;
    label: string;
    fitted: boolean;
    start: number;
    value: number;
    standardError: number | null;
    low95: number | null;
    high95: number | null;
    atBound: boolean;
  }[];
  rmse: { species: Species; name: string; unit: string; before: number | null; after: number | null }[];
  weightedRmseBefore: number;
  weightedRmseAfter: number;
  /** Residuals (reading − model) per species, display units, before and after, for the residual plot. */
  residuals: { species: Species; day: number; before: number; after: number }[];
  iterations: number;
  evaluations: number;
  converged: boolean;
};
