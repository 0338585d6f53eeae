/**
 * Long runs are stored compactly: the series' JSON deflated (a two-year run at hourly points is
 * ~3.2 MB of JSON, ~0.9 MB packed). Short runs stay plain JSON, cheaper to read back. Packing
 * happens where the run was made — in the engine worker for long runs — or off the event loop
 * (zlib's thread pool), never as a long synchronous step on the request thread.
 */
import { promisify } from "node:util";
import zlib from "node:zlib";
import type { Series, SimulationResult } from "~models";

/** Series JSON above this size is stored packed. */
const PACK_ABOVE_BYTES = 64 * 1024;

/** What the `series` column holds for a packed run (the data is in series_packed). */
export const PACKED_MARKER = { packed: "deflate-raw" } as const;

/** A finished run ready to store: the series as it is, or packed. */
export type StorableRun = Omit<SimulationResult, "series"> &
  ({ series: Series; seriesPacked: null } | { series: null; seriesPacked: Uint8Array });

/** In a worker (or for small runs): packs synchronously when the series is long. */
export function toStorableSync(result: SimulationResult): StorableRun {
  const json = JSON.stringify(result.series);
  if (json.length <= PACK_ABOVE_BYTES) return { ...result, seriesPacked: null };
  return { ...result, series: null, seriesPacked: zlib.deflateRawSync(json, { level: 6 }) };
}

const deflateRaw = promisify(zlib.deflateRaw);

/** On the request thread: the deflating runs on zlib's own threads. */
export async function toStorable(result: SimulationResult): Promise<StorableRun> {
  const json = JSON.stringify(result.series);
  if (json.length <= PACK_ABOVE_BYTES) return { ...result, seriesPacked: null };
  return { ...result, series: null, seriesPacked: await deflateRaw(json, { level: 6 }) };
}

/** The series of a stored run row. */
export function readStoredSeries(series: unknown, packed: Uint8Array | null): Series {
  if (packed) return JSON.parse(zlib.inflateRawSync(packed).toString("utf8")) as Series;
  return series as Series;
}

/** Bytes a run takes in the database, as the quota counts them. */
export function storedBytes(run: StorableRun): number {
  const text = (v: unknown) => Buffer.byteLength(JSON.stringify(v));
  return (
    (run.seriesPacked ? run.seriesPacked.byteLength + text(PACKED_MARKER) : text(run.series)) +
    text(run.events) +
    text(run.keyFigures) +
    text(run.budget) +
    text(run.stats) +
    text({ warnings: run.warnings, lowOxygenZones: run.lowOxygenZones, ammoniaCriteria: run.ammoniaCriteria })
  );
}
