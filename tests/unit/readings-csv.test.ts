import { describe, expect, it } from "vitest";
import { mapHeader } from "~/features/readings/readings-csv-columns.server";
import { readingsCsv, templateCsv } from "~/features/readings/readings-csv-export.server";
import { MAX_CSV_ROWS, parseReadingsCsv } from "~/features/readings/readings-csv.server";
import type { MeasureUnits, ReadingRow } from "~/features/readings/readings.server";

const METRIC: MeasureUnits = { tan: "asNH3", nitrite: "asNO2", nitrate: "asNO3", kh: "dKH", temperatureC: "C" };
const NOW = Date.UTC(2026, 2, 20, 12, 0);
const none = new Map<number, number>();

function parse(text: string, stored: Map<number, number> = none, units = METRIC) {
  return parseReadingsCsv(text, { units, stored, now: NOW });
}

function ok(text: string, stored: Map<number, number> = none, units = METRIC) {
  const r = parse(text, stored, units);
  if (!r.ok) throw new Error(`expected the file to be read: ${r.message} ${JSON.stringify(r.problems)}`);
  return r;
}

function refused(text: string, stored: Map<number, number> = none) {
  const r = parse(text, stored);
  if (r.ok) throw new Error("expected the file to be refused");
  return r;
}

describe("reading a readings CSV", () => {
  it("reads units from the header and stores canonical values", () => {
    const r = ok(
      [
        "datetime,tan_nh3_mg_l,nitrite_no2_mg_l,nitrate_no3_mg_l,ph,kh_mg_l_caco3,temperature_f,note",
        "2026-03-01T08:30,0.5,0.1,20,7.2,89.24,77,first",
        "2026-03-04 19:05,,,25,,,,",
      ].join("\n"),
    );
    expect(r.rows).toHaveLength(2);
    const [a, b] = r.rows;
    expect(a.line).toBe(2);
    expect(a.takenAt).toBe(Date.UTC(2026, 2, 1, 8, 30));
    // docs/sources.md §0: NH3→N ×0.82244, NO2⁻→N ×0.30447, NO3⁻→N ×0.22590
    expect(a.tan).toBeCloseTo(0.5 * 0.82244, 4);
    expect(a.nitrite).toBeCloseTo(0.1 * 0.30447, 4);
    expect(a.nitrate).toBeCloseTo(20 * 0.2259, 3);
    // docs/sources.md §3: 1 dKH = 17.848 mg/L as CaCO3
    expect(a.kh).toBeCloseTo(5, 3);
    // 77 °F = 25 °C (from memory)
    expect(a.temperatureC).toBeCloseTo(25, 6);
    expect(a.ph).toBe(7.2);
    expect(a.note).toBe("first");
    expect(b).toMatchObject({ line: 3, takenAt: Date.UTC(2026, 2, 4, 19, 5), tan: null, ph: null });
    expect(b.nitrate).toBeCloseTo(25 * 0.2259, 3);
  });

  it("maps headers case-insensitively, with units in many spellings or none", () => {
    expect(mapHeader("Nitrate (mg/L NO3-N)")).toEqual({ kind: "measure", key: "nitrate", unit: "asN" });
    expect(mapHeader("NITRATE_NO3_MG_L")).toEqual({ kind: "measure", key: "nitrate", unit: "asNO3" });
    expect(mapHeader("Ammonia NH4")).toEqual({ kind: "measure", key: "tan", unit: "asNH4" });
    expect(mapHeader("TAN")).toEqual({ kind: "measure", key: "tan", unit: null });
    expect(mapHeader("KH (ppm)")).toEqual({ kind: "measure", key: "kh", unit: "mgCaCO3" });
    expect(mapHeader("Temp °F")).toEqual({ kind: "measure", key: "temperatureC", unit: "F" });
    expect(mapHeader("Date")).toEqual({ kind: "date" });
    expect(mapHeader("taken at")).toEqual({ kind: "datetime" });
    expect(mapHeader("GH")).toBeNull();
  });

  it("uses the units chosen on the form for columns whose name gives none, and reads date and time columns", () => {
    const r = ok("Date,Time,Nitrate,KH\n2026-03-02,07:45,5,3\n", none, { ...METRIC, nitrate: "asN", kh: "mgCaCO3" });
    expect(r.rows[0].takenAt).toBe(Date.UTC(2026, 2, 2, 7, 45));
    expect(r.rows[0].nitrate).toBe(5);
    expect(r.rows[0].kh).toBeCloseTo(3 / 17.848, 6);
  });

  it("accepts a byte-order mark and Windows line ends", () => {
    const r = ok("\uFEFFdatetime,nitrate_no3_mg_l\r\n2026-03-01,10\r\n2026-03-02,12\r\n");
    expect(r.rows.map((x) => x.line)).toEqual([2, 3]);
    expect(r.rows[1].nitrate).toBeCloseTo(12 * 0.2259, 3);
  });

  it("accepts semicolons as separators, with decimal commas", () => {
    const r = ok("datetime;nitrate_no3_mg_l;ph;note\n2026-03-01T09:00;12,5;7,1;after feeding, cloudy\n");
    expect(r.delimiter).toBe(";");
    expect(r.rows[0].nitrate).toBeCloseTo(12.5 * 0.2259, 3);
    expect(r.rows[0].ph).toBe(7.1);
    expect(r.rows[0].note).toBe("after feeding, cloudy");
  });

  it("reports every bad row with its line number and reason, and keeps none", () => {
    const r = refused(
      [
        "datetime,tan_nh3_mg_l,nitrate_no3_mg_l,ph,note",
        "2026-03-01,0,10,7,fine",
        "01/03/2026,0,10,7,day first", // line 3: not ISO
        "2026-03-02,zero,10,7,", // line 4: not a number
        "2026-03-03,0,-4,7,", // line 5: negative
        "2026-03-04,0,10,15,", // line 6: pH out of range
        "2026-03-05,,,,nothing measured", // line 7: no result
        "2026-03-06,0,10,7,a,b", // line 8: a comma in the note
        "2027-03-07,0,10,7,", // line 9: future
        "2026-02-30,0,10,7,", // line 10: no such day
        `2026-03-08,0,10,7,${"x".repeat(501)}`, // line 11: note too long
        "", // an empty line is skipped
        "2026-03-01,0,11,7,again", // line 13: same time as line 2, other values
        "2026-03-09,<0.25,10,7,", // line 14: below the kit's step
      ].join("\n"),
    );
    expect(r.message).toMatch(/^Nothing was stored: 11 rows need attention/);
    const byLine = Object.fromEntries(r.problems.map((p) => [p.line, p.message]));
    expect(Object.keys(byLine).map(Number)).toEqual([3, 4, 5, 6, 7, 8, 9, 10, 11, 13, 14]);
    expect(byLine[3]).toMatch(/“01\/03\/2026” is not a date and time: write it as 2026-03-01/);
    expect(byLine[4]).toMatch(/TAN \(total ammonia\) must be a number.*column “tan_nh3_mg_l”, “zero”/);
    expect(byLine[5]).toMatch(/Nitrate must be between 0 and 885.3 mg\/L NO3/);
    expect(byLine[6]).toMatch(/pH must be between 3 and 11/);
    expect(byLine[7]).toMatch(/no test result/);
    expect(byLine[8]).toMatch(/6 cells where the header has 5.*double quotes/);
    expect(byLine[9]).toMatch(/in the future/);
    expect(byLine[10]).toMatch(/not a date/);
    expect(byLine[11]).toMatch(/longer than 500 characters/);
    expect(byLine[13]).toMatch(/same date and time as line 2 .*different values/);
    expect(byLine[14]).toMatch(/or 0 for “below the kit's lowest step”/);
  });

  it("adds a row repeated exactly once, and skips readings already stored", () => {
    const stored = new Map([[Date.UTC(2026, 2, 2), 99]]);
    const r = ok("datetime,nitrate_no3_mg_l\n2026-03-01,10\n2026-03-01,10\n2026-03-02,12\n2026-03-03,14\n", stored);
    expect(r.rows.map((x) => x.line)).toEqual([2, 5]);
    expect(r.skipped).toEqual([
      { line: 3, message: "the same reading as line 2; added once." },
      { line: 4, message: "a reading at 2026-03-02 00:00 is already stored; not added again." },
    ]);
  });

  it("refuses a header without a time column, or without anything to read, naming what it found", () => {
    expect(refused("nitrate,ph\n10,7\n").problems[0]).toEqual({
      line: 1,
      message: expect.stringMatching(/needs a “datetime” column.*“nitrate”, “ph”/),
    });
    expect(refused("datetime,gh\n2026-03-01,8\n").problems[0].message).toMatch(/names no test result/);
    expect(refused("datetime,nitrate,nitrate_no3_mg_l\n2026-03-01,8,9\n").problems[0].message).toMatch(
      /“nitrate” and “nitrate_no3_mg_l” hold the same thing/,
    );
  });

  it("refuses an empty file and one with a quote left open, with the line", () => {
    expect(refused("").message).toMatch(/empty/);
    const r = refused('datetime,note\n2026-03-01,"open\n2026-03-02,x\n');
    expect(r.problems[0].message).toMatch(/never closed/);
    expect(r.problems[0].line).toBeGreaterThan(1);
  });

  it(`refuses more than ${MAX_CSV_ROWS} rows`, () => {
    const rows = Array.from(
      { length: MAX_CSV_ROWS + 1 },
      (_v, i) => `${new Date(Date.UTC(2010, 0, 1) + i * 3_600_000).toISOString()},10`,
    );
    const r = refused(["datetime,nitrate_no3_mg_l", ...rows].join("\n"));
    expect(r.message).toMatch(/5,001 rows; upload at most 5,000/);
    // exactly the limit is fine
    expect(ok(["datetime,nitrate_no3_mg_l", ...rows.slice(1)].join("\n")).rows).toHaveLength(MAX_CSV_ROWS);
  });
});

describe("writing readings", () => {
  const row = (over: Partial<ReadingRow>): ReadingRow => ({
    id: 1,
    tankId: 1,
    takenAt: new Date(Date.UTC(2026, 2, 1, 8, 30)),
    tan: 0.1,
    nitrite: null,
    nitrate: 4.518,
    ph: 7.2,
    kh: 5,
    temperatureC: 25,
    note: "",
    createdAt: new Date(),
    ...over,
  });

  it("exports in the person's units with unit-named columns, and the export reads back unchanged", () => {
    const units: MeasureUnits = { tan: "asN", nitrite: "asNO2", nitrate: "asNO3", kh: "mgCaCO3", temperatureC: "F" };
    const csv = readingsCsv(
      [row({}), row({ id: 2, takenAt: new Date(Date.UTC(2026, 2, 2)), tan: null, note: "a, b" })],
      units,
    );
    const lines = csv.split("\r\n");
    expect(lines[0]).toBe("datetime,tan_n_mg_l,nitrite_no2_mg_l,nitrate_no3_mg_l,ph,kh_mg_l_caco3,temperature_f,note");
    // 4.518 mg N/L = 20 mg/L NO3 (docs/sources.md §0: NO3⁻→N ×0.22590); 25 °C = 77 °F
    expect(lines[1]).toMatch(/^2026-03-01T08:30,0\.1,,(19\.99\d*|20(\.00\d*)?),7\.2,89\.2\d*,77,$/);
    const back = ok(csv, none, METRIC);
    expect(back.rows[0].nitrate).toBeCloseTo(4.518, 4);
    expect(back.rows[0].kh).toBeCloseTo(5, 5);
    expect(back.rows[0].temperatureC).toBeCloseTo(25, 5);
    expect(back.rows[1].note).toBe("a, b");
  });

  it("neutralises notes that a spreadsheet would run as formulas", () => {
    const csv = readingsCsv(
      [
        row({ note: '=HYPERLINK("http://x")' }),
        row({ id: 2, takenAt: new Date(Date.UTC(2026, 2, 2)), note: "+1 fish" }),
      ],
      METRIC,
    );
    expect(csv).toContain(`"'=HYPERLINK(""http://x"")"`);
    expect(csv).toContain("'+1 fish");
  });

  it("gives back every exported note unchanged on upload, formula-like ones included, and neutralises full-width formula characters", () => {
    // OWASP CSV Injection: = + - @ tab and carriage return start a formula; some spreadsheets read
    // the full-width ＝ ＋ － ＠ the same way. The quote we add on export comes off on import.
    const notes = [
      '=HYPERLINK("http://x")',
      "+1 fish",
      "-2 shrimp",
      "@home",
      "＝SUM(A1)",
      "＋1",
      "－1",
      "＠x",
      "'=already quoted",
      "''+twice",
      "'plain quote",
      "plain",
    ];
    const rows = notes.map((note, i) => row({ id: i + 1, takenAt: new Date(Date.UTC(2026, 2, 1 + i)), note }));
    const csv = readingsCsv(rows, METRIC);
    for (const line of csv.split("\r\n").slice(1, 9)) expect(line).toMatch(/,"?'/);
    const back = ok(csv, none, METRIC);
    expect(back.rows.map((r) => r.note)).toEqual(notes);
  });

  it("refuses a file with a header and no rows, saying so", () => {
    const result = refused("datetime,nitrate_no3_mg_l,note\r\n");
    expect(result.message).toMatch(/header row but no readings/);
  });

  it("gives a template that uploads as it is, in the person's units", () => {
    const csv = templateCsv({ ...METRIC, nitrate: "asN", temperatureC: "F" }, NOW);
    expect(csv.split("\r\n")[0]).toBe(
      "datetime,tan_nh3_mg_l,nitrite_no2_mg_l,nitrate_n_mg_l,ph,kh_dkh,temperature_f,note",
    );
    const r = ok(csv);
    expect(r.rows).toHaveLength(3);
    expect(r.rows[0].temperatureC).toBeCloseTo(25, 1);
  });
});
