/**
 * Dates and times of readings and of a scenario's day 0 (isomorphic, no library).
 *
 * Times are kept as written: "2026-03-01 08:30" is stored as that wall-clock time read as UTC,
 * and shown back the same way, so what a keeper types is what they see whatever the server's or
 * the browser's time zone. A time written with an offset ("…T08:30+02:00" or "…Z") is a moment,
 * and is converted to UTC. Model days are differences of such times, so they are unaffected.
 */

export const DAY_MS = 86_400_000;

const DATE = /^(\d{4})-(\d{2})-(\d{2})$/;
const DATE_TIME = /^(\d{4})-(\d{2})-(\d{2})[T ](\d{1,2}):(\d{2})(?::(\d{2})(?:\.\d{1,3})?)?\s*(Z|[+-]\d{2}:?\d{2})?$/i;
const TIME = /^(\d{1,2}):(\d{2})(?::(\d{2}))?$/;

function utc(y: number, mo: number, d: number, h = 0, mi = 0, s = 0): number | null {
  if (mo < 1 || mo > 12 || d < 1 || d > 31 || h > 23 || mi > 59 || s > 59) return null;
  const ms = Date.UTC(y, mo - 1, d, h, mi, s);
  // Date.UTC rolls 31 April over into May: refuse dates that do not exist.
  return new Date(ms).getUTCDate() === d ? ms : null;
}

/** "2026-03-01" → ms at 00:00 of that day, or null. */
export function parseDateOnly(text: string): number | null {
  const m = DATE.exec(text.trim());
  return m ? utc(+m[1], +m[2], +m[3]) : null;
}

/** "08:30" or "08:30:15" → ms since midnight, or null. */
export function parseTimeOfDay(text: string): number | null {
  const m = TIME.exec(text.trim());
  if (!m) return null;
  const [h, mi, s] = [+m[1], +m[2], +(m[3] ?? 0)];
  return h <= 23 && mi <= 59 && s <= 59 ? ((h * 60 + mi) * 60 + s) * 1000 : null;
}

/**
 * ISO 8601 date or date-time → ms, or null: "2026-03-01", "2026-03-01T08:30", "2026-03-01 08:30:15",
 * "2026-03-01T08:30Z", "2026-03-01T08:30+02:00". A date alone is 00:00.
 */
export function parseDateTime(text: string): number | null {
  const t = text.trim();
  const dateOnly = parseDateOnly(t);
  if (dateOnly !== null) return dateOnly;
  const m = DATE_TIME.exec(t);
  if (!m) return null;
  const base = utc(+m[1], +m[2], +m[3], +m[4], +m[5], +(m[6] ?? 0));
  if (base === null) return null;
  const zone = m[7];
  if (!zone || zone.toUpperCase() === "Z") return base;
  const z = /^([+-])(\d{2}):?(\d{2})$/.exec(zone)!;
  const offset = (+z[2] * 60 + +z[3]) * 60_000 * (z[1] === "+" ? 1 : -1);
  return base - offset;
}

const pad = (n: number) => String(n).padStart(2, "0");

/** ms → "2026-03-01". */
export function formatDate(ms: number): string {
  const d = new Date(ms);
  return `${d.getUTCFullYear()}-${pad(d.getUTCMonth() + 1)}-${pad(d.getUTCDate())}`;
}

/** "Sat 5 December": a planned day in words (a wall-clock date read as UTC, app/utils/time-zones.ts). */
export function weekdayText(ms: number): string {
  return new Date(ms).toLocaleDateString("en-GB", { weekday: "short", day: "numeric", month: "long", timeZone: "UTC" });
}

/** ms → "2026-03-01 08:30" (seconds only when not zero). */
export function formatDateTime(ms: number): string {
  const d = new Date(ms);
  const s = d.getUTCSeconds();
  return `${formatDate(ms)} ${pad(d.getUTCHours())}:${pad(d.getUTCMinutes())}${s ? `:${pad(s)}` : ""}`;
}

/** ms → the value of an <input type="datetime-local">, "2026-03-01T08:30". */
export function toDateTimeInput(ms: number): string {
  return formatDateTime(ms).replace(" ", "T").slice(0, 16);
}

/** 00:00 of the day `ms` falls on. */
export function startOfDay(ms: number): number {
  return Math.floor(ms / DAY_MS) * DAY_MS;
}
