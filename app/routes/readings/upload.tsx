import { Form, Link, data, useNavigation } from "react-router";
import { z } from "zod";
import type { Route } from "./+types/upload";
import { FormMessage, SelectField } from "~/components/ui/field";
import { getDb } from "~/db/client.server";
import { keeperNow } from "~/features/accounts/time-zone.server";
import { requireUser } from "~/permissions.server";
import { MAX_CSV_BYTES, MAX_CSV_ROWS, type CsvProblem } from "~/features/readings/readings-csv.server";
import { parseReadingsCsvOffThread } from "~/features/jobs/chores-pool.server";
import { checkNewReadings } from "~/quotas.server";
import { insertReadings, measureUnitsFor, storedTimes, type MeasureUnits } from "~/features/readings/readings.server";
import { requireOwnedTank } from "~/features/tanks/tanks.server";
import { formRefusal } from "~/http/pages.server";
import { readUpload, UploadError } from "~/http/uploads.server";
import { takeUploadTurn, UploadRefused } from "~/http/upload-turns.server";
import { displayUnitsFor } from "~/utils/display-units";
import { Breadcrumbs } from "~/components/breadcrumbs";

export const meta: Route.MetaFunction = ({ data }) => [
  { title: `Upload readings · ${data?.tank.name ?? "Tank"} · Fernwater` },
];

/** Units for columns whose header names none: the choices of this form. */
const UNIT_CHOICES = {
  tan: [
    { value: "asNH3", label: "mg/L as NH3 (most kits)" },
    { value: "asNH4", label: "mg/L as NH4" },
    { value: "asN", label: "mg/L as N" },
  ],
  nitrite: [
    { value: "asNO2", label: "mg/L as NO2" },
    { value: "asN", label: "mg/L as N" },
  ],
  nitrate: [
    { value: "asNO3", label: "mg/L as NO3 (most kits)" },
    { value: "asN", label: "mg/L as N" },
  ],
  kh: [
    { value: "dKH", label: "dKH" },
    { value: "mgCaCO3", label: "mg/L as CaCO3" },
  ],
  temperatureC: [
    { value: "C", label: "°C" },
    { value: "F", label: "°F" },
  ],
} as const;

const UnitsSchema = z.object({
  tan: z.enum(["asNH3", "asNH4", "asN"]),
  nitrite: z.enum(["asNO2", "asN"]),
  nitrate: z.enum(["asNO3", "asN"]),
  kh: z.enum(["dKH", "mgCaCO3"]),
  temperatureC: z.enum(["C", "F"]),
});

export async function loader({ request, params }: Route.LoaderArgs) {
  const user = await requireUser(request);
  const tank = requireOwnedTank(user.id, params.tankId);
  return {
    tank: { id: tank.id, name: tank.name },
    units: measureUnitsFor(displayUnitsFor(user)),
    maxRows: MAX_CSV_ROWS,
  };
}

type UploadAnswer = {
  stored: number;
  skipped: CsvProblem[];
  ignoredColumns: string[];
  error: string | null;
  problems: CsvProblem[];
  more: number;
};

const answer = (a: Partial<UploadAnswer>, status = 200) =>
  data<UploadAnswer>(
    { stored: 0, skipped: [], ignoredColumns: [], error: null, problems: [], more: 0, ...a },
    { status },
  );

export async function action({ request, params }: Route.ActionArgs) {
  const user = await requireUser(request);
  const tank = requireOwnedTank(user.id, params.tankId);
  try {
    await takeUploadTurn(user.id);
  } catch (error) {
    if (error instanceof UploadRefused) return answer({ error: error.message }, error.status);
    throw error;
  }
  return storeUpload(request, user, tank);
}

async function storeUpload(
  request: Request,
  user: Awaited<ReturnType<typeof requireUser>>,
  tank: ReturnType<typeof requireOwnedTank>,
) {
  let upload;
  try {
    upload = await readUpload(request, MAX_CSV_BYTES);
  } catch (error) {
    if (error instanceof UploadError) return answer({ error: error.message }, 400);
    throw error;
  }
  if (!upload.file || upload.file.text.trim() === "")
    return answer({ error: "Choose a CSV file of readings to upload." }, 400);
  const fallback = measureUnitsFor(displayUnitsFor(user));
  const chosen = UnitsSchema.safeParse(
    Object.fromEntries(
      Object.keys(UNIT_CHOICES).map((k) => [k, upload.form.get(`unit.${k}`) ?? fallback[k as keyof MeasureUnits]]),
    ),
  );
  if (!chosen.success) return answer({ error: "Choose the units from the lists." }, 400);
  // Parsed on the chores worker thread: a full file takes about 100 ms.
  const parsed = await parseReadingsCsvOffThread(upload.file.text, {
    units: chosen.data,
    stored: storedTimes(tank.id),
    now: keeperNow(request, user),
  });
  if (!parsed.ok) return answer({ error: parsed.message, problems: parsed.problems, more: parsed.more }, 400);
  try {
    // All rows or none.
    getDb().transaction((tx) => {
      checkNewReadings(tx, user.id, parsed.rows.length);
      insertReadings(tx, tank.id, parsed.rows);
    });
  } catch (error) {
    const refused = formRefusal(error);
    if (refused) return answer({ error: refused.message }, refused.status);
    if ((error as { code?: string }).code === "SQLITE_CONSTRAINT_UNIQUE") {
      return answer(
        {
          error:
            "Some of these readings were stored meanwhile (another upload?). Nothing was stored: upload the file again.",
        },
        409,
      );
    }
    throw error;
  }
  return answer({ stored: parsed.rows.length, skipped: parsed.skipped, ignoredColumns: parsed.ignoredColumns });
}

