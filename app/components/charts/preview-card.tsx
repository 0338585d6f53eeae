/**
 * The link-preview picture of a shared scenario (issue 12, item 8): a 1200×630 SVG with the
 * nitrate curve in its target band, the toxic species on a panel and scale of their own with
 * their caution lines, and the key figures. Drawn with the chart's own scales, path helper and
 * palette; the server turns it into a PNG (app/features/sharing/preview-image.server.ts), so it
 * uses only SVG attributes (no CSS classes) and the one font the renderer is given.
 */
import { scaleLinear } from "d3-scale";
import { formatDay, formatNumber } from "~/components/charts/format";
import { BAND_COLOR, GRID, INK, SERIES_COLORS, SERIES_DASH } from "~/components/charts/palette";
import { type LinearScale, linePath, PATH_SCALE, scaledDash } from "~/components/charts/paths";
import { dayDomain, maxFinite, valueDomain } from "~/components/charts/scales";
import type { ChartGuides, ChartSeries, ChartUnits, DisplayKeyFigures } from "~/utils/chart-data";

export const PREVIEW_WIDTH = 1200;
export const PREVIEW_HEIGHT = 630;
export const PREVIEW_FONT = "Lora";

const WARN = "#b91c1c";
const PAPER = "#fafaf9";
const LEFT = 96;
const RIGHT = 790;
const NITRATE_PANEL = { top: 204, bottom: 400 };
const TOXIC_PANEL = { top: 456, bottom: 566 };

export type PreviewCardProps = {
  name: string;
  lengthDays: number;
  series: ChartSeries;
  guides: ChartGuides;
  labels: ChartUnits;
  keyFigures: DisplayKeyFigures;
};

export function PreviewCard({ name, lengthDays, series, guides, labels, keyFigures }: PreviewCardProps) {
  const x = scaleLinear().domain(dayDomain(series.t)).range([LEFT, RIGHT]);
  const band = guides.nitrateBand;
  const nitrateY = scaleLinear()
    .domain(valueDomain([maxFinite(series.no3), band?.high ?? 0], 4))
    .range([NITRATE_PANEL.bottom, NITRATE_PANEL.top]);
  const toxicMax = Math.max(maxFinite(series.nh3), maxFinite(series.no2));
  const toxicY = scaleLinear()
    .domain(valueDomain([toxicMax, guides.freeAmmoniaCaution ?? 0, guides.nitriteCaution ?? 0], 3))
    .range([TOXIC_PANEL.bottom, TOXIC_PANEL.top]);
  const columns = RIGHT - LEFT;
  const nh3Over = guides.freeAmmoniaCaution !== undefined && keyFigures.peakFreeNh3.value > guides.freeAmmoniaCaution;
  const no2Over = guides.nitriteCaution !== undefined && keyFigures.peakNitrite.value > guides.nitriteCaution;
  const aboveTarget = keyFigures.daysAboveNitrateTarget > 0;

  return (
    <svg
      xmlns="http://www.w3.org/2000/svg"
      width={PREVIEW_WIDTH}
      height={PREVIEW_HEIGHT}
      viewBox={`0 0 ${PREVIEW_WIDTH} ${PREVIEW_HEIGHT}`}
      fontFamily={PREVIEW_FONT}
    >
      <rect width={PREVIEW_WIDTH} height={PREVIEW_HEIGHT} fill={PAPER} />
      <rect x={0} y={0} width={PREVIEW_WIDTH} height={10} fill={SERIES_COLORS.plants} />
      <text x={40} y={62} fontSize={26} fontWeight={700} fill={SERIES_COLORS.plants}>
        Fernwater
      </text>
      <text x={40} y={112} fontSize={42} fontWeight={700} fill={INK}>
        {shorten(name, 44)}
      </text>
      <text x={40} y={146} fontSize={22} fill={INK}>
        {`Simulated nitrogen over ${lengthDays} days · a model, not a water test`}
      </text>

      <Panel title={`Nitrate, ${labels.nitrate}`} top={NITRATE_PANEL.top} bottom={NITRATE_PANEL.bottom} y={nitrateY} />
      {band && (
        <rect
          x={LEFT}
          width={RIGHT - LEFT}
          y={nitrateY(Math.min(band.high, nitrateY.domain()[1]))}
          height={Math.max(0, nitrateY(band.low) - nitrateY(Math.min(band.high, nitrateY.domain()[1])))}
          fill={BAND_COLOR}
        />
      )}
      <Line d={linePath(series.t, series.no3, x, nitrateY, columns)} color={SERIES_COLORS.no3} width={3} />

      <Panel
        title={`Free ammonia (${labels.ammonia}) and nitrite (${labels.nitrite})`}
        top={TOXIC_PANEL.top}
        bottom={TOXIC_PANEL.bottom}
        y={toxicY}
      />
      {guides.freeAmmoniaCaution !== undefined && (
        <Caution y={toxicY(guides.freeAmmoniaCaution)} color={SERIES_COLORS.nh3} />
      )}
      {guides.nitriteCaution !== undefined && <Caution y={toxicY(guides.nitriteCaution)} color={SERIES_COLORS.no2} />}
      <Line
        d={linePath(series.t, series.nh3, x, toxicY, columns)}
        color={SERIES_COLORS.nh3}
        width={3}
        dash={SERIES_DASH.nh3}
      />
      <Line
        d={linePath(series.t, series.no2, x, toxicY, columns)}
        color={SERIES_COLORS.no2}
        width={3}
        dash={SERIES_DASH.no2}
      />
      <text x={LEFT} y={596} fontSize={18} fill={INK}>
        {formatDay(x.domain()[0])}
      </text>
      <text x={RIGHT} y={596} fontSize={18} fill={INK} textAnchor="end">
        {formatDay(x.domain()[1])}
      </text>

      <g transform="translate(830 190)">
        <Figure y={0} label="Nitrate at the end" value={`${formatNumber(keyFigures.nitrateEnd)} ${labels.nitrate}`} />
        <Figure
          y={100}
          label="Days above the nitrate target"
          value={String(keyFigures.daysAboveNitrateTarget)}
          warn={aboveTarget}
        />
        <Figure
          y={200}
          label={`Peak free ammonia, day ${Math.round(keyFigures.peakFreeNh3.day)}`}
          value={`${formatNumber(keyFigures.peakFreeNh3.value)} ${labels.ammonia}`}
          warn={nh3Over}
        />
        <Figure
          y={300}
          label={`Peak nitrite, day ${Math.round(keyFigures.peakNitrite.day)}`}
          value={`${formatNumber(keyFigures.peakNitrite.value)} ${labels.nitrite}`}
          warn={no2Over}
        />
      </g>
    </svg>
  );
}

