import { useContainerWidth } from "~/components/charts/hooks";
import { replayPaths, type ReplayCurve } from "~/features/journal/journal-chart";
import { formatDate } from "~/utils/dates";

/** The nitrate curve of the journal's replay, with the test readings and the upper target. */
export function ReplayChart({ replay }: { replay: ReplayCurve & { startMs: number; unit: string } }) {
  // Drawn at the width it gets (720 before scripts run), so its labels keep their size on a phone.
  const [box, width] = useContainerWidth<HTMLElement>();
  const W = width || 720;
  const H = 260;
  const p = replayPaths(replay, W, H);
  return (
    <figure ref={box}>
      <svg
        viewBox={`0 0 ${W} ${H}`}
        role="img"
        aria-label={`Nitrate as it happened, ${replay.unit}, with test readings`}
        className="w-full"
      >
        {p.yTicks.map((t) => (
          <g key={t.label}>
            <line x1={40} x2={W - 10} y1={t.y} y2={t.y} stroke="#e7e5e4" />
            <text x={34} y={t.y + 4} textAnchor="end" fontSize={11}>
              {t.label}
            </text>
          </g>
        ))}
        {p.xTicks.map((t) => (
          <text key={t.label} x={t.x} y={H - 6} textAnchor="middle" fontSize={11}>
            {t.label}
          </text>
        ))}
        <line x1={40} x2={W - 10} y1={p.highY} y2={p.highY} stroke="#b45309" strokeDasharray="6 4" />
        <path d={p.path} fill="none" stroke="#0f766e" strokeWidth={2} data-testid="as-it-happened" />
        {p.dots.map((d, i) => (
          <circle key={i} cx={d.cx} cy={d.cy} r={4} fill="#1c1917" />
        ))}
      </svg>
      <figcaption className="text-sm text-stone-600">
        Nitrate ({replay.unit}) over the days since {formatDate(replay.startMs)}; dots are your test readings, the
        dashed line your upper target. This is a model, not a water test: test your water before acting on it.
      </figcaption>
    </figure>
  );
}
