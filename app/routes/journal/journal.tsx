import { Form, Link, useNavigation } from "react-router";
import type { Route } from "./+types/journal";
import { Breadcrumbs } from "~/components/breadcrumbs";
import { FormMessage, SelectField } from "~/components/ui/field";
import { RunWarnings } from "~/components/run-warnings";
import { JournalForecast } from "~/components/journal-forecast";
import { EntryForm } from "~/components/journal-entry-form";
import { JournalReplayChart } from "~/components/journal-replay-chart";
import { OverdueBadge } from "~/features/tanks/upcoming-list";
import { requireOwnedTank } from "~/features/tanks/tanks.server";
import { requireUser } from "~/permissions.server";
import { keeperNow } from "~/features/accounts/time-zone.server";
import { journalAction, journalPageData, type JournalAnswer } from "~/routes/journal/journal-page.server";
import { BudgetTable } from "~/components/charts/budget";
import { displayUnitsFor } from "~/utils/display-units";
import { ScrollTable } from "~/components/ui/scroll-table";

export const meta: Route.MetaFunction = ({ data }) => [{ title: `Journal · ${data?.tank.name ?? "Tank"} · Fernwater` }];

export async function loader({ request, params }: Route.LoaderArgs) {
  const user = await requireUser(request);
  const tank = requireOwnedTank(user.id, params.tankId);
  const query = new URL(request.url).searchParams;
  return journalPageData(
    tank,
    query.get("scenario"),
    displayUnitsFor(user),
    keeperNow(request, user),
    query.get("page"),
  );
}

export async function action({ request, params }: Route.ActionArgs) {
  const user = await requireUser(request);
  const tank = requireOwnedTank(user.id, params.tankId);
  return journalAction(request, tank, displayUnitsFor(user), keeperNow(request, user));
}

