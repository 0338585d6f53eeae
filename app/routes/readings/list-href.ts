/** Links of the readings page (client-safe: the page's component builds them). */
import type { ListQuery } from "~/routes/readings/readings-page.server";

/** The page's URL with some query values changed. */
export function listHref(tankId: number, q: Partial<ListQuery> & { saved?: string }): string {
  const p = new URLSearchParams();
  if (q.sort && q.sort !== "takenAt") p.set("sort", q.sort);
  if (q.dir && q.dir !== "desc") p.set("dir", q.dir);
  if (q.page && q.page > 1) p.set("page", String(q.page));
  if (q.edit) p.set("edit", String(q.edit));
  if (q.saved) p.set("saved", q.saved);
  const s = p.toString();
  return `/tanks/${tankId}/readings${s ? `?${s}` : ""}`;
}
