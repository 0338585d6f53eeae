/**
 * Reading older scenario files: one step per schema version, applied in order, never touching
 * the input.
 */
import { SCHEMA_VERSION } from "./schema";

/** One migration step: takes a raw object of version `from` and returns version `from + 1`. */
export type Migration = (raw: Record<string, unknown>) => Record<string, unknown>;

const isObject = (v: unknown): v is Record<string, unknown> => v !== null && typeof v === "object" && !Array.isArray(v);

/**
 * Migrations keyed by the version they upgrade from.
 *
 * 1 → 2 (model v2: oxygen, carbon-limited low-oxygen zones). Version 1 stated low-oxygen zones
 * only as capacities, so a version 1 file that has a low-oxygen section keeps its capacities by
 * sizing its zones "fromCapacity" (version 2's default sizes them from rock and sand). Surface
 * movement and filter flow are new and take their defaults.
 */
const MIGRATIONS: Readonly<Record<number, Migration>> = {
  1: (raw) => {
    const out: Record<string, unknown> = { ...raw, schemaVersion: 2 };
    if (isObject(raw.lowOxygen)) out.lowOxygen = { ...raw.lowOxygen, zoneSize: "fromCapacity" };
    return out;
  },
};

/** Thrown by {@link migrateScenario}; {@link parseScenario} turns it into a zod issue. */
export class ScenarioVersionError extends Error {
  constructor(
    message: string,
    readonly version: unknown,
  ) {
    super(message);
    this.name = "ScenarioVersionError";
  }
}

/**
 * Bring a raw scenario object up to {@link SCHEMA_VERSION}. A missing version counts as current.
 * Does not mutate its input. Throws {@link ScenarioVersionError} for a newer or unreadable version.
 */
export function migrateScenario(
  raw: unknown,
  migrations: Readonly<Record<number, Migration>> = MIGRATIONS,
  target: number = SCHEMA_VERSION,
): unknown {
  if (raw === null || typeof raw !== "object" || Array.isArray(raw)) return raw;
  const obj = raw as Record<string, unknown>;
  if (obj.schemaVersion === undefined) return raw;
  const v = obj.schemaVersion;
  if (typeof v !== "number" || !Number.isInteger(v) || v < 1) {
    throw new ScenarioVersionError(`The schema version must be a whole number from 1 to ${target}.`, v);
  }
  if (v > target) {
    throw new ScenarioVersionError(
      `This file was made by a newer version of Fernwater (schema ${v}); this version reads up to ${target}.`,
      v,
    );
  }
  let cur: Record<string, unknown> = { ...obj };
  for (let from = v; from < target; from++) {
    const step = migrations[from];
    if (!step) {
      throw new ScenarioVersionError(`There is no way to read schema ${from} files; this version reads ${target}.`, v);
    }
    cur = step(cur);
  }
  return cur;
}
