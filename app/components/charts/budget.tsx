/**
 * The nitrogen budget: a stacked bar of where the nitrogen went, and the budget as tables
 * (one run in detail, or several runs side by side with differences marked).
 */
import { memo } from "react";
import { budgetSections, budgetSegments, stockRows, type BudgetSegment } from "~/components/charts/budget-model";
import { columnUnit, formatInUnit, formatMgN, formatPercent, type NitrogenUnit } from "~/components/charts/format";
import type { ChartBudget } from "~/utils/chart-data";

export type BudgetBarProps = {
  budget: ChartBudget;
  /** Plant group names in the engine's order (ChartSeries.plants). */
  plantNames?: readonly string[];
  title?: string;
};

/**
 * Everything that was in the tank at the start or came in, split by where it ended up: the
 * ways out on the left, the pools still holding it at the end on the right.
 */
export const BudgetBar = memo(function BudgetBar({
  budget,
  plantNames = [],
  title = "Where the nitrogen went",
}: BudgetBarProps) {
  const segments = budgetSegments(budget, plantNames);
  const total = segments.reduce((s, x) => s + x.mg, 0);
  if (!(total > 0)) {
    return (
      <figure className="space-y-2">
        <figcaption className="font-semibold">{title}</figcaption>
        <p className="text-sm text-stone-700">No nitrogen entered or was present in this run.</p>
      </figure>
    );
  }
  const out = segments.filter((s) => s.group === "out");
  const outMg = out.reduce((s, x) => s + x.mg, 0);
  const stockMg = total - outMg;
  const summary = segments.map((s) => `${s.label} ${formatPercent(s.mg / total)}`).join(", ");
  const legendUnit = columnUnit(segments.map((s) => s.mg));

  return (
    <figure className="space-y-2">
      <figcaption>
        <span className="font-semibold">{title}</span>
        <span className="block text-sm text-stone-700">
          Of the <span className="figure">{formatMgN(total)}</span> in the tank at the start or brought in over the run.
        </span>
      </figcaption>
      <div className="flex justify-between gap-4 text-xs text-stone-700" aria-hidden="true">
        {outMg > 0 ? <span>← left the tank {formatPercent(outMg / total)}</span> : <span />}
        {stockMg > 0 ? <span className="text-right">still in the tank {formatPercent(stockMg / total)} →</span> : null}
      </div>
      <div
        className="flex h-10 w-full overflow-hidden rounded-md border border-stone-300 bg-white"
        role="img"
        aria-label={`${title}: ${summary}.`}
      >
        {segments.map((s, k) => (
          <Segment
            key={s.key}
            segment={s}
            share={s.mg / total}
            first={k === 0}
            afterGroupBreak={k === out.length && k > 0}
          />
        ))}
      </div>
      <ol className="grid gap-x-6 gap-y-1 text-sm sm:grid-cols-2">
        {segments.map((s) => (
          <li key={s.key} className="flex items-baseline gap-2">
            <span
              className="inline-block h-3 w-3 shrink-0 translate-y-0.5 rounded-sm border border-stone-400"
              style={{ background: s.color }}
              aria-hidden="true"
            />
            <span className="min-w-0 flex-1">
              {s.label}
              <span className="sr-only">{s.group === "out" ? " (left the tank)" : " (still in the tank)"}</span>
            </span>
            <span className="figure whitespace-nowrap text-right">
              {formatInUnit(s.mg, legendUnit)} {legendUnit}
            </span>
            <span className="figure w-14 whitespace-nowrap text-right text-stone-600">
              {formatPercent(s.mg / total)}
            </span>
          </li>
        ))}
      </ol>
    </figure>
  );
});

function Segment({
  segment: s,
  share,
  first,
  afterGroupBreak,
}: {
  segment: BudgetSegment;
  share: number;
  first: boolean;
  afterGroupBreak: boolean;
}) {
  // A white hairline between segments keeps neighbours of similar tone apart; a dark one marks
  // the change from "left" to "still in".
  const border = first ? "" : afterGroupBreak ? "border-l-2 border-stone-900" : "border-l border-white";
  return (
    <div
      className={`flex min-w-0 items-center justify-center overflow-hidden ${border}`}
      style={{ width: `${share * 100}%`, background: s.color, color: s.textColor }}
      title={`${s.label}: ${formatMgN(s.mg)} (${formatPercent(share)})`}
    >
      {share >= 0.09 ? <span className="figure truncate px-1 text-xs">{formatPercent(share)}</span> : null}
    </div>
  );
}

