/**
 * What the latest replay of each tank's journal found (table journal_findings), kept whenever a
 * replay on the tank's plan is computed, so the tank list and the tank page can say "the journal
 * shows danger" without replaying every journal on every view. Findings count only while they
 * are for the same journal version, the same plan settings (a scenario or tank edit changes what
 * the replay finds) and the same day (the replay runs to today); otherwise the list replays the
 * journal again, a few a view, through the owner's run gate.
 */
import { inArray } from "drizzle-orm";
import type { Scenario } from "~models";
import { getDb } from "~/db/client.server";
import { journalEntries, journalFindings } from "~/db/schema-care";
import { replayJournal, type Replay } from "~/features/journal/journal-replay.server";
import { journalOf } from "~/features/journal/journal.server";
import { toxicPeaksAboveCaution } from "~/features/runs/display-figures";
import { RunRefused } from "~/features/runs/run-gate.server";
import { resultWarnings } from "~/features/runs/run-warnings";
import { settingsHash } from "~/features/runs/simulation.server";
import { tankPlanModels } from "~/features/tanks/maintenance-plan.server";
import type { TankRow } from "~/features/tanks/tanks.server";
import type { JournalFlag } from "~/features/journal/journal-flag";
import { runProblem } from "~/http/pages.server";
import { startOfDay } from "~/utils/dates";
import { DEFAULT_PREFERENCES, displayUnitsFor } from "~/utils/display-units";

/** Journals a list view replays at most (each a model run of up to two years); the rest wait. */
export const REPLAYS_PER_VIEW = 3;

/** The warnings that name harm to fish, in the list's words (the journal page gives the details). */
const DANGER_WORDS: Record<string, string> = {
  freeAmmoniaAboveCaution: "free ammonia above the caution line",
  nitriteAboveCaution: "nitrite above the caution line",
  ammoniaAboveAcuteCriterion: "total ammonia above the short-term criterion",
  ammoniaAboveChronicCriterion: "total ammonia above the long-term criterion",
  lowOxygen: "oxygen below the line fish need",
};

type Findings = typeof journalFindings.$inferSelect;

function dangersOf(f: Pick<Findings, "freeNh3AboveCaution" | "nitriteAboveCaution" | "warningCodes">): string[] {
  const codes = new Set(f.warningCodes);
  if (f.freeNh3AboveCaution) codes.add("freeAmmoniaAboveCaution");
  if (f.nitriteAboveCaution) codes.add("nitriteAboveCaution");
  return Object.keys(DANGER_WORDS)
    .filter((code) => codes.has(code))
    .map((code) => `Journal replay: ${DANGER_WORDS[code]}`);
}

/** Whether `found` is what a replay of `tank`'s journal on `settings` would find on `now`'s day. */
function current(found: Findings | undefined, tank: TankRow, settings: Scenario, now: number): found is Findings {
  return (
    found !== undefined &&
    found.journalVersion === tank.journalVersion &&
    found.settingsHash === settingsHash(settings) &&
    startOfDay(found.computedAt.getTime()) === startOfDay(now)
  );
}

/** Keeps what the replay `r` of `tank`'s journal (at its current version) on `settings` found, and returns it. */
export function saveJournalFindings(tank: TankRow, settings: Scenario, r: Replay, now: number): Findings {
  const above = toxicPeaksAboveCaution(r.result.keyFigures);
  // The codes do not depend on the units; the warnings' words are not kept.
  const codes = resultWarnings(
    {
      keyFigures: r.result.keyFigures,
      warnings: r.result.warnings,
      tapWater: settings.tapWater,
      volumeL: settings.water.volumeL,
    },
    displayUnitsFor(DEFAULT_PREFERENCES),
  ).map((w) => w.code);
  const values = {
    journalVersion: tank.journalVersion,
    settingsHash: settingsHash(settings),
    computedAt: new Date(now),
    freeNh3AboveCaution: above.peakFreeNh3,
    nitriteAboveCaution: above.peakNitrite,
    warningCodes: [...new Set(codes)],
  };
  getDb()
    .insert(journalFindings)
    .values({ tankId: tank.id, ...values })
    .onConflictDoUpdate({ target: journalFindings.tankId, set: values })
    .run();
  return { tankId: tank.id, ...values };
}

/** Replays `tank`'s journal on its plan and keeps the findings; null without entries. */
async function replayAndSave(tank: TankRow, plan: { settings: Scenario }, now: number): Promise<Findings | null> {
  const replay = await replayJournal(plan.settings, journalOf(tank), now, tank.ownerId);
  if (!replay) return null;
  return saveJournalFindings(tank, plan.settings, replay, now);
}

/**
 * The journal flag of each of `list`'s tanks (all of one owner): one query for which journals
 * have entries, one for the kept findings, and at most `maxReplays` replays of journals changed
 * since their findings; a refused or failed replay says "open the journal", never fails the page.
 */
export async function journalFlags(
  list: TankRow[],
  now = Date.now(),
  maxReplays = REPLAYS_PER_VIEW,
): Promise<Map<number, JournalFlag>> {
  const out = new Map<number, JournalFlag>();
  if (list.length === 0) return out;
  const ids = list.map((t) => t.id);
  const withEntries = new Set(
    getDb()
      .selectDistinct({ tankId: journalEntries.tankId })
      .from(journalEntries)
      .where(inArray(journalEntries.tankId, ids))
      .all()
      .map((r) => r.tankId),
  );
  const kept = new Map(
    getDb()
      .select()
      .from(journalFindings)
      .where(inArray(journalFindings.tankId, ids))
      .all()
      .map((f) => [f.tankId, f]),
  );
  // The plan each journal is replayed on (as the journal page's default), for tanks with entries.
  const plans = tankPlanModels(list.filter((t) => withEntries.has(t.id)));
  let replays = 0;
  // After one refusal the gate is full: the others say so at once rather than each wait for a slot.
  let refused = false;
  for (const tank of list) {
    if (!withEntries.has(tank.id)) {
      out.set(tank.id, null);
      continue;
    }
    // A tank without a scenario has nothing to replay on (nor has its journal page): no flag.
    const plan = plans.get(tank.id);
    if (!plan) {
      out.set(tank.id, null);
      continue;
    }
    let found = kept.get(tank.id);
    if (!current(found, tank, plan.settings, now)) {
      if (refused || replays >= maxReplays) {
        out.set(tank.id, { state: refused ? "refused" : "later" });
        continue;
      }
      replays++;
      try {
        found = (await replayAndSave(tank, plan, now)) ?? undefined;
      } catch (error) {
        if (!runProblem(error)) console.error("[fernwater] the tank list could not replay a journal", error);
        out.set(tank.id, { state: "refused" });
        refused = error instanceof RunRefused;
        continue;
      }
    }
    out.set(tank.id, found ? { state: "found", dangers: dangersOf(found) } : null);
  }
  return out;
}