export default function JournalPage({ loaderData, actionData }: Route.ComponentProps) {
  const { tank, scenarios, scenarioId, entries, replay, forecast, cautionsAhead, problem, upcoming, calendarOn } =
    loaderData;
  const { entryCount, entryPage, entryPages } = loaderData;
  const pageHref = (page: number) => {
    const q = new URLSearchParams();
    if (scenarioId) q.set("scenario", String(scenarioId));
    if (page > 1) q.set("page", String(page));
    const s = q.toString();
    return `/tanks/${tank.id}/journal${s ? `?${s}` : ""}`;
  };
  const answer = actionData as JournalAnswer | undefined;
  // The action's answer arrives before the page is read again (the replay takes a moment): say
  // "added" only once the entry, the curve and the warnings show it.
  const navigation = useNavigation();
  const said = navigation.state === "loading" && navigation.formMethod ? undefined : answer;
  return (
    <div className="mx-auto max-w-4xl space-y-8">
      <Breadcrumbs
        trail={[
          { to: "/tanks", label: "Tanks" },
          { to: `/tanks/${tank.id}`, label: tank.name },
        ]}
        current="Journal"
      />
      <h1 className="text-2xl font-semibold">Journal of {tank.name}</h1>
      <p className="text-stone-700">
        What you actually did and when. The model replays it “as it happened” from the first entry to today.
      </p>
      {said?.message ? (
        <FormMessage tone={said.errors || said.problems ? "error" : "success"}>{said.message}</FormMessage>
      ) : null}
      {said?.stored ? <FormMessage tone="success">{said.stored} entries added from the file.</FormMessage> : null}
      {said?.problems?.length ? (
        <ul className="list-disc pl-5 text-sm" aria-label="Rows that need attention">
          {said.problems.map((p, i) => (
            <li key={i}>
              Line {p.line}: {p.message}
            </li>
          ))}
          {said.more ? <li>…and {said.more} more.</li> : null}
        </ul>
      ) : null}

      <section className="space-y-3">
        <h2 className="text-xl font-semibold">As it happened</h2>
        {scenarios.length > 1 ? (
          <Form method="get" className="flex items-end gap-2">
            <SelectField
              label="Scenario that describes this tank"
              name="scenario"
              defaultValue={String(scenarioId)}
              options={scenarios.map((s) => ({ value: String(s.id), label: s.name }))}
            />
            <button className="btn" type="submit">
              Show
            </button>
          </Form>
        ) : null}
        {problem ? <FormMessage>{problem}</FormMessage> : null}
        {replay && replay.warnings.length > 0 ? (
          <div className="space-y-1" data-replay-warnings>
            <RunWarnings warnings={replay.warnings} />
          </div>
        ) : null}
        {replay ? (
          <JournalReplayChart replay={replay} tankName={tank.name} />
        ) : (
          <p className="text-stone-600">
            {scenarioId
              ? "Add an entry to see the model follow your tank."
              : "Add a scenario describing this tank first."}
          </p>
        )}
        {forecast ? <JournalForecast forecast={forecast} cautionsAhead={cautionsAhead} /> : null}
        {replay ? (
          <details>
            <summary className="cursor-pointer text-sm">Nitrogen budget, as it happened</summary>
            <BudgetTable
              budgets={[{ label: "As it happened", budget: replay.budget, plantNames: replay.plantNames }]}
              caption="Nitrogen budget of the journal's replay"
            />
          </details>
        ) : null}
        {replay?.unused.map((u) => (
          <p key={u} className="text-sm text-amber-800">
            {u}
          </p>
        ))}
      </section>

      <section className="space-y-3">
        <h2 className="text-xl font-semibold">Upcoming</h2>
        {upcoming.length ? (
          <ul className="list-disc pl-5" aria-label="Planned tasks in the next three weeks">
            {upcoming.map((u, i) => (
              <li key={i}>
                {u.overdue ? <OverdueBadge /> : null}
                {u.when}: {u.title}
              </li>
            ))}
          </ul>
        ) : (
          <p className="text-stone-600">Nothing planned in the next three weeks.</p>
        )}
        {answer?.calendarUrl ? (
          <p className="text-sm">
            Your calendar address (shown once; keep it private): <code className="break-all">{answer.calendarUrl}</code>
          </p>
        ) : null}
        <Form method="post" className="flex gap-2">
          <input type="hidden" name="scenarioId" value={String(scenarioId ?? "")} />
          <button className="btn" name="intent" value="calendar-on" type="submit" disabled={!scenarioId}>
            {calendarOn ? "Make a new calendar address" : "Subscribe in a calendar"}
          </button>
          {calendarOn ? (
            <button className="btn-secondary" name="intent" value="calendar-off" type="submit">
              Turn the calendar address off
            </button>
          ) : null}
        </Form>
      </section>

      <section className="space-y-3">
        <h2 className="text-xl font-semibold">Add an entry</h2>
        <EntryForm answer={answer} units={loaderData.units} today={loaderData.today} />
      </section>

      <section className="space-y-3">
        <h2 className="text-xl font-semibold">Entries</h2>
        {entries.length === 0 ? (
          <p className="text-stone-600">No entries yet.</p>
        ) : (
          <ScrollTable label="Journal entries table">
            <table className="w-full text-sm">
              <thead>
                <tr className="text-left">
                  <th>Date</th>
                  <th>What</th>
                  <th>Details</th>
                  <th>Note</th>
                  <th />
                </tr>
              </thead>
              <tbody>
                {entries.map((e) => (
                  <tr key={e.id} className="border-t border-stone-200">
                    <td className="figure">{e.when}</td>
                    <td>{e.kind}</td>
                    <td>{e.what}</td>
                    <td>{e.note}</td>
                    <td>
                      <Form method="post">
                        <input type="hidden" name="intent" value="delete" />
                        <input type="hidden" name="entryId" value={e.id} />
                        <button
                          type="submit"
                          className="text-red-800 underline"
                          aria-label={`Delete the entry of ${e.when}`}
                        >
                          Delete
                        </button>
                      </Form>
                    </td>
                  </tr>
                ))}
              </tbody>
            </table>
          </ScrollTable>
        )}
        {entryPages > 1 ? (
          <nav aria-label="Journal pages" className="flex flex-wrap items-center gap-4 text-sm">
            <span>
              Page {entryPage} of {entryPages} ({entryCount.toLocaleString("en")} entries, newest first)
            </span>
            {entryPage > 1 ? (
              <Link className="link" to={pageHref(entryPage - 1)}>
                Newer entries
              </Link>
            ) : null}
            {entryPage < entryPages ? (
              <Link className="link" to={pageHref(entryPage + 1)}>
                Older entries
              </Link>
            ) : null}
          </nav>
        ) : null}
      </section>

      <section className="space-y-3">
        <h2 className="text-xl font-semibold">CSV</h2>
        <p className="text-sm text-stone-700">
          <Link to={`/tanks/${tank.id}/journal/export`} reloadDocument className="underline">
            Download the journal as CSV
          </Link>{" "}
          — the same columns upload again. A file is stored whole or not at all; every row that needs attention is named
          by its line. Whatever units you read in, the file keeps tap nitrate as nitrate (NO3) and ammonia as nitrogen
          (N), as its column names say.
        </p>
        <Form method="post" encType="multipart/form-data" className="flex flex-wrap items-end gap-2">
          <input
            type="file"
            name="file"
            accept=".csv,text/csv"
            aria-label="Journal CSV file"
            required
            className="max-w-full"
          />
          <button type="submit" className="btn">
            Upload
          </button>
        </Form>
      </section>
    </div>
  );
}
