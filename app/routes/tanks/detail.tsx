import { asc, eq } from "drizzle-orm";
import { Form, Link, useNavigation } from "react-router";
import type { Route } from "./+types/detail";
import { FormMessage, TextField } from "~/components/ui/field";
import { getDb } from "~/db/client.server";
import { scenarios } from "~/db/schema";
import { displayKeyFigures, toxicPeaksAboveCaution } from "~/features/runs/display-figures";
import { AboveCaution } from "~/components/above-caution";
import { JournalFlagNote } from "~/components/journal-flag";
import { journalFlags } from "~/features/journal/journal-findings.server";
import { speciesFactor } from "~models/units";
import { nitrateBandHint, typedTarget } from "~/features/tanks/nitrate-targets";
import { handedInCopyIn } from "~/features/classes/classes.server";
import { requireUser } from "~/permissions.server";
import { latestKeyFigures } from "~/features/runs/simulation.server";
import { requireOwnedTank } from "~/features/tanks/tanks.server";
import { displayUnitsFor, formatNumber, unitLabels } from "~/utils/display-units";
import { formValues } from "~/utils/form-errors";
import { readForm } from "~/http/pages.server";
import { Breadcrumbs } from "~/components/breadcrumbs";
import { ScrollTable } from "~/components/ui/scroll-table";
import { UpcomingList } from "~/features/tanks/upcoming-list";
import { dayWriter, keeperNow } from "~/features/accounts/time-zone.server";
import { upcomingView } from "~/routes/tanks/upcoming-view.server";
import { tankPageAction } from "~/routes/tanks/tank-actions.server";
import { bandKeptMessage } from "~/features/tanks/tank-settings.server";

export const meta: Route.MetaFunction = ({ data }) => [{ title: `${data?.tank.name ?? "Tank"} · Fernwater` }];

export async function loader({ request, params }: Route.LoaderArgs) {
  const user = await requireUser(request);
  const tank = requireOwnedTank(user.id, params.tankId);
  const units = displayUnitsFor(user);
  const no3 = speciesFactor("nitrate", units);
  // Names and dates only (no settings), and every scenario's key figures in one query.
  const list = getDb()
    .select({ id: scenarios.id, name: scenarios.name, updatedAt: scenarios.updatedAt })
    .from(scenarios)
    .where(eq(scenarios.tankId, tank.id))
    .orderBy(asc(scenarios.createdAt), asc(scenarios.id))
    .all();
  const latest = latestKeyFigures(list.map((s) => s.id));
  const handedIn = handedInCopyIn({ tankId: tank.id });
  // The journal's replay (the real tank) may show danger the scenarios' figures below do not.
  // Days as the keeper's wall clock counts them (their time zone), not the server's.
  const today = keeperNow(request, user);
  const dayOf = dayWriter(request, user);
  const journal = (await journalFlags([tank], today, 1)).get(tank.id) ?? null;
  return {
    tank: {
      id: tank.id,
      name: tank.name,
      notes: tank.notes,
      nitrateLow: String(typedTarget(tank.nitrateTargetLow, no3)),
      nitrateHigh: String(typedTarget(tank.nitrateTargetHigh, no3)),
    },
    labels: unitLabels(units),
    journal,
    nitrateHint: handedIn ? bandKeptMessage(handedIn.lessonTitle) : nitrateBandHint(no3, unitLabels(units).nitrate),
    /** The band is kept for a handed-in lesson copy: shown, not editable. */
    bandKept: !!handedIn,
    upcoming: upcomingView(tank.id, today),
    done: new URL(request.url).searchParams.has("done"),
    scenarios: list.map((s) => {
      const figures = latest.get(s.id);
      return {
        id: s.id,
        name: s.name,
        updatedAt: dayOf(s.updatedAt),
        figures: figures ? displayKeyFigures(figures, units) : null,
        // Flagged here as on the tank list and the compare page, where the scenario to open is chosen.
        above: figures ? toxicPeaksAboveCaution(figures) : null,
      };
    }),
  };
}

