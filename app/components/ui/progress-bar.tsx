/**
 * A progress bar in Fernwater's own style: a rounded stone track with a fern fill that glides
 * to each new value (a CSS transition on its width, not the browser's own <progress> look).
 * role="progressbar" with its values, so screen readers announce it as the native one.
 */

/** The filled share, 0–100 %, of `value` out of `max` (0 for nothing to do or no progress yet). */
function progressPercent(value: number, max: number): number {
  if (!(max > 0) || !Number.isFinite(value)) return 0;
  return Math.min(100, Math.max(0, (value / max) * 100));
}

export function ProgressBar({
  id,
  value,
  max,
  label,
  labelledBy,
  valueText,
}: {
  id?: string;
  value: number;
  max: number;
  /** Accessible name, when no <label> points at `id`. */
  label?: string;
  /** Id of the visible text that names the bar. */
  labelledBy?: string;
  /** What a screen reader says for the value ("3 of 20 runs"). */
  valueText?: string;
}) {
  const percent = progressPercent(value, max);
  return (
    <div
      id={id}
      role="progressbar"
      aria-label={label}
      aria-labelledby={labelledBy}
      aria-valuemin={0}
      aria-valuemax={max}
      aria-valuenow={value}
      aria-valuetext={valueText}
      data-progress-bar=""
      className="h-3 w-full overflow-hidden rounded-full border border-stone-300 bg-stone-100"
    >
      <div
        className="h-full rounded-full bg-fern-700 transition-[width] duration-300 ease-out motion-reduce:transition-none"
        style={{ width: `${percent}%` }}
      />
    </div>
  );
}
