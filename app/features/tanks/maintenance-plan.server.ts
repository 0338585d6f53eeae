/**
 * The tank's maintenance plan on the server: stored per tank (defaulting to its first
 * scenario's timetable), laid over a scenario so the upcoming list, the calendar feed and the
 * forecast follow the keeper's edits, and "mark done" turning a planned task into journal entries.
 */
import { eq, inArray } from "drizzle-orm";
import type { Scenario } from "~models";
import { getDb } from "~/db/client.server";
import { maintenancePlans } from "~/db/schema-care";
import type { EntryInput } from "~/features/journal/journal-entries";
import { addEntries, firstEntryAt, lastTaskEntries, readEntry } from "~/features/journal/journal.server";
import { upcomingTasks } from "~/features/journal/calendar-feed.server";
import { doneByEndOf, type PlanStart } from "~/features/journal/plan-resume.server";
import { readStoredSettings, withTankTargets } from "~/features/runs/simulation.server";
import type { MaintenancePlan } from "~/features/tanks/maintenance-plan";
import { listScenarios, listScenariosOf, type ScenarioRow } from "~/features/tanks/tanks.server";
import { toDateTimeInput } from "~/utils/dates";

/** The groups whose trims are on a fixed schedule (the only trims a plan can time). */
export const timedTrimGroups = (s: Scenario) => s.plants.filter((g) => g.trim.rule === "everyDays");

function planFromScenario(s: Scenario): MaintenancePlan {
  return {
    waterChangeFraction: s.maintenance.waterChangeFraction,
    waterChangeIntervalDays: s.maintenance.waterChangeIntervalDays,
    gravelCleaningFraction: s.maintenance.gravelCleaningFraction,
    filterCleaningIntervalDays: s.filter.cleaningIntervalDays,
    trims: Object.fromEntries(timedTrimGroups(s).map((g) => [g.id, g.trim.everyDays])),
  };
}

/** The scenario with the plan's timetable in place of its own. */
function applyPlan(s: Scenario, p: MaintenancePlan): Scenario {
  return {
    ...s,
    maintenance: {
      ...s.maintenance,
      waterChangeFraction: p.waterChangeFraction,
      waterChangeIntervalDays: p.waterChangeIntervalDays,
      gravelCleaningFraction: p.gravelCleaningFraction,
    },
    filter: { ...s.filter, cleaningIntervalDays: p.filterCleaningIntervalDays },
    plants: s.plants.map((g) =>
      g.trim.rule === "everyDays" && p.trims[g.id] !== undefined
        ? { ...g, trim: { ...g.trim, everyDays: p.trims[g.id] } }
        : g,
    ),
  };
}

function storedPlan(tankId: number) {
  return getDb().select().from(maintenancePlans).where(eq(maintenancePlans.tankId, tankId)).get() ?? null;
}

/** A scenario's settings with the tank's stored plan laid over them (unchanged without one). */
export function plannedSettings(tankId: number, s: Scenario): Scenario {
  const row = storedPlan(tankId);
  return row ? applyPlan(s, row.plan as MaintenancePlan) : s;
}

/**
 * The tank's model for its journal, forecast and reminders: the scenario under the tank's plan,
 * with the tank's nitrate band (a tank setting that wins over the band saved in the scenario,
 * as everywhere else), so a band changed on the tank page moves the forecast's target too.
 */
export function tankModelSettings(
  tank: { id: number; nitrateTargetLow: number; nitrateTargetHigh: number },
  s: Scenario,
): Scenario {
  return withTankTargets(plannedSettings(tank.id, s), tank);
}

export type TankPlan = {
  scenario: ScenarioRow;
  /** The scenario's own settings (for defaults and group names). */
  base: Scenario;
  plan: MaintenancePlan;
  edited: boolean;
};

/**
 * The scenario that describes the tank for its plan, journal and reminders: the one the stored
 * plan was made over, else the tank's first; null without scenarios. The tank page, the journal
 * page (by default) and the reminder mail all start from it, so they list the same tasks.
 */
export function planScenario(tankId: number): ScenarioRow | null {
  return pickPlanScenario(listScenarios(tankId), storedPlan(tankId));
}

function pickPlanScenario(list: readonly ScenarioRow[], plan: { scenarioId: number } | null): ScenarioRow | null {
  return list.find((x) => x.id === plan?.scenarioId) ?? list[0] ?? null;
}

type TankForModel = { id: number; nitrateTargetLow: number; nitrateTargetHigh: number };

/**
 * `tankModelSettings` over `planScenario` for each of `list`'s tanks, in two queries however
 * many tanks (the tank list asks for every tank with a journal); a tank without a scenario, or
 * whose scenario no longer validates, is left out.
 */
export function tankPlanModels(list: readonly TankForModel[]): Map<number, { scenarioId: number; settings: Scenario }> {
  const out = new Map<number, { scenarioId: number; settings: Scenario }>();
  if (list.length === 0) return out;
  const ids = list.map((t) => t.id);
  const plans = new Map(
    getDb()
      .select()
      .from(maintenancePlans)
      .where(inArray(maintenancePlans.tankId, ids))
      .all()
      .map((p) => [p.tankId, p]),
  );
  const scenariosOf = listScenariosOf(ids);
  for (const tank of list) {
    const plan = plans.get(tank.id) ?? null;
    const chosen = pickPlanScenario(scenariosOf.get(tank.id) ?? [], plan);
    const stored = chosen ? readStoredSettings(chosen.settings) : null;
    if (!chosen || !stored) continue;
    const planned = plan ? applyPlan(stored, plan.plan as MaintenancePlan) : stored;
    out.set(tank.id, { scenarioId: chosen.id, settings: withTankTargets(planned, tank) });
  }
  return out;
}

