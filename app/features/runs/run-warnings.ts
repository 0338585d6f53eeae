/**
 * The run's specific warnings in plain words and the viewer's units: what crosses a caution,
 * when, and by how much. Built on the server from the stored run (key figures and the engine's
 * own warnings) and shown on the results, share and presentation pages. Client-safe.
 */
import type { KeyFigures, ModelWarning } from "~models";
import { speciesFactor, toDisplay } from "~models/units";
import { FREE_NH3_CAUTION_MG_N, NITRITE_CAUTION_MG_N } from "~/features/runs/display-figures";
import { formatNumber, unitLabels, type DisplayUnits } from "~/utils/display-units";

/** Which key-figure card a warning belongs to (the card is flagged). */
type WarnedFigure = "peakFreeNh3" | "peakNitrite" | null;

export type ResultWarning = {
  code: string;
  severity: "caution" | "implausible";
  figure: WarnedFigure;
  text: string;
};

/** KH below which a blend of tap and RO water buffers too little (common practice, no source). */
const SAFE_BLEND_KH_DKH = 2;

const SMALL = [
  "",
  "",
  "twice",
  "three",
  "four",
  "five",
  "six",
  "seven",
  "eight",
  "nine",
  "ten",
  "eleven",
  "twelve",
  "thirteen",
  "fourteen",
  "fifteen",
  "sixteen",
  "seventeen",
  "eighteen",
  "nineteen",
  "twenty",
];

/** "twice the caution line", "twenty times …", "35 times …", "40 % above …". */
export function howFarAbove(ratio: number): string {
  if (ratio < 1.95) return `${Math.max(1, Math.round((ratio - 1) * 100))} % above`;
  const n = Math.round(ratio);
  if (n === 2) return "twice";
  return n <= 20 ? `${SMALL[n]} times` : `${n} times`;
}

const modelDay = (d: number) => `day ${formatNumber(d, 3)}`;

/** The two key figures the warnings read: free ammonia's and nitrite's peaks with their days. */
export type ToxicPeaks = Pick<KeyFigures, "peakFreeNh3" | "peakNitrite">;

type Input = {
  /** A run's key figures, or only the peaks of the days in question (a forecast's days ahead). */
  keyFigures: ToxicPeaks;
  warnings: readonly ModelWarning[];
  /** The change water (for the soft-blend warning); left out where the blend is not in question. */
  tapWater?: { khDkh: number; roShare?: number };
  /** The tank's water volume (L), for the warnings about feeding per volume. */
  volumeL?: number;
  /** A model day in words ("day 12" unless given, e.g. a date for a journal's forecast). */
  dayWords?: (day: number) => string;
};

