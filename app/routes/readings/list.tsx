import { and, eq } from "drizzle-orm";
import { Form, Link, redirect, useNavigation } from "react-router";
import { z } from "zod";
import type { Route } from "./+types/list";
import { FooterCaution } from "~/components/cautions";
import { FormMessage, TextField } from "~/components/ui/field";
import { getDb } from "~/db/client.server";
import { readings } from "~/db/schema";
import { keeperNow } from "~/features/accounts/time-zone.server";
import { requireUser } from "~/permissions.server";
import { checkNewReadings } from "~/quotas.server";
import {
  findReading,
  listReadings,
  MEASURE_KEYS,
  MEASURES,
  measureUnitLabel,
  measureUnitsFor,
  type MeasureKey,
  type SortKey,
} from "~/features/readings/readings.server";
import { listScenarios, requireOwnedTank } from "~/features/tanks/tanks.server";
import { displayUnitsFor } from "~/utils/display-units";
import { formValues } from "~/utils/form-errors";
import { invalid, readForm, refusedForm } from "~/http/pages.server";
import { listHref } from "~/routes/readings/list-href";
import {
  clashMessage,
  displayRow,
  parseReadingForm,
  readListQuery,
  takenAtClash,
} from "~/routes/readings/readings-page.server";
import { ReadingsTable } from "~/routes/readings/readings-table";
import { Breadcrumbs } from "~/components/breadcrumbs";

export const meta: Route.MetaFunction = ({ data }) => [
  { title: `Readings · ${data?.tank.name ?? "Tank"} · Fernwater` },
];

export async function loader({ request, params }: Route.LoaderArgs) {
  const user = await requireUser(request);
  const tank = requireOwnedTank(user.id, params.tankId);
  const url = new URL(request.url);
  const query = readListQuery(url);
  const units = displayUnitsFor(user);
  const measureUnits = measureUnitsFor(units);
  const list = listReadings(tank.id, query.sort, query.dir, query.page);
  const editing = query.edit ? findReading(tank.id, query.edit) : null;
  return {
    tank: { id: tank.id, name: tank.name },
    query: { ...query, page: list.page },
    saved: url.searchParams.get("saved"),
    total: list.total,
    pages: list.pages,
    rows: list.rows.map((r) => displayRow(r, units)),
    editing: editing ? displayRow(editing, units) : null,
    columns: MEASURE_KEYS.map((k) => ({ key: k, label: MEASURES[k].label, unit: measureUnitLabel(k, measureUnits) })),
    scenarios: listScenarios(tank.id).map((s) => ({ id: s.id, name: s.name })),
  };
}

const IntentSchema = z.object({
  intent: z.enum(["add", "update", "delete"]),
  id: z.coerce.number().int().positive().optional(),
});

export async function action({ request, params }: Route.ActionArgs) {
  const user = await requireUser(request);
  const tank = requireOwnedTank(user.id, params.tankId);
  const values = formValues(await readForm(request));
  const back = readListQuery(new URL(request.url));
  const intent = IntentSchema.safeParse(values);
  if (!intent.success) return invalid({ "": "Unknown action." }, values);
  const { id } = intent.data;
  const existing = id ? findReading(tank.id, id) : null;
  if (intent.data.intent !== "add" && !existing)
    return invalid({ "": "That reading is not in this tank (any more)." }, values);
  const db = getDb();
  if (intent.data.intent === "delete") {
    db.delete(readings)
      .where(and(eq(readings.id, existing!.id), eq(readings.tankId, tank.id)))
      .run();
    return redirect(listHref(tank.id, { ...back, edit: undefined, saved: "deleted" }));
  }
  const parsed = parseReadingForm(values, measureUnitsFor(displayUnitsFor(user)), keeperNow(request, user));
  if (!parsed.ok) return invalid(parsed.errors, values);
  const { reading } = parsed;
  if (takenAtClash(tank.id, reading.takenAt, existing?.id))
    return invalid({ takenAt: clashMessage(reading.takenAt) }, values);
  const row = { ...reading, takenAt: new Date(reading.takenAt) };
  if (existing) db.update(readings).set(row).where(eq(readings.id, existing.id)).run();
  else {
    try {
      db.transaction((tx) => {
        checkNewReadings(tx, user.id, 1);
        tx.insert(readings)
          .values({ ...row, tankId: tank.id })
          .run();
      });
    } catch (error) {
      return refusedForm(error, values);
    }
  }
  return redirect(listHref(tank.id, { ...back, edit: undefined, saved: existing ? "updated" : "added" }));
}

const SAVED: Record<string, string> = {
  added: "Reading added.",
  updated: "Reading updated.",
  deleted: "Reading deleted.",
};