type BudgetColumn = { label: string; budget: ChartBudget; plantNames?: readonly string[] };

export type BudgetTableProps = {
  /** One run (shown in detail) or 2–4 runs side by side, the first as reference. */
  budgets: readonly BudgetColumn[];
  caption?: string;
};

/** An amount in its column's unit; the unit itself is said once, in the column's header. */
function Amount({ mg, unit }: { mg: number; unit: NitrogenUnit }) {
  return <>{formatInUnit(mg, unit)}</>;
}

/** A difference worth pointing out: more than 1 % of the reference and more than 0.5 mg N. */
export function differs(ref: number, v: number): boolean {
  const d = Math.abs(v - ref);
  return d > 0.5 && d > 0.01 * Math.max(Math.abs(ref), Math.abs(v));
}

export const BudgetTable = memo(function BudgetTable({ budgets, caption = "Nitrogen budget" }: BudgetTableProps) {
  if (budgets.length === 0) return null;
  if (budgets.length === 1) return <SingleBudgetTable column={budgets[0]} caption={caption} />;

  // Plant groups differ between runs, so only the plants total is compared; rows match by key.
  const sections = budgets.map((b) =>
    budgetSections(b.budget, b.plantNames).map((sec) => ({
      ...sec,
      rows: sec.rows.filter((r) => !r.key.startsWith("plants-")),
      byKey: new Map(sec.rows.map((r) => [r.key, r.mg])),
    })),
  );
  const ref = sections[0];
  // One unit per run's column, from every amount in it.
  const units = budgets.map((b, k) =>
    columnUnit([...sections[k].flatMap((sec) => sec.rows.map((r) => r.mg)), b.budget.imbalance]),
  );
  return (
    <div className="relative overflow-x-auto" tabIndex={0} role="region" aria-label={caption}>
      <table className="w-full border-collapse text-sm">
        <caption className="py-2 text-left text-sm text-stone-700">
          {caption} over each run, in the unit under each run's name. Marked cells differ from {budgets[0].label} by
          more than 1 %.
        </caption>
        <thead>
          <tr className="border-b border-stone-300 text-left align-bottom">
            <td />
            {budgets.map((b, k) => (
              <th key={b.label} scope="col" className="px-2 py-1 text-right">
                {b.label}
                <span className="block text-xs font-normal text-stone-600">{units[k]}</span>
              </th>
            ))}
          </tr>
        </thead>
        {ref.map((section, si) => (
          <tbody key={section.key}>
            <tr>
              <th scope="rowgroup" colSpan={budgets.length + 1} className="pt-3 text-left font-semibold text-fern-800">
                {section.title}
                {section.key === "stocks" ? " (at the end)" : ""}
              </th>
            </tr>
            {section.rows.map((row) => (
              <tr key={row.key} className={`border-b border-stone-100 ${row.total ? "font-semibold" : ""}`}>
                <th scope="row" className={`py-1 pr-2 text-left font-normal ${row.level ? "pl-4 text-stone-700" : ""}`}>
                  {row.label}
                </th>
                {sections.map((s, k) => {
                  const v = s[si].byKey.get(row.key) ?? NaN;
                  const mark = k > 0 && Number.isFinite(v) && differs(row.mg, v);
                  const diff = v - row.mg;
                  return (
                    <td
                      key={k}
                      className={`num whitespace-nowrap px-1 py-1 text-right sm:px-2 ${mark ? "bg-amber-50" : ""}`}
                    >
                      {Number.isFinite(v) ? <Amount mg={v} unit={units[k]} /> : "–"}
                      {mark ? (
                        <span className="block text-xs text-stone-700">
                          {diff > 0 ? "▲ +" : "▼ "}
                          {formatInUnit(diff, units[k])}
                        </span>
                      ) : null}
                    </td>
                  );
                })}
              </tr>
            ))}
          </tbody>
        ))}
        <tbody>
          <tr className="border-t border-stone-300">
            <th scope="row" className="py-1 pr-2 text-left font-normal">
              Imbalance (in − out − change in the tank)
            </th>
            {budgets.map((b, k) => (
              <td key={b.label} className="num whitespace-nowrap px-1 py-1 text-right sm:px-2">
                <Amount mg={b.budget.imbalance} unit={units[k]} />
              </td>
            ))}
          </tr>
        </tbody>
      </table>
    </div>
  );
});

