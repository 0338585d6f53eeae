/**
 * The maintenance plan in the API's JSON: what GET answers (the stored plan, or the scenario's
 * timetable when none was edited, saying which) and what PUT reads. PUT takes the plan page's
 * own field names and goes through the form's reader (readPlanForm), so the API and the page
 * refuse the same values with the same messages.
 */
import { planFormValues, readPlanForm, trimField } from "~/features/tanks/maintenance-plan";
import { timedTrimGroups, type TankPlan } from "~/features/tanks/maintenance-plan.server";

const PLAN_FIELDS = ["water_change_percent", "water_change_every_days", "gravel_percent", "filter_every_days"];

/** GET's body; `source` says whether the keeper's plan or the scenario's timetable is in force. */
export function planJson(tankId: number, tp: TankPlan | null) {
  if (!tp) return { tankId, source: null, scenario: null, plan: null, fields: null, trimGroups: [] };
  return {
    tankId,
    source: tp.edited ? ("plan" as const) : ("scenario" as const),
    scenario: { id: tp.scenario.id, name: tp.scenario.name },
    /** Canonical: shares 0–1, days (0 = none). */
    plan: tp.plan,
    /** What PUT takes (the plan page's fields: percent and days). */
    fields: Object.fromEntries(Object.entries(planFormValues(tp.plan)).map(([k, v]) => [k, Number(v)])),
    trimGroups: timedTrimGroups(tp.base).map((g) => ({ id: g.id, name: g.name, field: trimField(g.id) })),
  };
}

/** PUT's body → a plan, or messages by field name (unknown names and non-values included). */
export function readPlanBody(body: Record<string, unknown>, tp: TankPlan) {
  const trimGroups = timedTrimGroups(tp.base).map((g) => g.id);
  const known = new Set([...PLAN_FIELDS, ...trimGroups.map(trimField)]);
  const errors: Record<string, string> = {};
  const fields: Record<string, string> = {};
  for (const [k, v] of Object.entries(body)) {
    if (!known.has(k)) errors[k] = "Unknown field.";
    else if (typeof v === "number" && Number.isFinite(v)) fields[k] = String(v);
    else if (typeof v === "string") fields[k] = v;
    else if (v !== undefined && v !== null) errors[k] = "Must be a number";
  }
  const read = readPlanForm(fields, trimGroups);
  if (!read.ok) for (const [k, m] of Object.entries(read.errors)) errors[k] ??= m;
  return read.ok && Object.keys(errors).length === 0
    ? { ok: true as const, plan: read.plan }
    : { ok: false as const, errors };
}
