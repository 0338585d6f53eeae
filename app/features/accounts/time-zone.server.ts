/**
 * Which time zone a person's calendar days are in: the one they chose on the account page, else
 * their browser's (the cookie root.tsx sets, or the one recorded at their last sign-in), else UTC.
 */
import { parseCookie } from "cookie";
import { eq } from "drizzle-orm";
import { getDb } from "~/db/client.server";
import { users } from "~/db/schema";
import { formatDate } from "~/utils/dates";
import { isTimeZone, wallClock, ZONE_COOKIE } from "~/utils/time-zones";

type Zones = { timeZone: string | null; browserTimeZone: string | null };

/** The browser's zone from its cookie, when it is one the runtime knows. */
function browserZone(request: Request): string | null {
  // The cookie package (RFC 6265 parsing, percent-decoding that gives up quietly on bad input).
  const zone = parseCookie(request.headers.get("Cookie") ?? "")[ZONE_COOKIE];
  return zone && isTimeZone(zone) ? zone : null;
}

/** The zone in use and where it came from (the account page says so). */
export function zoneFor(
  request: Request | null,
  user: Zones | null,
): { zone: string; from: "setting" | "browser" | "default" } {
  if (user?.timeZone && isTimeZone(user.timeZone)) return { zone: user.timeZone, from: "setting" };
  const seen = (request && browserZone(request)) ?? user?.browserTimeZone;
  if (seen && isTimeZone(seen)) return { zone: seen, from: "browser" };
  return { zone: "UTC", from: "default" };
}

/** `now` on the person's wall clock: what the planner and the journal compare their days with. */
export function keeperNow(request: Request | null, user: Zones | null, now = Date.now()): number {
  return wallClock(now, zoneFor(request, user).zone);
}

/** A person's zone when no page of theirs is open (reminder mail, calendar feed). */
export function zoneOfUser(userId: number): string {
  const row = getDb()
    .select({ timeZone: users.timeZone, browserTimeZone: users.browserTimeZone })
    .from(users)
    .where(eq(users.id, userId))
    .get();
  return zoneFor(null, row ?? null).zone;
}

/** Records the browser's zone at sign-in, for mail sent while no page is open. */
export function recordBrowserZone(request: Request, userId: number): void {
  const zone = browserZone(request);
  if (zone) getDb().update(users).set({ browserTimeZone: zone }).where(eq(users.id, userId)).run();
}

/** An instant's calendar day for the person ("2026-12-05"), as their pages date things. */
export function dayWriter(request: Request, user: Zones | null): (at: Date) => string {
  const { zone } = zoneFor(request, user);
  return (at) => formatDate(wallClock(at.getTime(), zone));
}
