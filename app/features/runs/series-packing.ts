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

export function unpackSeries(p: PackedSeries): ChartSeries {
  return {
    t: unpack(p.t),
    tan: unpack(p.tan),
    nh3: unpack(p.nh3),
    no2: unpack(p.no2),
    no3: unpack(p.no3),
    plants: p.plants.map((g) => ({ id: g.id, name: g.name, massG: unpack(g.massG) })),
    ...(p.o2 !== undefined ? { o2: unpack(p.o2) } : {}),
    ...(p.tanLongTerm !== undefined ? { tanLongTerm: unpack(p.tanLongTerm) } : {}),
    ...(p.tanShortTerm !== undefined ? { tanShortTerm: unpack(p.tanShortTerm) } : {}),
  };
}
