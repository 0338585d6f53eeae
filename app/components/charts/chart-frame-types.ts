/** What ChartFrame (chart-frame.tsx) draws: lines, bands, guides, points and the cursor, described by the charts. */
import { type ReactNode } from "react";
import { type CursorVia } from "~/components/charts/hooks";
import type { ChartEvent } from "~/utils/chart-data";

export type FrameLine = {
  key: string;
  t: ArrayLike<number>;
  y: ArrayLike<number>;
  color: string;
  dash?: string;
  width: number;
  opacity?: number;
  /** Direct label at the line's right end (colour is never the only cue). */
  label?: string;
  /** Draw a dot where the cursor crosses this line (default true). */
  cursorDot?: boolean;
  /**
   * A caution line that must not flatten the data: it counts in the panel's scale only when
   * that stretches the scale by less than half; otherwise it is clipped at the top and its
   * label, pinned there with an arrow, gives its value.
   */
  mayLeaveScale?: boolean;
};

export type FrameBand = { key: string; low: number; high: number; color: string; label: string };
export type FrameGuide = { key: string; value: number; color: string; label: string };
export type FramePoint = {
  key: string;
  day: number;
  value: number;
  color: string;
  shape: "filled" | "ring" | "dot";
  title: string;
};

/** One panel of stacked panels sharing the time axis: its own value scale, title and labels. */
export type FramePanel = {
  key: string;
  /** Axis title above the panel, e.g. "TAN · free NH3 · NO2, mg/L". */
  label: string;
  lines: readonly FrameLine[];
  bands?: readonly FrameBand[];
  guides?: readonly FrameGuide[];
  points?: readonly FramePoint[];
  /** Plot height in px. */
  height: number;
};

type FrameCursor = {
  index: number;
  moveTo: (i: number, via: CursorVia) => void;
  onKeyDown: (e: React.KeyboardEvent) => void;
};

export type ChartFrameProps = {
  title: string;
  description: string;
  /** Sample days the cursor steps through (the main run's). */
  t: ArrayLike<number>;
  /** Panels top to bottom; the time axis and event strip sit under the last. */
  panels: readonly FramePanel[];
  events?: readonly ChartEvent[];
  /** Smallest text size in px (18 in the presentation view, else 11). */
  minFontSize?: number;
  cursor: FrameCursor;
  /** What the cursor shows, next to the chart (below it on narrow screens). */
  readout: ReactNode;
  /** Text for the polite live region (set on keyboard moves and clicks). */
  announcement: string;
  /** Toggles and legend above the chart. */
  toolbar?: ReactNode;
  /** Below the chart (downloads, table). */
  footer?: ReactNode;
  svgRef?: React.Ref<SVGSVGElement>;
};