function SingleBudgetTable({ column, caption }: { column: BudgetColumn; caption: string }) {
  const b = column.budget;
  const [inputs, outputs] = budgetSections(b, column.plantNames);
  const stocks = stockRows(b, column.plantNames);
  const flowRows = [inputs, outputs];
  const flowUnit = columnUnit(flowRows.flatMap((sec) => sec.rows.map((r) => r.mg)));
  const startUnit = columnUnit(stocks.map((r) => r.start));
  const endUnit = columnUnit(stocks.map((r) => r.end));
  const changeUnit = columnUnit(stocks.map((r) => r.end - r.start));
  return (
    <div className="space-y-4">
      <div className="relative overflow-x-auto" tabIndex={0} role="region" aria-label={`${caption}: flows`}>
        <table className="w-full max-w-2xl border-collapse text-sm">
          <caption className="py-2 text-left text-sm text-stone-700">
            {caption}: nitrogen that came in and went out over the run
          </caption>
          <thead>
            <tr className="border-b border-stone-300 text-left">
              <th scope="col" className="py-1 pr-2 font-normal text-stone-600">
                Flow
              </th>
              <th scope="col" className="num px-1 py-1 text-right font-normal text-stone-600 sm:px-2">
                Amount ({flowUnit})
              </th>
            </tr>
          </thead>
          {flowRows.map((section) => (
            <tbody key={section.key}>
              <tr>
                <th scope="rowgroup" colSpan={2} className="pt-3 text-left font-semibold text-fern-800">
                  {section.title}
                </th>
              </tr>
              {section.rows.map((row) => (
                <tr key={row.key} className={`border-b border-stone-100 ${row.total ? "font-semibold" : ""}`}>
                  <th scope="row" className="py-1 pr-2 text-left font-normal">
                    {row.label}
                  </th>
                  <td className="num whitespace-nowrap px-1 py-1 text-right sm:px-2">
                    <Amount mg={row.mg} unit={flowUnit} />
                  </td>
                </tr>
              ))}
            </tbody>
          ))}
        </table>
      </div>
      <div className="relative overflow-x-auto" tabIndex={0} role="region" aria-label={`${caption}: in the tank`}>
        <table className="w-full max-w-2xl border-collapse text-sm">
          <caption className="py-2 text-left text-sm text-stone-700">{caption}: nitrogen held in the tank</caption>
          <thead>
            <tr className="border-b border-stone-300 text-left">
              <th scope="col" className="py-1 pr-2 font-normal text-stone-600">
                Pool
              </th>
              <th scope="col" className="num px-1 py-1 text-right font-normal text-stone-600 sm:px-2">
                Start ({startUnit})
              </th>
              <th scope="col" className="num px-1 py-1 text-right font-normal text-stone-600 sm:px-2">
                End ({endUnit})
              </th>
              <th scope="col" className="num px-1 py-1 text-right font-normal text-stone-600 sm:px-2">
                Change ({changeUnit})
              </th>
            </tr>
          </thead>
          <tbody>
            {stocks.map((row) => (
              <tr key={row.key} className={`border-b border-stone-100 ${row.total ? "font-semibold" : ""}`}>
                <th scope="row" className={`py-1 pr-2 text-left font-normal ${row.level ? "pl-4 text-stone-700" : ""}`}>
                  {row.label}
                </th>
                <td className="num whitespace-nowrap px-1 py-1 text-right sm:px-2">
                  <Amount mg={row.start} unit={startUnit} />
                </td>
                <td className="num whitespace-nowrap px-1 py-1 text-right sm:px-2">
                  <Amount mg={row.end} unit={endUnit} />
                </td>
                <td className="num whitespace-nowrap px-1 py-1 text-right sm:px-2">
                  {row.end - row.start > 0 ? "+" : ""}
                  <Amount mg={row.end - row.start} unit={changeUnit} />
                </td>
              </tr>
            ))}
          </tbody>
        </table>
      </div>
      <p className="text-sm text-stone-700">
        Imbalance (in − out − change in the tank): <span className="figure">{formatMgN(b.imbalance)}</span>, that is{" "}
        <span className="figure">{formatPercent(b.imbalanceRelative)}</span> of the nitrogen present at the start plus
        what came in.{" "}
        {b.imbalanceRelative < 1e-6
          ? "Every milligram is accounted for, to the solver's tolerance."
          : "That is more than the solver's tolerance: please report this scenario."}
      </p>
    </div>
  );
}