export async function action({ request, params }: Route.ActionArgs) {
  const user = await requireUser(request);
  const tank = requireOwnedTank(user.id, params.tankId);
  return tankPageAction(user, tank, formValues(await readForm(request)));
}

export default function TankPage({ loaderData, actionData }: Route.ComponentProps) {
  const { tank, labels } = loaderData;
  const errors = actionData?.errors ?? {};
  const values = actionData?.values ?? {};
  const busy = useNavigation().state === "submitting";
  return (
    <div className="space-y-6">
      <Breadcrumbs trail={[{ to: "/tanks", label: "Tanks" }]} current={tank.name} />
      <div className="flex flex-wrap items-center justify-between gap-3">
        <h1 className="text-2xl">{tank.name}</h1>
        <div className="flex flex-wrap gap-2">
          <Link to={`/tanks/${tank.id}/scenarios/new`} className="btn">
            New scenario
          </Link>
          <Link to={`/tanks/${tank.id}/readings`} className="btn-secondary">
            Readings
          </Link>
          <Link to={`/tanks/${tank.id}/journal`} className="btn-secondary">
            Journal
          </Link>
          <Link to={`/tanks/${tank.id}/import`} className="btn-secondary">
            Import a scenario file
          </Link>
        </div>
      </div>
      <JournalFlagNote tankId={tank.id} flag={loaderData.journal} />
      {tank.notes ? <p className="text-stone-700">{tank.notes}</p> : null}
      {errors[""] ? <FormMessage>{errors[""]}</FormMessage> : null}
      {loaderData.done ? <FormMessage tone="success">Added to the journal.</FormMessage> : null}
      <section aria-labelledby="upcoming-title" className="space-y-3">
        <div className="flex flex-wrap items-baseline justify-between gap-2">
          <h2 id="upcoming-title" className="text-lg">
            Upcoming
          </h2>
          <Link to={`/tanks/${tank.id}/plan`}>Edit the maintenance plan</Link>
        </div>
        <UpcomingList tankId={tank.id} tasks={loaderData.upcoming} back="tank" />
      </section>

      <section aria-labelledby="scenarios-title" className="space-y-3">
        <h2 id="scenarios-title" className="text-lg">
          Scenarios
        </h2>
        {loaderData.scenarios.length === 0 ? (
          <p>No scenarios yet. Start one from a preset or from Fernwater’s defaults.</p>
        ) : (
          <Form method="get" action={`/tanks/${tank.id}/compare`} className="space-y-3">
            <ScrollTable label="Scenarios table">
              <table className="w-full min-w-[40rem] border-collapse text-sm">
                <caption className="sr-only">Scenarios of this tank with the key figures of their latest run</caption>
                <thead>
                  <tr className="border-b border-stone-300 text-left">
                    <th scope="col" className="py-2 pr-2">
                      Compare
                    </th>
                    <th scope="col" className="py-2 pr-2">
                      Scenario
                    </th>
                    <th scope="col" className="num py-2 pr-2">
                      Nitrate at the end ({labels.nitrate})
                    </th>
                    <th scope="col" className="num py-2 pr-2">
                      Peak free ammonia ({labels.ammonia})
                    </th>
                    <th scope="col" className="num py-2 pr-2">
                      Peak nitrite ({labels.nitrite})
                    </th>
                    <th scope="col" className="num py-2">
                      Days above target
                    </th>
                  </tr>
                </thead>
                <tbody>
                  {loaderData.scenarios.map((s) => (
                    <tr key={s.id} className="border-b border-stone-200">
                      <td className="py-2 pr-2">
                        <input
                          type="checkbox"
                          name="s"
                          value={s.id}
                          aria-label={`Compare ${s.name}`}
                          className="h-5 w-5 accent-fern-700"
                        />
                      </td>
                      <td className="py-2 pr-2">
                        <Link to={`/tanks/${tank.id}/scenarios/${s.id}`} className="link">
                          {s.name}
                        </Link>
                        <span className="block text-xs text-stone-500">saved {s.updatedAt}</span>
                      </td>
                      <td className="num py-2 pr-2">{s.figures ? formatNumber(s.figures.nitrateEnd) : "–"}</td>
                      <td className={`num py-2 pr-2 ${s.above?.peakFreeNh3 ? "bg-red-50 text-red-900" : ""}`}>
                        {s.figures ? formatNumber(s.figures.peakFreeNh3.value) : "–"}
                        <AboveCaution above={s.above?.peakFreeNh3} />
                      </td>
                      <td className={`num py-2 pr-2 ${s.above?.peakNitrite ? "bg-red-50 text-red-900" : ""}`}>
                        {s.figures ? formatNumber(s.figures.peakNitrite.value) : "–"}
                        <AboveCaution above={s.above?.peakNitrite} />
                      </td>
                      <td className="num py-2">{s.figures ? formatNumber(s.figures.daysAboveNitrateTarget) : "–"}</td>
                    </tr>
                  ))}
                </tbody>
              </table>
            </ScrollTable>
            {loaderData.scenarios.length >= 2 ? (
              <button type="submit" className="btn-secondary">
                Compare the ticked scenarios (2–4)
              </button>
            ) : null}
          </Form>
        )}
      </section>

      <section className="card max-w-2xl space-y-3" aria-labelledby="settings-title">
        <h2 id="settings-title" className="text-lg">
          Tank settings
        </h2>
        <Form method="post" className="grid gap-4 sm:grid-cols-2" noValidate>
          <input type="hidden" name="intent" value="settings" />
          <div className="sm:col-span-2">
            <TextField
              label="Name"
              name="name"
              defaultValue={values.intent === "settings" ? values.name : tank.name}
              error={errors.name}
            />
          </div>
          <div className="sm:col-span-2">
            <TextField
              label="Notes"
              name="notes"
              defaultValue={values.intent === "settings" ? values.notes : tank.notes}
              error={errors.notes}
            />
          </div>
          <TextField
            label="Nitrate target, low"
            name="nitrateLow"
            inputMode="decimal"
            suffix={labels.nitrate}
            hint={loaderData.nitrateHint}
            readOnly={loaderData.bandKept}
            defaultValue={values.intent === "settings" ? values.nitrateLow : tank.nitrateLow}
            error={errors.nitrateLow}
          />
          <TextField
            label="Nitrate target, high"
            name="nitrateHigh"
            inputMode="decimal"
            suffix={labels.nitrate}
            readOnly={loaderData.bandKept}
            defaultValue={values.intent === "settings" ? values.nitrateHigh : tank.nitrateHigh}
            error={errors.nitrateHigh}
          />
          <div className="sm:col-span-2">
            <button type="submit" className="btn" disabled={busy}>
              Save tank settings
            </button>
          </div>
        </Form>
      </section>

      <section className="card max-w-2xl space-y-3 border-red-200" aria-labelledby="delete-title">
        <h2 id="delete-title" className="text-lg text-red-900">
          Delete this tank
        </h2>
        <p className="text-sm">
          This deletes the tank with its {loaderData.scenarios.length} scenario
          {loaderData.scenarios.length === 1 ? "" : "s"}, their runs and share links, and all its readings. It cannot be
          undone.
        </p>
        <Form method="post" className="space-y-3">
          <input type="hidden" name="intent" value="delete-tank" />
          <label className="flex items-center gap-2 text-sm">
            <input type="checkbox" name="confirm" value="yes" className="h-5 w-5 accent-red-700" />
            Yes, delete {tank.name} and everything in it
          </label>
          {errors.confirm && values.intent === "delete-tank" ? (
            <p className="text-sm font-semibold text-red-800" role="alert">
              {errors.confirm}
            </p>
          ) : null}
          <button type="submit" className="btn-danger">
            Delete tank
          </button>
        </Form>
      </section>
    </div>
  );
}
