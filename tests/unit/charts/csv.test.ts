// Our own worked examples of CSV output; the formula-neutralising rule follows the OWASP
// "CSV Injection" guidance (cells starting with = + - @ tab or carriage return).
import { describe, expect, it } from "vitest";
import { compareCsv, csvCell, eventRows, fileSlug, seriesCsv, toCsv } from "~/utils/csv";
import type { ChartSeries, ChartUnits } from "~/utils/chart-data";

const units: ChartUnits = { ammonia: "mg N/L", nitrite: "mg N/L", nitrate: "mg/L NO3" };

describe("csvCell", () => {
  it("writes numbers as numbers, negative ones included, and leaves non-finite cells empty", () => {
    expect(csvCell(-0.5)).toBe("-0.5");
    expect(csvCell(12.7424)).toBe("12.7424");
    expect(csvCell(0)).toBe("0");
    expect(csvCell(NaN)).toBe("");
    expect(csvCell(null)).toBe("");
  });

  it("neutralises text that a spreadsheet would run as a formula", () => {
    expect(csvCell('=HYPERLINK("x")')).toBe(`"'=HYPERLINK(""x"")"`);
    expect(csvCell("+1")).toBe("'+1");
    expect(csvCell("-5 fish")).toBe("'-5 fish");
    expect(csvCell("@sum")).toBe("'@sum");
    expect(csvCell("\tx")).toBe("'\tx");
    expect(csvCell("Stem thicket")).toBe("Stem thicket");
    // Full-width forms, which some spreadsheets also run.
    expect(csvCell("＝1+1")).toBe("'＝1+1");
    expect(csvCell("＋1")).toBe("'＋1");
    expect(csvCell("－1")).toBe("'－1");
    expect(csvCell("＠x")).toBe("'＠x");
  });

  it("quotes cells with commas, quotes, line breaks or edge spaces", () => {
    expect(csvCell("a,b")).toBe('"a,b"');
    expect(csvCell('say "hi"')).toBe('"say ""hi"""');
    expect(csvCell("two\nlines")).toBe('"two\nlines"');
    expect(csvCell(" padded")).toBe('" padded"');
  });

  it("joins rows with CRLF", () => {
    expect(
      toCsv([
        ["a", 1],
        ["b", -2],
      ]),
    ).toBe("a,1\r\nb,-2\r\n");
  });
});

const series: ChartSeries = {
  t: [0, 1, 1, 2],
  tan: [0.1, 0.2, 0.12, 0.15],
  nh3: [0.001, 0.002, 0.0012, 0.0015],
  no2: [0, 0.05, 0.03, 0.04],
  no3: [10, 20, 12, 14],
  plants: [{ id: "p", name: "=evil", massG: [5, 5.5, 5.5, 6] }],
};

describe("seriesCsv", () => {
  it("has a header with units, one row per sample, and events on the sample after the jump", () => {
    const csv = seriesCsv(series, units, [{ day: 1, kind: "waterChange", detail: "40 % changed, 300 mg N out" }]);
    const lines = csv.trimEnd().split("\r\n");
    expect(lines[0]).toBe(
      "day,Total ammonia (TAN) (mg N/L),Free ammonia (NH3) (mg N/L),Nitrite (NO2) (mg N/L),Nitrate (NO3) (mg/L NO3),'=evil (g dry),events",
    );
    expect(lines).toHaveLength(5);
    expect(lines[2]).toBe("1,0.2,0.002,0.05,20,5.5,");
    expect(lines[3]).toBe('1,0.12,0.0012,0.03,12,5.5,"Water change: 40 % changed, 300 mg N out"');
  });
  it("carries the TAN caution lines at each sample's pH when the run has them, as the chart's table does", () => {
    const withLines = { ...series, tanLongTerm: [1.9, 1.9, 1.2, 1.2], tanShortTerm: [17, 17, 9.6, 9.6] };
    const lines = seriesCsv(withLines, units).trimEnd().split("\r\n");
    expect(lines[0]).toContain(
      ",Nitrate (NO3) (mg/L NO3),TAN long-term limit at the pH of the day (mg N/L),TAN short-term criterion at the pH of the day (mg N/L),'=evil (g dry),",
    );
    expect(lines[3]).toBe("1,0.12,0.0012,0.03,12,1.2,9.6,5.5,");
  });
});

describe("eventRows", () => {
  it("puts an event without a sample pair on the first sample at or after it", () => {
    const rows = eventRows([0, 1, 2, 3], [{ day: 1.5, kind: "trim", detail: "" }]);
    expect([...rows.keys()]).toEqual([2]);
  });
});

describe("compareCsv", () => {
  it("writes long form, one row per run and sample, plants summed", () => {
    const other = { ...series, t: [0, 2], no3: [10, 8], plants: [] };
    const csv = compareCsv(
      [
        { label: "Baseline", series },
        { label: "+ floating plants", series: other },
      ],
      "no3",
      units,
    );
    const lines = csv.trimEnd().split("\r\n");
    expect(lines[0]).toBe("scenario,day,Nitrate (NO3) (mg/L NO3)");
    expect(lines).toHaveLength(1 + 4 + 2);
    expect(lines[5]).toBe("'+ floating plants,0,10");
    const plants = compareCsv([{ label: "B", series }], "plants", units)
      .trimEnd()
      .split("\r\n");
    expect(plants[0]).toBe("scenario,day,Plant dry mass (g dry)");
    expect(plants[4]).toBe("B,2,6");
  });
});

describe("fileSlug", () => {
  it("makes a safe file name", () => {
    expect(fileSlug("Crowded Reach, one year")).toBe("crowded-reach-one-year");
    expect(fileSlug("compare-Étang / 200 L")).toBe("compare-etang-200-l");
    expect(fileSlug("***")).toBe("fernwater-chart");
  });
});