export default function ReadingsPage({ loaderData, actionData }: Route.ComponentProps) {
  const { tank, query, rows, columns, editing, total, pages, scenarios, saved } = loaderData;
  const errors = actionData?.errors ?? {};
  const values = actionData?.values ?? {};
  const busy = useNavigation().state === "submitting";
  const formDefaults = (k: string, fromRow: string) => values[k] ?? fromRow;
  const sortHref = (key: SortKey) =>
    listHref(tank.id, { sort: key, dir: query.sort === key && query.dir === "desc" ? "asc" : "desc", page: 1 });
  return (
    <div className="space-y-6">
      <Breadcrumbs
        trail={[
          { to: "/tanks", label: "Tanks" },
          { to: `/tanks/${tank.id}`, label: tank.name },
        ]}
        current="Readings"
      />
      <div className="flex flex-wrap items-center justify-between gap-3">
        <h1 className="text-2xl">Readings of {tank.name}</h1>
        <div className="flex flex-wrap gap-2">
          <Link to={`/tanks/${tank.id}/readings/upload`} className="btn">
            Upload a CSV file
          </Link>
          <a href={`/tanks/${tank.id}/readings/template`} className="btn-secondary" download>
            Download the template
          </a>
          {total > 0 ? (
            <a href={`/tanks/${tank.id}/readings/export`} className="btn-secondary" download>
              Export as CSV
            </a>
          ) : null}
        </div>
      </div>
      {saved && SAVED[saved] ? <FormMessage tone="success">{SAVED[saved]}</FormMessage> : null}
      {errors[""] ? <FormMessage>{errors[""]}</FormMessage> : null}
      {scenarios.length ? (
        <section aria-labelledby="with-scenarios" className="text-sm">
          <h2 id="with-scenarios" className="sr-only">
            Readings and scenarios
          </h2>
          <p className="text-stone-700">
            Readings are drawn over each scenario’s chart from its start date. Fit a scenario to them:
          </p>
          <ul className="mt-1 flex flex-wrap gap-x-4 gap-y-1">
            {scenarios.map((s) => (
              <li key={s.id}>
                {s.name}:{" "}
                <Link className="link" to={`/tanks/${tank.id}/scenarios/${s.id}`}>
                  chart
                </Link>{" "}
                ·{" "}
                <Link className="link" to={`/tanks/${tank.id}/scenarios/${s.id}/calibrate`}>
                  calibrate
                </Link>
              </li>
            ))}
          </ul>
        </section>
      ) : null}

      <Form method="post" className="card space-y-4" key={editing?.id ?? "new"}>
        <h2 className="text-lg">{editing ? `Edit the reading of ${editing.takenAt}` : "Add a reading"}</h2>
        <input type="hidden" name="intent" value={editing ? "update" : "add"} />
        {editing ? <input type="hidden" name="id" value={editing.id} /> : null}
        <div className="grid gap-4 sm:grid-cols-2 lg:grid-cols-4">
          <TextField
            label="Date and time"
            name="takenAt"
            type="datetime-local"
            required
            defaultValue={formDefaults("takenAt", editing?.takenAtInput ?? "")}
            error={errors.takenAt}
          />
          {columns.map((c) => (
            <TextField
              key={c.key}
              label={c.label}
              name={c.key}
              inputMode="decimal"
              suffix={c.unit || undefined}
              defaultValue={formDefaults(
                c.key,
                editing?.values[c.key as MeasureKey] == null ? "" : String(editing.values[c.key as MeasureKey]),
              )}
              error={errors[c.key]}
              className="figure"
            />
          ))}
        </div>
        <TextField
          label="Note"
          name="note"
          maxLength={500}
          defaultValue={formDefaults("note", editing?.note ?? "")}
          error={errors.note}
          hint="Optional."
        />
        <div className="flex flex-wrap items-center gap-3">
          <button type="submit" className="btn" disabled={busy}>
            {editing ? "Save changes" : "Add reading"}
          </button>
          {editing ? (
            <Link to={listHref(tank.id, { ...query, edit: undefined })} className="link text-sm">
              Cancel
            </Link>
          ) : null}
          <p className="text-xs text-stone-600">Leave blank what you did not test. Times are kept as you type them.</p>
        </div>
      </Form>

      <section aria-labelledby="table-title" className="space-y-3">
        <h2 id="table-title" className="text-lg">
          {total === 0 ? "No readings yet" : `${total.toLocaleString("en")} reading${total === 1 ? "" : "s"}`}
        </h2>
        {total > 0 ? (
          <ReadingsTable tankId={tank.id} rows={rows} columns={columns} query={query} sortHref={sortHref} />
        ) : null}
        {pages > 1 ? (
          <nav aria-label="Pages of readings" className="flex items-center gap-3 text-sm">
            {query.page > 1 ? (
              <Link className="link" to={listHref(tank.id, { ...query, edit: undefined, page: query.page - 1 })}>
                ← Newer page
              </Link>
            ) : null}
            <span>
              Page {query.page} of {pages}
            </span>
            {query.page < pages ? (
              <Link className="link" to={listHref(tank.id, { ...query, edit: undefined, page: query.page + 1 })}>
                Next page →
              </Link>
            ) : null}
          </nav>
        ) : null}
      </section>
      <aside className="rounded-lg border border-amber-300 bg-amber-50 p-4 text-sm text-stone-800">
        <p className="font-semibold">
          If a test shows ammonia or nitrite, act at once: a water change first, then find the cause.
        </p>
        <FooterCaution />
      </aside>
    </div>
  );
}
