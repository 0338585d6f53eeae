/**
 * The tank's upcoming planned tasks, each with a "Mark done" form filled from the plan (kind,
 * amounts, date now) that the keeper may edit before it goes into the journal. Shown on the tank
 * page and the plan page; both post to the plan page's action.
 */
import { Form } from "react-router";
import { FormMessage, TextField } from "~/components/ui/field";
import { fieldLabel, THOROUGHNESS, type EntryField } from "~/features/journal/journal-entries";

export type UpcomingTask = {
  key: string;
  title: string;
  when: string;
  overdue: boolean;
  values: Record<string, string>;
};

/** Marks a task past its due day, so it stands out from the list and not only in its words. */
export function OverdueBadge() {
  return (
    <span className="mr-2 inline-block rounded border border-amber-400 bg-amber-50 px-1.5 text-xs font-semibold uppercase tracking-wide text-amber-900">
      Overdue
    </span>
  );
}

const TASK_FIELDS: Record<string, EntryField[]> = {
  water_change: ["water_changed_percent", "gravel_cleaned_percent"],
  filter_cleaned: ["filter_thoroughness"],
  plants_trimmed: ["plant_group", "plant_dry_g"],
};

export function UpcomingList({
  tankId,
  tasks,
  back,
  failed,
}: {
  tankId: number;
  tasks: UpcomingTask[];
  back: "tank" | "plan";
  failed?: { key: string; errors: Record<string, string>; values: Record<string, string> } | null;
}) {
  if (tasks.length === 0) return <p>Nothing planned in the next three weeks.</p>;
  return (
    <ul className="divide-y divide-stone-200 rounded-md border border-stone-200">
      {tasks.map((t) => {
        const mine = failed?.key === t.key ? failed : null;
        const v = mine?.values ?? t.values;
        const e = mine?.errors ?? {};
        return (
          <li key={t.key} className="space-y-2 px-3 py-2">
            <div className="flex flex-wrap items-baseline justify-between gap-2">
              <span>
                {t.overdue ? <OverdueBadge /> : null}
                <strong>{t.when}</strong> · {t.title}
              </span>
            </div>
            <details open={!!mine}>
              <summary className="cursor-pointer text-sm text-fern-800">Mark done</summary>
              <Form method="post" action={`/tanks/${tankId}/plan`} className="mt-2 grid gap-3 sm:grid-cols-3">
                <input type="hidden" name="intent" value="done" />
                <input type="hidden" name="back" value={back} />
                <input type="hidden" name="task" value={t.key} />
                <input type="hidden" name="kind" value={v.kind} />
                {e[""] || e.kind ? <FormMessage>{e[""] ?? e.kind}</FormMessage> : null}
                <TextField label="Done on" name="date" defaultValue={v.date} error={e.date} required />
                {(TASK_FIELDS[v.kind] ?? []).map((f) =>
                  f === "filter_thoroughness" ? (
                    <label key={f} className="text-sm">
                      {fieldLabel(f)}
                      <select name={f} defaultValue={v[f]} className="input mt-1 block">
                        {Object.entries(THOROUGHNESS).map(([id, label]) => (
                          <option key={id} value={id}>
                            {label}
                          </option>
                        ))}
                      </select>
                      {e[f] ? <span className="block text-red-800">{e[f]}</span> : null}
                    </label>
                  ) : (
                    <TextField key={f} label={fieldLabel(f)} name={f} defaultValue={v[f] ?? ""} error={e[f]} />
                  ),
                )}
                <div className="sm:col-span-3">
                  <button type="submit" className="btn">
                    Add to the journal
                  </button>
                </div>
              </Form>
            </details>
          </li>
        );
      })}
    </ul>
  );
}
