import { asc, eq } from "drizzle-orm";
import { Form, Link, redirect, useNavigation } from "react-router";
import { DEFAULT_NITRATE_TARGETS } from "~/features/tanks/nitrate-targets";
import type { Route } from "./+types/list";
import { FormMessage, TextField } from "~/components/ui/field";
import { getDb } from "~/db/client.server";
import { tanks } from "~/db/schema";
import { displayKeyFigures, toxicPeaksAboveCaution } from "~/features/runs/display-figures";
import { AboveCaution } from "~/components/above-caution";
import { JournalFlagNote } from "~/components/journal-flag";
import { keeperNow } from "~/features/accounts/time-zone.server";
import { journalFlags, REPLAYS_PER_VIEW } from "~/features/journal/journal-findings.server";
import { requireUser } from "~/permissions.server";
import { checkNewTank } from "~/quotas.server";
import { displayUnitsFor, formatNumber, unitLabels } from "~/utils/display-units";
import { fieldErrors, formValues } from "~/utils/form-errors";
import { invalid, readForm, refusedForm } from "~/http/pages.server";
import { z } from "zod";
import { latestFiguresByTank, TankNameSchema, TankNotesSchema } from "~/routes/tanks/tanks-page.server";

export const meta: Route.MetaFunction = () => [{ title: "Your tanks · Fernwater" }];

export async function loader({ request }: Route.LoaderArgs) {
  const user = await requireUser(request);
  const units = displayUnitsFor(user);
  const list = getDb()
    .select()
    .from(tanks)
    .where(eq(tanks.ownerId, user.id))
    .orderBy(asc(tanks.name), asc(tanks.id))
    .all();
  const figures = latestFiguresByTank(list.map((t) => t.id));
  // What each journal's replay found: the keeper's real tank, not a scenario's timetable.
  const journals = await journalFlags(list, keeperNow(request, user));
  return {
    labels: unitLabels(units),
    replaysPerView: REPLAYS_PER_VIEW,
    tanks: list.map((t) => {
      const latest = figures.get(t.id);
      return {
        id: t.id,
        name: t.name,
        notes: t.notes,
        journal: journals.get(t.id) ?? null,
        latest: latest
          ? {
              scenarioName: latest.scenarioName,
              figures: displayKeyFigures(latest.keyFigures, units),
              above: toxicPeaksAboveCaution(latest.keyFigures),
            }
          : null,
      };
    }),
  };
}

const CreateTankSchema = z.object({ name: TankNameSchema, notes: TankNotesSchema });

export async function action({ request }: Route.ActionArgs) {
  const user = await requireUser(request);
  const values = formValues(await readForm(request));
  const parsed = CreateTankSchema.safeParse(values);
  if (!parsed.success) return invalid(fieldErrors(parsed.error), values);
  try {
    const tank = getDb().transaction((tx) => {
      checkNewTank(tx, user.id);
      return tx
        .insert(tanks)
        .values({ ownerId: user.id, name: parsed.data.name, notes: parsed.data.notes, ...DEFAULT_NITRATE_TARGETS })
        .returning({ id: tanks.id })
        .get();
    });
    return redirect(`/tanks/${tank.id}`);
  } catch (error) {
    return refusedForm(error, values, "name");
  }
}

export default function TanksPage({ loaderData, actionData }: Route.ComponentProps) {
  const { labels } = loaderData;
  const busy = useNavigation().state === "submitting";
  return (
    <div className="space-y-6">
      <h1 className="text-2xl">Your tanks</h1>
      {loaderData.tanks.length === 0 ? (
        <p>You have no tanks yet. Add one below, then describe it in a scenario.</p>
      ) : (
        <ul className="grid gap-4 sm:grid-cols-2">
          {loaderData.tanks.map((t) => (
            <li key={t.id} className="card space-y-2">
              <h2 className="text-lg">
                <Link to={`/tanks/${t.id}`} className="link">
                  {t.name}
                </Link>
              </h2>
              {t.notes ? <p className="text-sm text-stone-600">{t.notes}</p> : null}
              <JournalFlagNote tankId={t.id} flag={t.journal} perView={loaderData.replaysPerView} />
              {t.latest ? (
                <>
                  <dl className="grid grid-cols-2 gap-2 text-sm sm:grid-cols-4">
                    <div>
                      <dt className="text-xs text-stone-600">Nitrate at the end</dt>
                      <dd className="figure">
                        {formatNumber(t.latest.figures.nitrateEnd)} <span className="text-xs">{labels.nitrate}</span>
                      </dd>
                    </div>
                    <div className={t.latest.above.peakFreeNh3 ? "rounded bg-red-50 text-red-900" : undefined}>
                      <dt className="text-xs text-stone-600">Peak free ammonia</dt>
                      <dd className="figure">
                        {formatNumber(t.latest.figures.peakFreeNh3.value)}{" "}
                        <span className="text-xs">{labels.ammonia}</span>
                        <AboveCaution above={t.latest.above.peakFreeNh3} />
                      </dd>
                    </div>
                    <div className={t.latest.above.peakNitrite ? "rounded bg-red-50 text-red-900" : undefined}>
                      <dt className="text-xs text-stone-600">Peak nitrite</dt>
                      <dd className="figure">
                        {formatNumber(t.latest.figures.peakNitrite.value)}{" "}
                        <span className="text-xs">{labels.nitrite}</span>
                        <AboveCaution above={t.latest.above.peakNitrite} />
                      </dd>
                    </div>
                    <div>
                      <dt className="text-xs text-stone-600">Days above target</dt>
                      <dd className="figure">{formatNumber(t.latest.figures.daysAboveNitrateTarget)}</dd>
                    </div>
                  </dl>
                  <p className="mt-2 text-xs text-stone-500">Latest run: {t.latest.scenarioName}</p>
                </>
              ) : (
                <p className="text-sm text-stone-500">No runs yet.</p>
              )}
            </li>
          ))}
        </ul>
      )}
      <section className="card max-w-xl space-y-3" aria-labelledby="new-tank-title">
        <h2 id="new-tank-title" className="text-lg">
          Add a tank
        </h2>
        {actionData?.errors[""] ? <FormMessage>{actionData.errors[""]}</FormMessage> : null}
        <Form method="post" className="space-y-3" noValidate>
          <TextField
            label="Name"
            name="name"
            defaultValue={actionData?.values.name}
            error={actionData?.errors.name}
            required
          />
          <TextField
            label="Notes"
            name="notes"
            hint="Anything that helps you recognise it; optional."
            defaultValue={actionData?.values.notes}
            error={actionData?.errors.notes}
          />
          <button type="submit" className="btn" disabled={busy}>
            Add tank
          </button>
        </Form>
      </section>
    </div>
  );
}
