/**
 * Public share links. A link carries an unguessable token (256 random bits, base64url) and
 * opens a read-only view of one scenario for anyone. Only the SHA-256 of the token is stored
 * (share_links.token_hash), so a leaked database leaks no live link — and the owner sees the
 * address once, when the link is made; a lost address is replaced by making a new link.
 *
 * States of a row: live (neither revoked nor taken down), turned off by the owner (revoked_at;
 * the address answers 404 at once), taken down by an admin (taken_down_at/by/reason; 404 for
 * everyone but the owner, who gets 410 with the reason). While a takedown stands the owner
 * cannot make a new link for that scenario; an admin may restore the link.
 */
import { and, desc, eq, isNotNull, isNull } from "drizzle-orm";
import { ENGINE_VERSION } from "~models";
import { getDb } from "~/db/client.server";
import { scenarios, shareLinks, tanks, users } from "~/db/schema";
import type { ScenarioRow, TankRow } from "~/features/tanks/tanks.server";
import { hashToken, randomToken } from "~/utils/crypto.server";

const SHARE_TOKEN_BYTES = 32;
/** randomToken(32) gives 43 base64url characters; anything else is not a token of ours. */
const TOKEN_PATTERN = /^[A-Za-z0-9_-]{16,128}$/;

export type ShareLinkRow = typeof shareLinks.$inferSelect;

export function sharePath(token: string): string {
  return `/s/${token}`;
}

export function isLive(link: Pick<ShareLinkRow, "revokedAt" | "takenDownAt">): boolean {
  return !link.revokedAt && !link.takenDownAt;
}

/** The link a token names, whatever its state, with its scenario and tank; null if none. */
export function findLinkByToken(
  token: string | undefined,
): { link: ShareLinkRow; scenario: ScenarioRow; tank: TankRow } | null {
  if (!token || !TOKEN_PATTERN.test(token)) return null;
  return (
    getDb()
      .select({ link: shareLinks, scenario: scenarios, tank: tanks })
      .from(shareLinks)
      .innerJoin(scenarios, eq(scenarios.id, shareLinks.scenarioId))
      .innerJoin(tanks, eq(tanks.id, scenarios.tankId))
      .where(eq(shareLinks.tokenHash, hashToken(token)))
      .get() ?? null
  );
}

export type ShareState = {
  live: { id: number; createdAt: Date } | null;
  takedown: { id: number; at: Date; reason: string } | null;
};

/** What the owner's share controls show for a scenario. */
export function shareState(scenarioId: number): ShareState {
  const rows = getDb()
    .select()
    .from(shareLinks)
    .where(eq(shareLinks.scenarioId, scenarioId))
    .orderBy(desc(shareLinks.id))
    .all();
  const live = rows.find(isLive);
  const down = rows.find((r) => r.takenDownAt);
  return {
    live: live ? { id: live.id, createdAt: live.createdAt } : null,
    takedown: down ? { id: down.id, at: down.takenDownAt!, reason: down.takedownReason ?? "" } : null,
  };
}

/**
 * Turns a link on, or replaces the live one ("make a new link": the old address dies at
 * once). Returns the raw token — the only time it exists outside the visitor's address bar —
 * or null while a takedown stands.
 */
export function makeLink(scenarioId: number): string | null {
  const token = randomToken(SHARE_TOKEN_BYTES);
  return getDb().transaction((tx) => {
    const down = tx
      .select({ id: shareLinks.id })
      .from(shareLinks)
      .where(and(eq(shareLinks.scenarioId, scenarioId), isNotNull(shareLinks.takenDownAt)))
      .get();
    if (down) return null;
    tx.update(shareLinks)
      .set({ revokedAt: new Date() })
      .where(and(eq(shareLinks.scenarioId, scenarioId), isNull(shareLinks.revokedAt)))
      .run();
    tx.insert(shareLinks)
      .values({ scenarioId, tokenHash: hashToken(token) })
      .run();
    return token;
  });
}

