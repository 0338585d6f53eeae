/**
 * A tank's maintenance plan: the parts of its scenario's timetable a keeper edits for the real
 * tank (water change share and interval, detritus siphoned per change, filter cleaning interval,
 * trim interval per plant group on a fixed schedule). Client-safe: the plan page's form reads
 * the field names and messages. Shares are fractions here; the form shows percent.
 */
import { z } from "zod";

export type MaintenancePlan = {
  waterChangeFraction: number;
  waterChangeIntervalDays: number;
  gravelCleaningFraction: number;
  filterCleaningIntervalDays: number;
  /** Days between trims, per plant group id (groups on the fixed schedule only). */
  trims: Record<string, number>;
};

/** The form's field for a group's trim interval. */
export const trimField = (groupId: string) => `trim_every_days_${groupId}`;

const numberField = (label: string, min: number, max: number, whole = false) =>
  z
    .string({ error: `${label} is needed` })
    .trim()
    .min(1, `${label} is needed`)
    .transform((t, ctx) => {
      const n = /^\d+(\.\d+)?$/.test(t) ? Number(t) : NaN;
      if (!Number.isFinite(n)) {
        ctx.addIssue({ code: "custom", message: `${label} must be a number, e.g. ${min + 1}` });
        return z.NEVER;
      }
      if (n < min || n > max || (whole && !Number.isInteger(n))) {
        ctx.addIssue({
          code: "custom",
          message: `${label} must be ${whole ? "a whole number " : ""}between ${min} and ${max}`,
        });
        return z.NEVER;
      }
      return n;
    });

const PlanFormSchema = z.object({
  water_change_percent: numberField("Water changed", 0, 95),
  water_change_every_days: numberField("Days between water changes", 0, 365, true),
  gravel_percent: numberField("Detritus siphoned", 0, 100),
  filter_every_days: numberField("Days between filter cleanings", 0, 365, true),
});

/**
 * The form's text fields → a plan, or messages by field name. `trimGroups` are the ids of the
 * scenario's groups on a fixed trim schedule (each needs its interval, 1 to 365 days).
 */
export function readPlanForm(
  fields: Record<string, unknown>,
  trimGroups: readonly string[],
): { ok: true; plan: MaintenancePlan } | { ok: false; errors: Record<string, string> } {
  const errors: Record<string, string> = {};
  const parsed = PlanFormSchema.safeParse(fields);
  if (!parsed.success) for (const i of parsed.error.issues) errors[String(i.path[0])] ??= i.message;
  const trims: Record<string, number> = {};
  const trimSchema = numberField("Days between trims", 1, 365, true);
  for (const g of trimGroups) {
    const r = trimSchema.safeParse(fields[trimField(g)]);
    if (r.success) trims[g] = r.data;
    else errors[trimField(g)] = r.error.issues[0].message;
  }
  if (!parsed.success || Object.keys(errors).length) return { ok: false, errors };
  const f = parsed.data;
  return {
    ok: true,
    plan: {
      waterChangeFraction: f.water_change_percent / 100,
      waterChangeIntervalDays: f.water_change_every_days,
      gravelCleaningFraction: f.gravel_percent / 100,
      filterCleaningIntervalDays: f.filter_every_days,
      trims,
    },
  };
}

/** A plan as the form's text fields. */
export function planFormValues(p: MaintenancePlan): Record<string, string> {
  const pct = (x: number) => String(Number((x * 100).toPrecision(4)));
  return {
    water_change_percent: pct(p.waterChangeFraction),
    water_change_every_days: String(p.waterChangeIntervalDays),
    gravel_percent: pct(p.gravelCleaningFraction),
    filter_every_days: String(p.filterCleaningIntervalDays),
    ...Object.fromEntries(Object.entries(p.trims).map(([g, d]) => [trimField(g), String(d)])),
  };
}