/**
 * The day a task kind never logged counts from (a model choice, plan-resume.server.ts): the later
 * of the journal's first entry (`firstEntryMs`) and the day the edited plan was first saved; with
 * neither, the start of `scenario` (the one whose timetable is shown: its day 0, else its creation).
 */
export function planStart(
  tankId: number,
  scenario: Pick<ScenarioRow, "startDate" | "createdAt">,
  firstEntryMs: number | null,
): PlanStart {
  const saved = storedPlan(tankId)?.createdAt.getTime() ?? null;
  if (firstEntryMs !== null && (saved === null || firstEntryMs >= saved)) return { ms: firstEntryMs, from: "journal" };
  if (saved !== null) return { ms: saved, from: "plan" };
  return { ms: (scenario.startDate ?? scenario.createdAt).getTime(), from: "scenario" };
}

/** The tank's plan: the stored one over its scenario, else its first scenario's timetable; null without scenarios. */
export function tankPlan(tankId: number): TankPlan | null {
  const row = storedPlan(tankId);
  const scenario = planScenario(tankId);
  const base = scenario ? readStoredSettings(scenario.settings) : null;
  if (!scenario || !base) return null;
  return row
    ? { scenario, base, plan: row.plan as MaintenancePlan, edited: true }
    : { scenario, base, plan: planFromScenario(base), edited: false };
}

export function savePlan(tankId: number, scenarioId: number, plan: MaintenancePlan, now = Date.now()) {
  const values = { tankId, scenarioId, plan, updatedAt: new Date(now) };
  // The first save's date stays: a later edit (say, the water-change share) must not restart the
  // count of a task kind never logged, which would clear an overdue filter cleaning.
  getDb()
    .insert(maintenancePlans)
    .values({ ...values, createdAt: new Date(now) })
    .onConflictDoUpdate({ target: maintenancePlans.tankId, set: values })
    .run();
}

export function resetPlan(tankId: number) {
  getDb().delete(maintenancePlans).where(eq(maintenancePlans.tankId, tankId)).run();
}

export type PlannedTask = {
  key: string;
  kind: string;
  title: string;
  atMs: number;
  /** Past its due day with no entry: planned today, once. */
  overdue: boolean;
  values: Record<string, string>;
};

/**
 * The planned tasks from today for `days` days, each with the journal form's values it would
 * log (kind and amounts from the plan, date now), which the keeper may edit before saving.
 */
export function upcomingPlanned(tankId: number, now = Date.now(), days = 21): PlannedTask[] {
  const tp = tankPlan(tankId);
  if (!tp) return [];
  const s = applyPlan(tp.base, tp.plan);
  const date = toDateTimeInput(now);
  // Only the newest entry of each kind a task resumes from, as the calendar feed reads it: the
  // tank page is the most visited page, and a full journal holds 20,000 entries.
  const entries = lastTaskEntries(tankId, doneByEndOf(now));
  const start = planStart(tankId, tp.scenario, firstEntryAt(tankId));
  return upcomingTasks(s, entries, start, now, days).map((t) => ({
    ...t,
    key: `${t.kind}-${t.groupId ?? ""}-${t.atMs}`,
    values: { date, ...doneValues(s, t.kind, t.groupId) },
  }));
}

/** The journal form's fields for a planned task done as planned. */
function doneValues(s: Scenario, kind: string, groupId: string | undefined): Record<string, string> {
  const pct = (x: number) => String(Number((x * 100).toPrecision(3)));
  if (kind === "waterChange")
    return {
      kind: "water_change",
      water_changed_percent: pct(s.maintenance.waterChangeFraction),
      gravel_cleaned_percent: s.maintenance.gravelCleaningFraction > 0 ? pct(s.maintenance.gravelCleaningFraction) : "",
    };
  if (kind === "filterCleaning")
    return { kind: "filter_cleaned", filter_thoroughness: s.filter.cleanedInTapWater ? "tap_water" : "thorough" };
  const g = s.plants.find((x) => x.id === groupId);
  // The model trims a full group back to its "trim back to" share: what comes out is the rest, dry.
  const removed = g ? (g.trim.fullAtFraction - g.trim.trimToFraction) * g.maxMassG : 0;
  return {
    kind: "plants_trimmed",
    plant_group: g?.name ?? "",
    plant_dry_g: removed > 0 ? String(Number(removed.toPrecision(3))) : "",
  };
}

/**
 * A planned task marked done: its entries (a water change with detritus siphoned is two: the
 * change and the gravel cleaning) added in one transaction, or field errors and nothing stored.
 */
export function markTaskDone(
  tankId: number,
  fields: Record<string, string>,
  now = Date.now(),
): { ok: true; entries: EntryInput[] } | { ok: false; errors: Record<string, string> } {
  const gravel = fields.kind === "water_change" ? (fields.gravel_cleaned_percent ?? "").trim() : "";
  const main = readEntry({ ...fields, gravel_cleaned_percent: "" }, now);
  const extra =
    gravel !== "" && gravel !== "0"
      ? readEntry({ date: fields.date, kind: "gravel_cleaned", gravel_cleaned_percent: gravel, note: "" }, now)
      : null;
  const errors = { ...(main.ok ? {} : main.errors), ...(extra && !extra.ok ? extra.errors : {}) };
  if (!main.ok || (extra && !extra.ok)) return { ok: false, errors };
  const entries = [main.entry, ...(extra?.ok ? [extra.entry] : [])];
  addEntries(tankId, entries);
  return { ok: true, entries };
}
