/**
 * The readings page's table: sortable columns in the person's units, edit links, and a delete
 * that asks first (a disclosure holds the real button, so it works without JavaScript too).
 */
import { Link, useFetcher } from "react-router";
import { ScrollTable } from "~/components/ui/scroll-table";
import type { MeasureKey, SortKey } from "~/features/readings/readings.server";
import { listHref } from "~/routes/readings/list-href";
import type { DisplayReading, ListQuery } from "~/routes/readings/readings-page.server";
import { formatNumber } from "~/utils/display-units";

export function ReadingsTable({
  tankId,
  rows,
  columns,
  query,
  sortHref,
}: {
  tankId: number;
  rows: DisplayReading[];
  columns: { key: string; label: string; unit: string }[];
  query: ListQuery;
  sortHref: (key: SortKey) => string;
}) {
  const deleter = useFetcher();
  const sortMark = (key: SortKey) => (query.sort === key ? (query.dir === "asc" ? " ↑" : " ↓") : "");
  const ariaSort = (key: SortKey) =>
    query.sort === key ? (query.dir === "asc" ? "ascending" : "descending") : undefined;
  return (
    <ScrollTable label="Readings table" className="rounded-lg border border-stone-200 bg-white">
      <table className="w-full min-w-[44rem] text-sm">
        <caption className="sr-only">
          Readings, sorted by{" "}
          {(query.sort === "takenAt"
            ? "date and time"
            : (columns.find((c) => c.key === query.sort)?.label ?? "date and time")
          ).toLowerCase()}{" "}
          ({query.dir === "asc" ? "ascending" : "descending"})
        </caption>
        <thead className="bg-stone-50 text-left">
          <tr>
            <th scope="col" className="px-3 py-2" aria-sort={ariaSort("takenAt")}>
              <Link to={sortHref("takenAt")} className="link">
                Date and time{sortMark("takenAt")}
              </Link>
            </th>
            {columns.map((c) => (
              <th key={c.key} scope="col" className="px-3 py-2 text-right" aria-sort={ariaSort(c.key as SortKey)}>
                <Link to={sortHref(c.key as SortKey)} className="link">
                  {c.label.split(" (")[0]}
                  {sortMark(c.key as SortKey)}
                </Link>
                {c.unit ? <span className="block text-xs font-normal text-stone-600">{c.unit}</span> : null}
              </th>
            ))}
            <th scope="col" className="px-3 py-2">
              Note
            </th>
            <th scope="col" className="px-3 py-2">
              <span className="sr-only">Actions</span>
            </th>
          </tr>
        </thead>
        <tbody>
          {rows.map((r) => (
            <tr key={r.id} className="border-t border-stone-100 align-top">
              <th scope="row" className="whitespace-nowrap px-3 py-1.5 text-left font-normal">
                {r.takenAt}
              </th>
              {columns.map((c) => (
                <td key={c.key} className="num px-3 py-1.5 text-right">
                  {formatNumber(r.values[c.key as MeasureKey])}
                </td>
              ))}
              <td className="px-3 py-1.5 text-stone-700">{r.note}</td>
              <td className="whitespace-nowrap px-3 py-1.5">
                <Link
                  to={listHref(tankId, { ...query, edit: r.id })}
                  className="link mr-3"
                  aria-label={`Edit the reading of ${r.takenAt}`}
                >
                  Edit
                </Link>
                {/* Asks first: a disclosure holds the real button, so it works without JavaScript too. */}
                <details className="inline-block align-top">
                  <summary
                    className="cursor-pointer text-red-800 underline"
                    aria-label={`Delete the reading of ${r.takenAt}…`}
                  >
                    Delete…
                  </summary>
                  <deleter.Form method="post" className="mt-1 space-y-1 rounded border border-red-200 bg-red-50 p-2">
                    <input type="hidden" name="intent" value="delete" />
                    <input type="hidden" name="id" value={r.id} />
                    <p className="text-xs text-stone-800">Delete this reading? It cannot be undone.</p>
                    <button type="submit" className="btn-secondary text-red-800">
                      Yes, delete the reading of {r.takenAt}
                    </button>
                  </deleter.Form>
                </details>
              </td>
            </tr>
          ))}
        </tbody>
      </table>
    </ScrollTable>
  );
}
