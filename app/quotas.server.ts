/**
 * What one person may keep (the README's "Reliability" lists the numbers). Checked inside the
 * transaction that writes, so a refusal leaves nothing half-written, and answered with 413 and
 * what to do. Stored runs are counted in bytes as stored (long runs are kept packed).
 */
import { and, count, eq, ne, sql } from "drizzle-orm";
import type { getDb } from "~/db/client.server";
import { readings, runs, scenarios, tanks } from "~/db/schema";
import { journalEntries } from "~/db/schema-care";

export const QUOTAS = {
  tanksPerPerson: 50,
  scenariosPerTank: 100,
  readingsPerPerson: 20_000,
  /** Journal entries: per tank, and across a person's tanks (else 50 tanks × a full journal). */
  journalEntriesPerTank: 20_000,
  journalEntriesPerPerson: 50_000,
  storedRunBytesPerPerson: 50 * 1024 * 1024,
} as const;

type Tx = Parameters<Parameters<ReturnType<typeof getDb>["transaction"]>[0]>[0];
type Reader = Pick<Tx, "select">;

/** A write past a quota: 413 with a sentence saying what to do. Thrown inside the transaction. */
export class QuotaExceeded extends Error {
  readonly status = 413;
  override name = "QuotaExceeded";
}

const mb = (bytes: number) => `${(bytes / (1024 * 1024)).toFixed(1)} MB`;

function tanksOf(db: Reader, ownerId: number): number {
  return db.select({ n: count() }).from(tanks).where(eq(tanks.ownerId, ownerId)).get()?.n ?? 0;
}

function scenariosIn(db: Reader, tankId: number): number {
  return db.select({ n: count() }).from(scenarios).where(eq(scenarios.tankId, tankId)).get()?.n ?? 0;
}

function readingsOf(db: Reader, ownerId: number): number {
  return (
    db
      .select({ n: count() })
      .from(readings)
      .innerJoin(tanks, eq(tanks.id, readings.tankId))
      .where(eq(tanks.ownerId, ownerId))
      .get()?.n ?? 0
  );
}

/** Bytes of a person's stored runs, leaving out one scenario's (the run about to be replaced). */
function runBytesOf(db: Reader, ownerId: number, exceptScenarioId = 0): number {
  const size = sql<number>`coalesce(sum(length(cast(${runs.series} as blob)) + coalesce(length(${runs.seriesPacked}), 0) + length(cast(${runs.events} as blob)) + length(cast(${runs.keyFigures} as blob)) + length(cast(${runs.budget} as blob)) + length(cast(${runs.stats} as blob))), 0)`;
  return (
    db
      .select({ bytes: size })
      .from(runs)
      .innerJoin(scenarios, eq(scenarios.id, runs.scenarioId))
      .innerJoin(tanks, eq(tanks.id, scenarios.tankId))
      .where(and(eq(tanks.ownerId, ownerId), ne(runs.scenarioId, exceptScenarioId)))
      .get()?.bytes ?? 0
  );
}

export function checkNewTank(tx: Reader, ownerId: number): void {
  if (tanksOf(tx, ownerId) + 1 > QUOTAS.tanksPerPerson) {
    throw new QuotaExceeded(
      `You have ${QUOTAS.tanksPerPerson} tanks, the most one account keeps. Delete a tank you no longer need, then add this one.`,
    );
  }
}

export function checkNewScenario(tx: Reader, tankId: number): void {
  if (scenariosIn(tx, tankId) + 1 > QUOTAS.scenariosPerTank) {
    throw new QuotaExceeded(
      `This tank holds ${QUOTAS.scenariosPerTank} scenarios, the most a tank keeps. Delete scenarios you no longer need, or use another tank.`,
    );
  }
}