function Panel({ title, top, bottom, y }: { title: string; top: number; bottom: number; y: LinearScale }) {
  const [lo, hi] = y.domain();
  return (
    <g>
      <text x={LEFT - 56} y={top - 14} fontSize={20} fontWeight={700} fill={INK}>
        {title}
      </text>
      <line x1={LEFT} x2={RIGHT} y1={top} y2={top} stroke={GRID} strokeWidth={1} />
      <line x1={LEFT} x2={RIGHT} y1={bottom} y2={bottom} stroke={INK} strokeWidth={1.5} />
      <line x1={LEFT} x2={LEFT} y1={top} y2={bottom} stroke={INK} strokeWidth={1.5} />
      <text x={LEFT - 10} y={top + 6} fontSize={18} fill={INK} textAnchor="end">
        {formatNumber(hi)}
      </text>
      <text x={LEFT - 10} y={bottom} fontSize={18} fill={INK} textAnchor="end">
        {formatNumber(lo)}
      </text>
    </g>
  );
}

function Line({ d, color, width, dash }: { d: string; color: string; width: number; dash?: string }) {
  return (
    <g transform={`scale(${1 / PATH_SCALE})`}>
      <path
        d={d}
        fill="none"
        stroke={color}
        strokeWidth={width * PATH_SCALE}
        strokeDasharray={scaledDash(dash)}
        strokeLinejoin="round"
      />
    </g>
  );
}

function Caution({ y, color }: { y: number; color: string }) {
  return <line x1={LEFT} x2={RIGHT} y1={y} y2={y} stroke={color} strokeWidth={1.5} strokeDasharray="3 5" />;
}

function Figure({ y, label, value, warn = false }: { y: number; label: string; value: string; warn?: boolean }) {
  return (
    <g transform={`translate(0 ${y})`}>
      {/* Not by colour alone: a marked figure also carries a "!" badge. */}
      {warn && (
        <g>
          <circle cx={10} cy={12} r={11} fill={WARN} />
          <text x={10} y={19} fontSize={18} fontWeight={700} fill={PAPER} textAnchor="middle">
            !
          </text>
        </g>
      )}
      <text x={warn ? 28 : 0} y={18} fontSize={19} fill={warn ? WARN : INK}>
        {label}
      </text>
      <text x={0} y={58} fontSize={34} fontWeight={700} fill={warn ? WARN : INK}>
        {shorten(value, 18)}
      </text>
    </g>
  );
}

function shorten(text: string, max: number): string {
  return text.length <= max ? text : `${text.slice(0, max - 1)}…`;
}