function ProblemList({ title, items, more }: { title: string; items: CsvProblem[]; more?: number }) {
  return (
    <div>
      <p className="font-semibold">{title}</p>
      <ul className="mt-1 max-h-72 list-disc space-y-0.5 overflow-auto pl-5">
        {items.map((p, i) => (
          <li key={i}>
            <span className="figure">Line {p.line}</span>: {p.message}
          </li>
        ))}
      </ul>
      {more ? <p className="mt-1">…and {more} more.</p> : null}
    </div>
  );
}

export default function UploadReadingsPage({ loaderData, actionData }: Route.ComponentProps) {
  const { tank, units, maxRows } = loaderData;
  const busy = useNavigation().state === "submitting";
  return (
    <div className="mx-auto max-w-3xl space-y-5">
      <Breadcrumbs
        trail={[
          { to: "/tanks", label: "Tanks" },
          { to: `/tanks/${tank.id}`, label: tank.name },
          { to: `/tanks/${tank.id}/readings`, label: "Readings" },
        ]}
        current="Upload"
      />
      <h1 className="text-2xl">Upload readings</h1>
      <div className="space-y-2 text-sm text-stone-700">
        <p>
          A CSV file with a header row, at most 1 MB and {maxRows.toLocaleString("en")} rows. Name a{" "}
          <code>datetime</code> column (like <code>2026-03-01T08:30</code>) or <code>date</code> and <code>time</code>{" "}
          columns, then any of <code>tan</code>, <code>nitrite</code>, <code>nitrate</code>, <code>ph</code>,{" "}
          <code>kh</code>, <code>temperature</code> and <code>note</code>. Put the unit in the name —{" "}
          <code>nitrate_no3_mg_l</code> or <code>nitrate_n_mg_l</code>, <code>tan_nh3_mg_l</code>, <code>kh_dkh</code>,{" "}
          <code>temperature_f</code> — or choose it below. Commas, semicolons or tabs between cells.
        </p>
        <p>
          Every row is checked first: if any row has a problem, nothing is stored and each problem is listed with its
          line. Readings already stored at the same time are skipped, not doubled, so you can upload a growing file
          again.{" "}
          <a className="link" href={`/tanks/${tank.id}/readings/template`} download>
            Download the template
          </a>
          .
        </p>
      </div>
      {actionData?.error ? (
        <FormMessage>
          <div className="space-y-2">
            <p className="font-semibold">{actionData.error}</p>
            {actionData.problems.length ? (
              <ProblemList title="Rows to correct" items={actionData.problems} more={actionData.more} />
            ) : null}
          </div>
        </FormMessage>
      ) : null}
      {actionData && !actionData.error ? (
        <FormMessage tone="success">
          <div className="space-y-2">
            <p className="font-semibold">
              {actionData.stored === 0
                ? "Nothing new to store."
                : `Stored ${actionData.stored} reading${actionData.stored === 1 ? "" : "s"}.`}{" "}
              <Link className="link" to={`/tanks/${tank.id}/readings`}>
                See the readings
              </Link>
            </p>
            {actionData.skipped.length ? <ProblemList title="Skipped" items={actionData.skipped} /> : null}
            {actionData.ignoredColumns.length ? (
              <p>Columns not read: {actionData.ignoredColumns.map((c) => `“${c}”`).join(", ")}.</p>
            ) : null}
          </div>
        </FormMessage>
      ) : null}
      <Form method="post" encType="multipart/form-data" className="card space-y-4">
        <div className="space-y-1">
          <label htmlFor="readings-file" className="block text-sm font-semibold">
            CSV file
          </label>
          <input
            id="readings-file"
            type="file"
            name="file"
            accept=".csv,text/csv,text/plain"
            required
            className="block w-full text-sm"
          />
        </div>
        <fieldset className="space-y-2">
          <legend className="text-sm font-semibold">Units for columns whose name gives none</legend>
          <div className="grid gap-3 sm:grid-cols-2 lg:grid-cols-3">
            <SelectField label="Ammonia (TAN)" name="unit.tan" options={UNIT_CHOICES.tan} defaultValue={units.tan} />
            <SelectField
              label="Nitrite"
              name="unit.nitrite"
              options={UNIT_CHOICES.nitrite}
              defaultValue={units.nitrite}
            />
            <SelectField
              label="Nitrate"
              name="unit.nitrate"
              options={UNIT_CHOICES.nitrate}
              defaultValue={units.nitrate}
            />
            <SelectField label="KH" name="unit.kh" options={UNIT_CHOICES.kh} defaultValue={units.kh} />
            <SelectField
              label="Temperature"
              name="unit.temperatureC"
              options={UNIT_CHOICES.temperatureC}
              defaultValue={units.temperatureC}
            />
          </div>
        </fieldset>
        <button type="submit" className="btn" disabled={busy}>
          {busy ? "Checking…" : "Upload and check"}
        </button>
      </Form>
    </div>
  );
}
