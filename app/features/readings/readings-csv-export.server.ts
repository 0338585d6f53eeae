/**
 * Readings written as CSV: the export (every stored reading in the person's units) and the
 * template (the header and three example rows). Same column names as an upload reads.
 */
import { fromCanonical } from "~models/units";
import { exportHeader } from "~/features/readings/readings-csv-columns.server";
import {
  MEASURE_KEYS,
  MEASURES,
  type MeasureKey,
  type MeasureUnits,
  type ReadingRow,
} from "~/features/readings/readings.server";
import { toCsv, type CsvCell } from "~/utils/csv";
import { formatDateTime } from "~/utils/dates";

function displayValue(key: MeasureKey, value: number | null, units: MeasureUnits): number | null {
  if (value === null) return null;
  const q = MEASURES[key].quantity;
  const v = q ? fromCanonical(q, value, units[key as Exclude<MeasureKey, "ph">]) : value;
  return Number(v.toPrecision(6));
}

/** Readings as CSV in `units` (text cells that look like formulas are neutralised by toCsv). */
export function readingsCsv(rows: readonly ReadingRow[], units: MeasureUnits): string {
  const header: CsvCell[] = exportHeader(units);
  return toCsv([
    header,
    ...rows.map((r) => [
      formatDateTime(r.takenAt.getTime()).replace(" ", "T"),
      ...MEASURE_KEYS.map((k) => displayValue(k, r[k], units)),
      r.note,
    ]),
  ]);
}

/**
 * A template in `units`: the header and three example rows (our own invented numbers) dated the
 * days before `today`, to overwrite with real results.
 */
export function templateCsv(units: MeasureUnits, today: number): string {
  const day = 86_400_000;
  const d0 = today - (today % day);
  const example = (daysAgo: number, canonical: Record<MeasureKey, number | null>, note: string): CsvCell[] => [
    formatDateTime(d0 - daysAgo * day + 8.5 * 3_600_000).replace(" ", "T"),
    ...MEASURE_KEYS.map((k) => {
      const v = displayValue(k, canonical[k], units);
      return v === null ? null : Number(v.toPrecision(3));
    }),
    note,
  ];
  return toCsv([
    exportHeader(units),
    example(7, { tan: 0, nitrite: 0, nitrate: 3.39, ph: 7.2, kh: 5, temperatureC: 25 }, "before the water change"),
    example(4, { tan: 0.04, nitrite: 0, nitrate: 2.71, ph: 7.2, kh: 5, temperatureC: 25 }, ""),
    example(1, { tan: null, nitrite: null, nitrate: 3.16, ph: null, kh: null, temperatureC: null }, "nitrate only"),
  ]);
}