export function checkNewReadings(tx: Reader, ownerId: number, adding: number): void {
  const have = readingsOf(tx, ownerId);
  if (have + adding > QUOTAS.readingsPerPerson) {
    throw new QuotaExceeded(
      `Your tanks hold ${have.toLocaleString("en")} readings; these ${adding.toLocaleString("en")} would pass the ${QUOTAS.readingsPerPerson.toLocaleString("en")} one account keeps. Delete old readings first, or upload fewer.`,
    );
  }
}

function journalEntriesOf(db: Reader, where: { tankId: number } | { ownerId: number }): number {
  const q = db.select({ n: count() }).from(journalEntries);
  return (
    ("tankId" in where
      ? q.where(eq(journalEntries.tankId, where.tankId))
      : q.innerJoin(tanks, eq(tanks.id, journalEntries.tankId)).where(eq(tanks.ownerId, where.ownerId))
    ).get()?.n ?? 0
  );
}

/** `adding` journal entries fit in the tank's journal and in its owner's journals together. */
export function checkNewJournalEntries(tx: Reader, tankId: number, adding: number): void {
  const inTank = journalEntriesOf(tx, { tankId });
  if (inTank + adding > QUOTAS.journalEntriesPerTank) {
    throw new QuotaExceeded(
      `A tank's journal holds at most ${QUOTAS.journalEntriesPerTank.toLocaleString("en")} entries; this one has ${inTank.toLocaleString("en")}. Delete old entries first, or add fewer.`,
    );
  }
  const owner = tx.select({ ownerId: tanks.ownerId }).from(tanks).where(eq(tanks.id, tankId)).get();
  if (!owner) return;
  const have = journalEntriesOf(tx, { ownerId: owner.ownerId });
  if (have + adding > QUOTAS.journalEntriesPerPerson) {
    throw new QuotaExceeded(
      `Your tanks' journals hold ${have.toLocaleString("en")} entries; these ${adding.toLocaleString("en")} would pass the ${QUOTAS.journalEntriesPerPerson.toLocaleString("en")} one account keeps. Delete old entries first, or add fewer.`,
    );
  }
}

/** The scenario's owner may store a run of `bytes` in place of the scenario's current run. */
export function checkRunBytes(tx: Reader, scenarioId: number, bytes: number): void {
  const owner = tx
    .select({ ownerId: tanks.ownerId })
    .from(scenarios)
    .innerJoin(tanks, eq(tanks.id, scenarios.tankId))
    .where(eq(scenarios.id, scenarioId))
    .get();
  if (!owner) return;
  const others = runBytesOf(tx, owner.ownerId, scenarioId);
  if (others + bytes > QUOTAS.storedRunBytesPerPerson) {
    throw new QuotaExceeded(
      `Your stored runs take ${mb(others)} of the ${mb(QUOTAS.storedRunBytesPerPerson)} one account keeps, and this run needs ${mb(bytes)}. Delete scenarios you no longer need, or run with daily chart points or a shorter run.`,
    );
  }
}

/** What the account page shows. */
export function usageOf(db: Reader, ownerId: number) {
  const fullest =
    db
      .select({ n: count() })
      .from(scenarios)
      .innerJoin(tanks, eq(tanks.id, scenarios.tankId))
      .where(eq(tanks.ownerId, ownerId))
      .groupBy(scenarios.tankId)
      .all()
      .reduce((m, r) => Math.max(m, r.n), 0) ?? 0;
  return {
    tanks: { used: tanksOf(db, ownerId), limit: QUOTAS.tanksPerPerson },
    scenariosInFullestTank: { used: fullest, limit: QUOTAS.scenariosPerTank },
    readings: { used: readingsOf(db, ownerId), limit: QUOTAS.readingsPerPerson },
    journalEntries: { used: journalEntriesOf(db, { ownerId }), limit: QUOTAS.journalEntriesPerPerson },
    storedRunBytes: { used: runBytesOf(db, ownerId), limit: QUOTAS.storedRunBytesPerPerson },
  };
}
