/**
 * A person's wall clock and back, across zones and daylight-saving changes (app/utils/time-zones.ts).
 * Offsets and change dates: IANA tz database (the zones' rules), as Intl carries it.
 */
import { describe, expect, it } from "vitest";
import { formatDate, formatDateTime, startOfDay } from "~/utils/dates";
import { instantAt, isTimeZone, wallClock } from "~/utils/time-zones";

const at = (iso: string) => Date.parse(iso);

describe("wallClock", () => {
  it("gives the keeper's calendar day, not the server's", () => {
    // IANA tz database: Pacific/Auckland is UTC+13 in December (NZDT).
    expect(formatDateTime(wallClock(at("2026-12-04T20:00:00Z"), "Pacific/Auckland"))).toBe("2026-12-05 09:00");
    // IANA tz database: America/Los_Angeles is UTC-8 in December (PST).
    expect(formatDateTime(wallClock(at("2026-12-05T03:00:00Z"), "America/Los_Angeles"))).toBe("2026-12-04 19:00");
    expect(formatDate(startOfDay(wallClock(at("2026-12-05T03:00:00Z"), "UTC")))).toBe("2026-12-05");
  });

  it("follows a daylight-saving change", () => {
    // IANA tz database: America/New_York springs forward on 8 March 2026 at 02:00 EST (07:00 UTC).
    expect(formatDateTime(wallClock(at("2026-03-08T06:59:00Z"), "America/New_York"))).toBe("2026-03-08 01:59");
    expect(formatDateTime(wallClock(at("2026-03-08T07:00:00Z"), "America/New_York"))).toBe("2026-03-08 03:00");
    // IANA tz database: Pacific/Auckland falls back on 5 April 2026 at 03:00 NZDT (14:00 UTC on the 4th) to UTC+12.
    expect(formatDateTime(wallClock(at("2026-04-04T13:59:00Z"), "Pacific/Auckland"))).toBe("2026-04-05 02:59");
    expect(formatDateTime(wallClock(at("2026-04-04T14:00:00Z"), "Pacific/Auckland"))).toBe("2026-04-05 02:00");
  });
});

describe("instantAt", () => {
  it("finds the instant of a local hour, either side of a change", () => {
    // IANA tz database: 08:00 in Auckland on 5 December is NZDT, UTC+13.
    expect(new Date(instantAt(Date.UTC(2026, 11, 5, 8), "Pacific/Auckland")).toISOString()).toBe(
      "2026-12-04T19:00:00.000Z",
    );
    // IANA tz database: New York is UTC-5 before 8 March 2026 and UTC-4 after.
    expect(new Date(instantAt(Date.UTC(2026, 2, 7, 8), "America/New_York")).toISOString()).toBe(
      "2026-03-07T13:00:00.000Z",
    );
    expect(new Date(instantAt(Date.UTC(2026, 2, 9, 8), "America/New_York")).toISOString()).toBe(
      "2026-03-09T12:00:00.000Z",
    );
  });

  it("takes a skipped hour an hour later and a repeated one at its first time", () => {
    // IANA tz database: 02:30 on 8 March 2026 does not exist in New York (02:00 EST → 03:00 EDT).
    expect(new Date(instantAt(Date.UTC(2026, 2, 8, 2, 30), "America/New_York")).toISOString()).toBe(
      "2026-03-08T07:30:00.000Z",
    );
    // IANA tz database: 01:30 on 1 November 2026 happens twice in New York; first in EDT (UTC-4).
    expect(new Date(instantAt(Date.UTC(2026, 10, 1, 1, 30), "America/New_York")).toISOString()).toBe(
      "2026-11-01T05:30:00.000Z",
    );
  });
});

describe("isTimeZone", () => {
  it("knows IANA zones and refuses made-up ones", () => {
    // IANA tz database zone names.
    expect(isTimeZone("Pacific/Auckland")).toBe(true);
    expect(isTimeZone("America/Los_Angeles")).toBe(true);
    expect(isTimeZone("UTC")).toBe(true);
    expect(isTimeZone("Mars/Olympus_Mons")).toBe(false);
    expect(isTimeZone("")).toBe(false);
    expect(isTimeZone("+13:00; drop table")).toBe(false);
    // A bare offset is no zone: it knows no daylight saving (IANA tz database names zones by place).
    expect(isTimeZone("+13:00")).toBe(false);
  });
});
