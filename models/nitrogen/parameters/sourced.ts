/**
 * A number with its unit and where it comes from. Source words follow docs/sources.md:
 * - a named publication (e.g. "Metcalf & Eddy Table 8-14") when the value is published there;
 * - "computed" when worked from a stated formula;
 * - "from memory" when recalled but not checked against the publication;
 * - "common practice, no source" for a hobby rule of thumb;
 * - "model choice, no source" for a knob of this model that has no measured counterpart
 *   (for example how fast detritus drifts into the filter). These are the first to calibrate.
 */
export interface Sourced {
  readonly value: number;
  readonly unit: string;
  readonly source: string;
}

export const p = (value: number, unit: string, source: string): Sourced => ({ value, unit, source });
