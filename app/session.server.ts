import { eq, lt, sql } from "drizzle-orm";
import { createCookieSessionStorage, redirect } from "react-router";
import { getDb, type Db } from "~/db/client.server";
import { sessions, users } from "~/db/schema";
import { getEnv, isProduction } from "~/env.server";
import { recordBrowserZone } from "~/features/accounts/time-zone.server";
import { hashToken, randomToken } from "~/utils/crypto.server";
import { safeRedirect } from "~/utils/safe-redirect";

const SESSION_DAYS = 30;

/** What every page may know about the signed-in person. */
export type SessionUser = {
  id: number;
  email: string;
  name: string;
  role: "keeper" | "educator" | "admin";
  volumeUnit: "L" | "usgal" | "impgal";
  temperatureUnit: "C" | "F";
  nitrateUnit: "NO3" | "N";
  khUnit: "dKH" | "CaCO3";
  timeZone: string | null;
  browserTimeZone: string | null;
};

let storage: ReturnType<typeof createCookieSessionStorage<{ sid: string }>> | undefined;

/** The cookie holds only a random session id; the session itself is a row, so it can be revoked. */
function getStorage() {
  if (!storage) {
    storage = createCookieSessionStorage<{ sid: string }>({
      cookie: {
        name: "__fernwater",
        httpOnly: true,
        sameSite: "lax",
        path: "/",
        secure: isProduction(),
        secrets: [getEnv().sessionSecret],
        maxAge: SESSION_DAYS * 24 * 60 * 60,
      },
    });
  }
  return storage;
}

async function readSid(request: Request): Promise<string | undefined> {
  const session = await getStorage().getSession(request.headers.get("Cookie"));
  return session.get("sid");
}

const userColumns = {
  id: users.id,
  email: users.email,
  name: users.name,
  role: users.role,
  volumeUnit: users.volumeUnit,
  temperatureUnit: users.temperatureUnit,
  nitrateUnit: users.nitrateUnit,
  khUnit: users.khUnit,
  timeZone: users.timeZone,
  browserTimeZone: users.browserTimeZone,
};

const cache = new WeakMap<Request, Promise<SessionUser | null>>();

// Every request reads its session: a prepared statement skips Drizzle's query building.
const sessionLookups = new WeakMap<Db, ReturnType<typeof prepareSessionLookup>>();
function prepareSessionLookup(db: Db) {
  return db
    .select({ ...userColumns, expiresAt: sessions.expiresAt })
    .from(sessions)
    .innerJoin(users, eq(users.id, sessions.userId))
    .where(eq(sessions.idHash, sql.placeholder("idHash")))
    .prepare();
}
function lookupSession(idHash: string) {
  const db = getDb();
  let stmt = sessionLookups.get(db);
  if (!stmt) sessionLookups.set(db, (stmt = prepareSessionLookup(db)));
  return stmt.get({ idHash });
}

// Verifying the cookie's signature costs an HMAC; a cookie header already verified maps to its id.
const verifiedCookies = new Map<string, string | null>();
async function sidFromCookieHeader(header: string | null): Promise<string | undefined> {
  if (!header) return undefined;
  if (verifiedCookies.has(header)) return verifiedCookies.get(header) ?? undefined;
  const sid = (await getStorage().getSession(header)).get("sid") ?? null;
  if (verifiedCookies.size >= 1000) verifiedCookies.delete(verifiedCookies.keys().next().value!);
  verifiedCookies.set(header, sid);
  return sid ?? undefined;
}

/** The signed-in user, read fresh from the database on every request (so role changes apply at once), or null. */
export function getSessionUser(request: Request): Promise<SessionUser | null> {
  let pending = cache.get(request);
  if (!pending) {
    pending = (async () => {
      const sid = await sidFromCookieHeader(request.headers.get("Cookie"));
      if (!sid) return null;
      const row = lookupSession(hashToken(sid));
      if (!row || row.expiresAt.getTime() < Date.now()) return null;
      const { expiresAt: _expiresAt, ...user } = row;
      return user;
    })();
    cache.set(request, pending);
  }
  return pending;
}

/**
 * Starts a new session for `userId` (any session the request already had is deleted first:
 * the id rotates at every sign-in) and redirects with the cookie set.
 */
export async function createUserSession(request: Request, userId: number, redirectTo: string): Promise<Response> {
  const db = getDb();
  const oldSid = await readSid(request);
  const sid = randomToken(32);
  db.transaction((tx) => {
    if (oldSid)
      tx.delete(sessions)
        .where(eq(sessions.idHash, hashToken(oldSid)))
        .run();
    tx.delete(sessions).where(lt(sessions.expiresAt, new Date())).run();
    tx.insert(sessions)
      .values({
        idHash: hashToken(sid),
        userId,
        expiresAt: new Date(Date.now() + SESSION_DAYS * 24 * 60 * 60 * 1000),
      })
      .run();
  });
  recordBrowserZone(request, userId);
  const session = await getStorage().getSession();
  session.set("sid", sid);
  return redirect(safeRedirect(redirectTo), {
    headers: { "Set-Cookie": await getStorage().commitSession(session) },
  });
}

/** Deletes this request's session row and clears the cookie. */
export async function destroyUserSession(request: Request, redirectTo = "/"): Promise<Response> {
  const sid = await readSid(request);
  if (sid)
    getDb()
      .delete(sessions)
      .where(eq(sessions.idHash, hashToken(sid)))
      .run();
  const session = await getStorage().getSession(request.headers.get("Cookie"));
  return redirect(redirectTo, {
    headers: { "Set-Cookie": await getStorage().destroySession(session) },
  });
}

/** Ends every session of a user (password change, password reset). */
export function revokeAllSessions(userId: number): void {
  getDb().delete(sessions).where(eq(sessions.userId, userId)).run();
}

/** Only same-site paths: never redirect to another origin after sign-in (app/utils/safe-redirect.ts). */
export { safeRedirect };