/** Turns the scenario's live link off. Returns whether there was one. */
export function turnOffLink(scenarioId: number): boolean {
  const done = getDb()
    .update(shareLinks)
    .set({ revokedAt: new Date() })
    .where(and(eq(shareLinks.scenarioId, scenarioId), isNull(shareLinks.revokedAt), isNull(shareLinks.takenDownAt)))
    .run();
  return done.changes > 0;
}

/** Every link that is live or taken down (turned-off ones are gone for good), newest first, for admins. */
export function listPublicLinks() {
  return getDb()
    .select({
      id: shareLinks.id,
      createdAt: shareLinks.createdAt,
      takenDownAt: shareLinks.takenDownAt,
      takedownReason: shareLinks.takedownReason,
      scenarioId: scenarios.id,
      scenarioName: scenarios.name,
      tankName: tanks.name,
      ownerName: users.name,
      ownerEmail: users.email,
    })
    .from(shareLinks)
    .innerJoin(scenarios, eq(scenarios.id, shareLinks.scenarioId))
    .innerJoin(tanks, eq(tanks.id, scenarios.tankId))
    .innerJoin(users, eq(users.id, tanks.ownerId))
    .where(isNull(shareLinks.revokedAt))
    .orderBy(desc(shareLinks.id))
    .all();
}

/** A link by id with its scenario and tank, for the admin's review page; null if none. */
export function findLinkById(id: number): { link: ShareLinkRow; scenario: ScenarioRow; tank: TankRow } | null {
  return (
    getDb()
      .select({ link: shareLinks, scenario: scenarios, tank: tanks })
      .from(shareLinks)
      .innerJoin(scenarios, eq(scenarios.id, shareLinks.scenarioId))
      .innerJoin(tanks, eq(tanks.id, scenarios.tankId))
      .where(eq(shareLinks.id, id))
      .get() ?? null
  );
}

/** Takes a live link down. False if it was already down, turned off or gone. */
export function takeDownLink(linkId: number, adminId: number, reason: string): boolean {
  const done = getDb()
    .update(shareLinks)
    .set({ takenDownAt: new Date(), takenDownById: adminId, takedownReason: reason })
    .where(and(eq(shareLinks.id, linkId), isNull(shareLinks.revokedAt), isNull(shareLinks.takenDownAt)))
    .run();
  return done.changes > 0;
}

/** Lifts a takedown: the same address works again. False if the link was not taken down. */
export function restoreLink(linkId: number): boolean {
  const done = getDb()
    .update(shareLinks)
    .set({ takenDownAt: null, takenDownById: null, takedownReason: null })
    .where(and(eq(shareLinks.id, linkId), isNull(shareLinks.revokedAt), isNotNull(shareLinks.takenDownAt)))
    .run();
  return done.changes > 0;
}

/** Changes with every restart, so a new build never answers 304 for a page that names old assets. */
const BOOT_ID = randomToken(6);

/**
 * Validator of an anonymous view of a live link: it changes when the scenario or its tank
 * (nitrate band) is saved, the engine changes, the server restarts, or the link is replaced.
 * HTML and the router's .data answer differ, so they get different tags.
 */
export function shareEtag(link: ShareLinkRow, scenario: ScenarioRow, tank: TankRow, variant: "html" | "data"): string {
  const parts = [link.id, scenario.updatedAt.getTime(), tank.updatedAt.getTime(), ENGINE_VERSION, BOOT_ID, variant];
  return `"${hashToken(parts.join("|")).slice(0, 27)}"`;
}

/** Whether an If-None-Match header names `etag` (weak comparison, as for GET). */
export function etagMatches(header: string | null, etag: string): boolean {
  if (!header) return false;
  if (header.trim() === "*") return true;
  const strip = (t: string) => t.trim().replace(/^W\//, "");
  return header.split(",").some((t) => strip(t) === strip(etag));
}
