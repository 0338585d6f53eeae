/**
 * The compare chart's colours per scenario, and its readout at the cursor's day: each
 * scenario's value and its difference from the first (the reference).
 */
import { formatDay, formatNumber, formatSigned } from "~/components/charts/format";
import { LineSwatch } from "~/components/charts/legend";
import { TAN_CRITERIA, TAN_CRITERION_KINDS, type TanCriterionKind } from "~/components/charts/tan-criteria";
import { COMPARE_COLORS, COMPARE_DASHES, SERIES_COLORS, SERIES_NAMES } from "~/components/charts/palette";
import type { SeriesKey } from "~/utils/chart-data";

export /** Colour and dash of the k-th scenario: the species' own colour first, then ours. */
function compareStyle(k: number, key: SeriesKey): { color: string; dash: string | undefined } {
  return {
    color: k === 0 ? SERIES_COLORS[key] : COMPARE_COLORS[(k - 1) % COMPARE_COLORS.length],
    dash: COMPARE_DASHES[k % COMPARE_DASHES.length],
  };
}

export function CompareReadout({
  day,
  species,
  unit,
  runs,
  hidden,
  values: vals,
  criteria,
}: {
  day: number;
  species: SeriesKey;
  unit: string;
  runs: readonly { label: string }[];
  hidden: ReadonlySet<number>;
  values: readonly number[];
  /** Each run's TAN long-term limit and short-term criterion at the pH of the day (TAN only), in `unit`. */
  criteria?: Readonly<Record<TanCriterionKind, readonly number[]>> | null;
}) {
  return (
    <div className="space-y-2 rounded-md border border-stone-200 bg-white p-3">
      <p className="font-semibold">
        {formatDay(day)}{" "}
        <span className="font-normal text-stone-600">
          · {SERIES_NAMES[species].short}, {unit}
        </span>
      </p>
      <table className="w-full text-sm">
        <caption className="sr-only">
          {SERIES_NAMES[species].long} at {formatDay(day)}, and the difference from {runs[0]?.label}
        </caption>
        <thead>
          <tr className="text-left text-xs text-stone-600">
            <th scope="col" className="font-normal">
              Scenario
            </th>
            <th scope="col" className="text-right font-normal">
              Value
            </th>
            <th scope="col" className="text-right font-normal">
              vs first
            </th>
          </tr>
        </thead>
        <tbody>
          {runs.map((run, k) => {
            const { color, dash } = compareStyle(k, species);
            return (
              <tr key={k} className={hidden.has(k) ? "text-stone-400" : ""}>
                <th scope="row" className="py-0.5 pr-2 text-left font-normal">
                  <span className="inline-flex items-center gap-1.5">
                    <LineSwatch color={color} dash={dash} />
                    {run.label}
                  </span>
                </th>
                <td className="num text-right">{formatNumber(vals[k])}</td>
                <td className="num pl-2 text-right text-stone-700">
                  {k === 0 ? "–" : formatSigned(vals[k] - vals[0])}
                </td>
              </tr>
            );
          })}
        </tbody>
      </table>
      {criteria ? <CriteriaTable day={day} unit={unit} runs={runs} hidden={hidden} criteria={criteria} /> : null}
    </div>
  );
}

/**
 * Each scenario's TAN criteria at the pH of the day (decision 0010), in a table of their own so
 * the values above keep their width: the long-term limit is drawn, the short-term criterion is not.
 */
function CriteriaTable({
  day,
  unit,
  runs,
  hidden,
  criteria,
}: {
  day: number;
  unit: string;
  runs: readonly { label: string }[];
  hidden: ReadonlySet<number>;
  criteria: Readonly<Record<TanCriterionKind, readonly number[]>>;
}) {
  return (
    <table className="w-full text-sm">
      <caption className="text-left text-xs text-stone-600">
        TAN criteria at the pH of the day (US EPA 2013), {unit}: the long-term limit is drawn, the short-term criterion
        only given here
        <span className="sr-only"> at {formatDay(day)}</span>
      </caption>
      <thead>
        <tr className="text-left text-xs text-stone-600">
          <th scope="col" className="font-normal">
            Scenario
          </th>
          {TAN_CRITERION_KINDS.map((kind) => (
            <th key={kind} scope="col" className="pl-2 text-right font-normal">
              {TAN_CRITERIA[kind].short}
            </th>
          ))}
        </tr>
      </thead>
      <tbody>
        {runs.map((run, k) => (
          <tr key={k} className={hidden.has(k) ? "text-stone-400" : ""}>
            <th scope="row" className="py-0.5 pr-2 text-left font-normal">
              {run.label}
            </th>
            {TAN_CRITERION_KINDS.map((kind) => (
              <td key={kind} className="num pl-2 text-right">
                {formatNumber(criteria[kind][k])}
              </td>
            ))}
          </tr>
        ))}
      </tbody>
    </table>
  );
}
