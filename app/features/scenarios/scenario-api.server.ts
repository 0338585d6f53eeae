/** Server code shared by the scenario API routes: validation of bodies, JSON shapes, saving with a run. */
import { eq } from "drizzle-orm";
import { z } from "zod";
import { parseScenario, type Scenario } from "~models";
import { apiError, json, zodIssues } from "~/http/api.server";
import { jobJson, type Job } from "~/features/jobs/jobs.server";
import { requireApiUser } from "~/permissions.server";
import { requireOwnedScenarioById } from "~/features/tanks/tanks.server";
import { getDb } from "~/db/client.server";
import { scenarios } from "~/db/schema";
import { checkNewScenario } from "~/quotas.server";
import {
  insertRun,
  readStoredSettings,
  runEngineForStorage,
  settingsHash,
  withTankTargets,
  type StorableRun,
  type StoredRun,
} from "~/features/runs/simulation.server";
import { unknownSettingKeys } from "~/features/scenarios/settings-patch.server";
import type { ScenarioRow, TankRow } from "~/features/tanks/tanks.server";

export const ScenarioBodySchema = z
  .object({
    name: z.string().trim().min(1, "Give the scenario a name.").max(120, "Keep the name under 120 characters."),
    settings: z.unknown(),
  })
  .strict();

export const ScenarioPatchSchema = ScenarioBodySchema.partial().strict();

/**
 * Settings from a request body → a validated scenario, or a 400 with field paths under "settings"
 * (a name the scenario does not have is refused by name, not dropped).
 */
export function requireValidSettings(raw: unknown): Scenario {
  const unknown = unknownSettingKeys(raw);
  if (unknown.length) {
    throw apiError(
      400,
      `The settings have names Fernwater does not know: ${unknown.join(", ")}. See docs/engine.md for the scenario format.`,
      unknown.map((path) => ({ path: `settings.${path}`, message: "Unknown setting." })),
    );
  }
  const parsed = parseScenario(raw ?? {});
  if (!parsed.success) {
    throw apiError(
      400,
      "The settings are not valid.",
      zodIssues(parsed.error).map((i) => ({ ...i, path: i.path ? `settings.${i.path}` : "settings" })),
    );
  }
  return parsed.data;
}

export function scenarioJson(row: ScenarioRow) {
  return {
    id: row.id,
    tankId: row.tankId,
    name: row.name,
    schemaVersion: row.schemaVersion,
    settings: row.settings,
    createdAt: row.createdAt,
    updatedAt: row.updatedAt,
  };
}

export function runSummaryJson(run: StoredRun) {
  return {
    id: run.id,
    scenarioId: run.scenarioId,
    engineVersion: run.engineVersion,
    settingsHash: run.settingsHash,
    createdAt: run.createdAt,
    keyFigures: run.keyFigures,
    // What the engine found beyond the series: the warnings (the results page's cautions), the
    // US EPA ammonia criteria at the run's pH and temperature, the low-oxygen zones' capacity.
    warnings: run.findings.warnings,
    ammoniaCriteria: run.findings.ammoniaCriteria,
    lowOxygenZones: run.findings.lowOxygenZones,
    budget: run.budget,
    events: run.events,
    stats: run.stats,
    links: { json: `/api/runs/${run.id}`, csv: `/api/runs/${run.id}?format=csv` },
  };
}

/** Runs a writing transaction (a quota refusal inside it writes nothing and throws QuotaExceeded). */
export function write<T>(work: (tx: Tx) => T): T {
  return getDb().transaction(work);
}

type Tx = Parameters<Parameters<ReturnType<typeof getDb>["transaction"]>[0]>[0];

/**
 * Inserts a new scenario with its finished run inside the caller's transaction (so a copy can
 * create its tank, scenario, run and bookkeeping rows all or nothing). Returns the new id.
 * @param copiedFromId the scenario this one was copied from (share link, lesson), if any.
 */
export function insertScenarioWithRun(
  tx: Tx,
  tankId: number,
  name: string,
  scenario: Scenario,
  result: StorableRun,
  copiedFromId: number | null = null,
): number {
  checkNewScenario(tx, tankId);
  const id = tx
    .insert(scenarios)
    .values({ tankId, name, settings: scenario, schemaVersion: scenario.schemaVersion, copiedFromId })
    .returning({ id: scenarios.id })
    .get().id;
  insertRun(tx, id, settingsHash(scenario), result);
  return id;
}

/** Creates (target "new") or overwrites a scenario together with its run, in one transaction. */
export async function saveScenarioWithRun(
  tank: TankRow,
  target: "new" | number,
  name: string,
  settings: Scenario,
): Promise<number> {
  const scenario = withTankTargets(settings, tank);
  const result = await runEngineForStorage(scenario, { userId: tank.ownerId, purpose: "save" });
  return write((tx) => {
    if (target === "new") return insertScenarioWithRun(tx, tank.id, name, scenario, result);
    tx.update(scenarios)
      .set({ name, settings: scenario, schemaVersion: scenario.schemaVersion, updatedAt: new Date() })
      .where(eq(scenarios.id, target))
      .run();
    insertRun(tx, target, settingsHash(scenario), result);
    return target;
  });
}

/**
 * For API routes that start work on a saved scenario: the signed-in person's scenario (JSON 404
 * otherwise), its tank, and its settings with the tank's nitrate band (409 if they no longer read).
 */
export async function requireApiScenario(request: Request, scenarioIdParam: string | undefined) {
  const user = await requireApiUser(request);
  const { tank, scenario: row } = requireOwnedScenarioById(user.id, scenarioIdParam);
  const settings = readStoredSettings(row.settings);
  if (!settings) throw apiError(409, "The saved settings can no longer be read; update the scenario first.");
  return { user, tank, row, scenario: withTankTargets(settings, tank) };
}

/** 202 with the started job and where to poll it (a refused start throws JobRefused: apiRoute answers it). */
export function jobAccepted(job: Job): Response {
  return json({ job: jobJson(job), links: { progress: `/api/jobs/${job.id}` } }, { status: 202 });
}