/** The warnings of a run, most harmful first; an empty list when nothing crosses a caution. */
export function resultWarnings(
  { keyFigures: k, warnings, tapWater, volumeL, dayWords = modelDay }: Input,
  units: DisplayUnits,
): ResultWarning[] {
  const day = dayWords;
  const labels = unitLabels(units);
  const kh = (dkh: number) => `${formatNumber(toDisplay("kh", dkh, units))} ${labels.kh}`;
  // Litres per one of the person's volume units (1 for litres).
  const litresPerUnit = 1 / toDisplay("volume", 1, units);
  const nh3 = speciesFactor("ammonia", units);
  const no2 = speciesFactor("nitrite", units);
  const out: ResultWarning[] = [];
  // A feeding warning dated by a logged feeding change (a journal's replay) says from when.
  const fromDay = (d: number | null) => (d === null ? "" : `From ${day(d)}, when the feeding was changed, `);

  if (k.peakFreeNh3.value > FREE_NH3_CAUTION_MG_N) {
    const ratio = k.peakFreeNh3.value / FREE_NH3_CAUTION_MG_N;
    out.push({
      code: "freeAmmoniaAboveCaution",
      severity: "caution",
      figure: "peakFreeNh3",
      text: `Free ammonia reaches ${formatNumber(k.peakFreeNh3.value * nh3)} ${labels.ammonia} on ${day(k.peakFreeNh3.day)}, ${howFarAbove(ratio)} the caution line (${formatNumber(FREE_NH3_CAUTION_MG_N * nh3)} ${labels.ammonia}).`,
    });
  }
  if (k.peakNitrite.value > NITRITE_CAUTION_MG_N) {
    const ratio = k.peakNitrite.value / NITRITE_CAUTION_MG_N;
    out.push({
      code: "nitriteAboveCaution",
      severity: "caution",
      figure: "peakNitrite",
      text: `Nitrite reaches ${formatNumber(k.peakNitrite.value * no2)} ${labels.nitrite} on ${day(k.peakNitrite.day)}, ${howFarAbove(ratio)} the caution line (${formatNumber(NITRITE_CAUTION_MG_N * no2)} ${labels.nitrite}).`,
    });
  }
  for (const w of warnings) {
    switch (w.code) {
      case "ammoniaAboveAcuteCriterion":
        out.push({
          code: w.code,
          severity: w.severity,
          figure: "peakFreeNh3",
          text: `Total ammonia reaches ${formatNumber(w.value * nh3)} ${labels.ammonia}${w.day === null ? "" : ` on ${day(w.day)}`}, ${howFarAbove(w.value / w.limit)} the short-term criterion at ${w.day === null ? "this" : "that day's"} pH and temperature (${formatNumber(w.limit * nh3)} ${labels.ammonia}, US EPA 2013): deadly to many fish within hours.`,
        });
        break;
      case "ammoniaAboveChronicCriterion":
        out.push({
          code: w.code,
          severity: w.severity,
          figure: "peakFreeNh3",
          text: `Total ammonia stays high: it averages ${formatNumber(w.value * nh3)} ${labels.ammonia} up to ${w.day === null ? "the end" : day(w.day)}, ${howFarAbove(w.value / w.limit)} the long-term limit at the average pH and the temperature of those days (${formatNumber(w.limit * nh3)} ${labels.ammonia}, US EPA 2013).`,
        });
        break;
      case "khExhausted":
        out.push({
          code: w.code,
          severity: w.severity,
          figure: null,
          text: `KH runs out${w.day === null ? "" : ` on ${day(w.day)}`} (down to ${kh(w.value)}): the filter bacteria stall and pH can crash. Change water or add buffer.`,
        });
        break;
      case "lowOxygen":
        out.push({
          code: w.code,
          severity: w.severity,
          figure: null,
          text: `Dissolved oxygen falls below the ${formatNumber(w.limit)} mg/L fish need${w.day === null ? "" : ` on ${day(w.day)}`}, down to ${formatNumber(w.value)} mg/L: more surface movement or less food.`,
        });
        break;
      case "heavyFeedingForVolume":
        out.push({
          code: w.code,
          severity: w.severity,
          figure: null,
          text: `${fromDay(w.day)}${formatNumber(w.value * litresPerUnit)} g of food a day per ${labels.volume} of water is far beyond what aquaria are stocked for (about ${formatNumber(w.limit * litresPerUnit)} g at most): check the food per day and the water volume.`,
        });
        break;
      case "feedBeyondOxygenSupply":
        out.push({
          code: w.code,
          severity: w.severity,
          figure: null,
          text: `${fromDay(w.day)}${w.day === null ? "The" : "the"} food needs more oxygen than the water's surface and filter can take up (${howFarAbove(w.value)} the most they bring in): no tank${volumeL === undefined ? "" : ` of ${formatNumber(toDisplay("volume", volumeL, units))} ${labels.volume}`} could carry this feeding.`,
        });
        break;
      default:
        out.push({ code: w.code, severity: w.severity, figure: null, text: w.message });
    }
  }
  const roShare = tapWater?.roShare ?? 0;
  const blendKh = (tapWater?.khDkh ?? Infinity) * (1 - roShare);
  if (roShare > 0 && blendKh < SAFE_BLEND_KH_DKH) {
    out.push({
      code: "blendBelowSafeKh",
      severity: "caution",
      figure: null,
      text: `The change water, ${formatNumber(roShare * 100)} % RO water, has a KH of only ${kh(blendKh)}, below the ${kh(SAFE_BLEND_KH_DKH)} that keeps pH steady: use less RO water or add buffer.`,
    });
  }
  return out;
}
