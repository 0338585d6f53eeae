/**
 * A chart's series as a few strings instead of thousands of numbers: React Router's
 * turbo-stream encoding spends most of a results request on number arrays, while one
 * comma-joined string per column costs almost nothing to send and little to read back.
 */
import type { ChartSeries } from "~/utils/chart-data";

export type PackedSeries = {
  t: string;
  tan: string;
  nh3: string;
  no2: string;
  no3: string;
  plants: { id: string; name: string; massG: string }[];
  o2?: string;
  tanLongTerm?: string;
  tanShortTerm?: string;
};

const pack = (values: readonly number[]) => values.join(",");
const unpack = (text: string): number[] => (text === "" ? [] : text.split(",").map(Number));

export function packSeries(s: ChartSeries): PackedSeries {
  return {
    t: pack(s.t),
    tan: pack(s.tan),
    nh3: pack(s.nh3),
    no2: pack(s.no2),
    no3: pack(s.no3),
    plants: s.plants.map((p) => ({ id: p.id, name: p.name, massG: pack(p.massG) })),
    ...(s.o2 ? { o2: pack(s.o2) } : {}),
    ...(s.tanLongTerm ? { tanLongTerm: pack(s.tanLongTerm) } : {}),
    ...(s.tanShortTerm ? { tanShortTerm: pack(s.tanShortTerm) } : {}),
  };
}

/**
 * The series back as numbers. Each column is read on first use: a page rendered on the server
 * sends the chart as a stand-in (decision 0012), so there the columns are never read at all.
 */
export function unpackSeries(p: PackedSeries): ChartSeries {
  const series = {
    plants: p.plants.map((g) => lazyColumns({ id: g.id, name: g.name }, { massG: g.massG })),
  };
  return lazyColumns(series, {
    t: p.t,
    tan: p.tan,
    nh3: p.nh3,
    no2: p.no2,
    no3: p.no3,
    o2: p.o2,
    tanLongTerm: p.tanLongTerm,
    tanShortTerm: p.tanShortTerm,
  }) as ChartSeries;
}

/** Adds each packed column as a property read (and then kept) on first use; absent columns stay absent. */
function lazyColumns<T extends object, K extends string>(
  target: T,
  columns: Record<K, string | undefined>,
): T & Record<K, number[]> {
  for (const [key, text] of Object.entries<string | undefined>(columns)) {
    if (text === undefined) continue;
    let values: number[] | undefined;
    Object.defineProperty(target, key, { enumerable: true, get: () => (values ??= unpack(text)) });
  }
  return target as T & Record<K, number[]>;
}
