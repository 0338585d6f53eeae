import { Form, redirect, useNavigation } from "react-router";
import type { Route } from "./+types/import";
import { FormMessage } from "~/components/ui/field";
import { requireUser } from "~/permissions.server";
import { readScenarioFile } from "~/features/scenarios/scenario-file.server";
import { saveScenarioWithRun } from "~/features/scenarios/scenario-api.server";
import { requireOwnedTank } from "~/features/tanks/tanks.server";
import { readUpload, UploadError } from "~/http/uploads.server";
import { invalid, refusedForm } from "~/http/pages.server";
import { Breadcrumbs } from "~/components/breadcrumbs";

export const meta: Route.MetaFunction = () => [{ title: "Import a scenario · Fernwater" }];

const MAX_FILE_BYTES = 256 * 1024;

export async function loader({ request, params }: Route.LoaderArgs) {
  const user = await requireUser(request);
  const tank = requireOwnedTank(user.id, params.tankId);
  return { tank: { id: tank.id, name: tank.name } };
}

export async function action({ request, params }: Route.ActionArgs) {
  const user = await requireUser(request);
  const tank = requireOwnedTank(user.id, params.tankId);
  let upload;
  try {
    upload = await readUpload(request, MAX_FILE_BYTES);
  } catch (error) {
    if (error instanceof UploadError) return invalid({ file: error.message });
    throw error;
  }
  if (!upload.file || upload.file.text.trim() === "")
    return invalid({ file: "Choose a scenario file (.json) to upload." });
  const read = readScenarioFile(upload.file.text);
  if (!read.ok) {
    const details = Object.entries(read.issues)
      .slice(0, 8)
      .map(([path, message]) => `${path}: ${message}`);
    return invalid({ file: [read.message, ...details].join(" — ") });
  }
  const name = read.name ?? upload.file.name.replace(/(\.fernwater)?\.json$/i, "").slice(0, 120) ?? "Imported scenario";
  try {
    const id = await saveScenarioWithRun(tank, "new", name || "Imported scenario", read.scenario);
    return redirect(`/tanks/${tank.id}/scenarios/${id}`);
  } catch (error) {
    return refusedForm(error, {}, "file");
  }
}

export default function ImportScenarioPage({ loaderData, actionData }: Route.ComponentProps) {
  const busy = useNavigation().state === "submitting";
  const error = actionData?.errors.file;
  return (
    <div className="mx-auto max-w-2xl space-y-4">
      <Breadcrumbs
        trail={[
          { to: "/tanks", label: "Tanks" },
          { to: `/tanks/${loaderData.tank.id}`, label: loaderData.tank.name },
        ]}
        current="Import"
      />
      <h1 className="text-2xl">Import a scenario file</h1>
      <p className="text-sm text-stone-700">
        Upload a file exported from Fernwater (<code>.fernwater.json</code>, at most 256 kB). Files from older versions
        are brought up to date; the scenario is added to {loaderData.tank.name} and run.
      </p>
      {actionData?.errors[""] ? <FormMessage>{actionData.errors[""]}</FormMessage> : null}
      <Form method="post" encType="multipart/form-data" className="card space-y-3">
        <label htmlFor="scenario-file" className="block text-sm font-semibold">
          Scenario file
        </label>
        <input
          id="scenario-file"
          type="file"
          name="file"
          accept=".json,application/json"
          className="block w-full text-sm"
          aria-invalid={error ? true : undefined}
          aria-describedby={error ? "scenario-file-error" : undefined}
        />
        {error ? (
          <p id="scenario-file-error" className="text-sm font-semibold text-red-800" role="alert">
            {error}
          </p>
        ) : null}
        <button type="submit" className="btn" disabled={busy}>
          {busy ? "Importing…" : "Import and run"}
        </button>
      </Form>
    </div>
  );
}
