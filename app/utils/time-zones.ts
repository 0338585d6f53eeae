/**
 * A person's time zone and their wall clock (isomorphic; Intl, which knows the IANA database and
 * its daylight-saving rules). Days in Fernwater are kept as written (app/utils/dates.ts): a keeper's
 * "2026-12-05" is midnight of that date read as UTC. So "today" for a person is the day of their
 * wall clock, `wallClock(Date.now(), zone)`, compared with those days; stored instants stay UTC.
 */
/** The cookie the browser sets with its own zone (root.tsx), read until the person chooses one. */
export const ZONE_COOKIE = "fw_tz";

const formats = new Map<string, Intl.DateTimeFormat>();
function formatIn(zone: string): Intl.DateTimeFormat {
  let f = formats.get(zone);
  if (!f) {
    f = new Intl.DateTimeFormat("en-US", {
      timeZone: zone,
      hourCycle: "h23",
      year: "numeric",
      month: "2-digit",
      day: "2-digit",
      hour: "2-digit",
      minute: "2-digit",
      second: "2-digit",
    });
    formats.set(zone, f);
  }
  return f;
}

/** Whether the runtime knows `zone` as an IANA time zone ("Pacific/Auckland", "UTC"). */
export function isTimeZone(zone: string): boolean {
  // Names only ("Europe/Berlin", "UTC"): Intl also takes bare offsets ("+13:00"), which know no daylight saving.
  if (zone.length > 64 || !/^[A-Za-z][A-Za-z0-9_+\-/]*$/.test(zone)) return false;
  try {
    formatIn(zone);
    return true;
  } catch {
    return false;
  }
}

/** The instant `ms` as the wall-clock time in `zone`, read as UTC (ms). */
export function wallClock(ms: number, zone: string): number {
  const p = Object.fromEntries(
    formatIn(zone)
      .formatToParts(new Date(ms))
      .map((x) => [x.type, x.value]),
  );
  const wall = Date.UTC(+p.year, +p.month - 1, +p.day, +p.hour, +p.minute, +p.second);
  return wall + (((ms % 1000) + 1000) % 1000);
}

/**
 * The instant at which `zone`'s wall clock reads `wall` (a wall-clock time read as UTC). A time
 * skipped by a daylight-saving change comes out an hour later; one that happens twice, the first.
 */
export function instantAt(wall: number, zone: string): number {
  const guess = wall - (wallClock(wall, zone) - wall);
  const at = wall - (wallClock(guess, zone) - guess);
  // Inside a skipped hour neither offset reads back `wall`: take the later offset's reading.
  return wallClock(at, zone) === wall ? at : Math.max(at, guess);
}
