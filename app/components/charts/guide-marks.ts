/**
 * The target band and the caution lines the charts draw, one wording and one colour each, for
 * the results chart and the compare chart alike.
 */
import type { FrameBand, FrameGuide } from "~/components/charts/chart-frame-types";
import { formatNumber } from "~/components/charts/format";
import { BAND_COLOR, SERIES_COLORS } from "~/components/charts/palette";
import type { ChartGuides } from "~/utils/chart-data";

const CAUTION_RED = "#b91c1c";

/** What a guide belongs to: a species' panel, or oxygen's. */
export type GuideOf = "no3" | "nh3" | "no2" | "o2";

/** The band and caution lines of the guides the run has, for those `drawn` says are on the chart. */
export function guideMarks(
  guides: ChartGuides | undefined,
  drawn: (of: GuideOf) => boolean,
): { bands: FrameBand[]; guideLines: FrameGuide[] } {
  const bands: FrameBand[] = [];
  const guideLines: FrameGuide[] = [];
  if (!guides) return { bands, guideLines };
  if (guides.nitrateBand && drawn("no3")) {
    const { low, high } = guides.nitrateBand;
    bands.push({
      key: "no3-band",
      low,
      high,
      color: BAND_COLOR,
      label: `NO3 target ${formatNumber(low)}–${formatNumber(high)}`,
    });
  }
  const line = (of: GuideOf, key: string, value: number | null | undefined, color: string, label: string) => {
    if (value != null && drawn(of)) guideLines.push({ key, value, color, label: `${label} ${formatNumber(value)}` });
  };
  line("nh3", "nh3-caution", guides.freeAmmoniaCaution, SERIES_COLORS.nh3, "free NH3 caution");
  line("no2", "no2-caution", guides.nitriteCaution, SERIES_COLORS.no2, "NO2 caution");
  line("o2", "o2-caution", guides.oxygenCaution, CAUTION_RED, "fish suffer below");
  return { bands, guideLines };
}
