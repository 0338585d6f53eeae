import { readFileSync, readdirSync } from "node:fs";
import { join } from "node:path";
import { describe, expect, it } from "vitest";
import {
  GROWTH_FORM_DEFAULTS,
  PRESETS,
  SCHEMA_VERSION,
  ScenarioSchema,
  listParameters,
  listScenarioFields,
  migrateScenario,
  parseScenario,
  simulate,
} from "../../models/index";

describe("scenario schema", () => {
  it("an empty object gives a valid, realistic one-tank scenario", () => {
    // common practice, no source: a 100 L planted community tank
    const s = ScenarioSchema.parse({});
    expect(s.schemaVersion).toBe(SCHEMA_VERSION);
    expect(s.water.volumeL).toBe(100);
    expect(s.plants).toHaveLength(1);
    expect(s.targets.nitrateHigh).toBeCloseTo(20 * 0.2259, 3); // 20 mg/L as NO3 (docs/sources.md §9)
    const r = simulate(s);
    expect(r.budget.imbalanceRelative).toBeLessThan(1e-9);
    // a healthy default tank: no ammonia or nitrite trouble, nitrate inside or near the band
    expect(r.keyFigures.peakFreeNh3.value).toBeLessThan(0.02); // docs/sources.md §9, common practice, no source
    expect(r.keyFigures.nitrateEnd).toBeLessThan(s.targets.nitrateHigh);
  });

  it("explains bad fields in a keeper's words, with paths", () => {
    // our own wording
    const r = parseScenario({ water: { volumeL: -3, pH: 12 }, fish: { fractionEaten: "most" } });
    expect(r.success).toBe(false);
    if (r.success) return;
    const byPath = Object.fromEntries(r.error.issues.map((i) => [i.path.join("."), i.message]));
    expect(byPath["water.volumeL"]).toBe("Water volume must be at least 1 L");
    expect(byPath["water.pH"]).toBe("pH must be at most 10");
    expect(byPath["fish.fractionEaten"]).toBe("Share of food eaten must be a number");
  });

  it("checks relations between fields", () => {
    const r = parseScenario({
      plants: [
        { id: "a", startMassG: 50, maxMassG: 10 },
        { id: "a", trim: { rule: "whenFull", fullAtFraction: 0.5, trimToFraction: 0.7 } },
      ],
      targets: { nitrateLow: 10, nitrateHigh: 5 },
    });
    expect(r.success).toBe(false);
    if (r.success) return;
    const paths = r.error.issues.map((i) => i.path.join("."));
    expect(paths).toEqual(
      expect.arrayContaining([
        "plants.0.startMassG",
        "plants.1.trim.trimToFraction",
        "targets.nitrateLow",
        "plants.1.id",
      ]),
    );
  });

  it("refuses more than 12 plant groups and runs longer than two years", () => {
    const plants = Array.from({ length: 13 }, (_, i) => ({ id: `g${i}` }));
    expect(parseScenario({ plants }).success).toBe(false);
    expect(parseScenario({ run: { lengthDays: 731 } }).success).toBe(false);
  });
});

describe("versions", () => {
  it("refuses a file from a newer version with a clear message", () => {
    const r = parseScenario({ schemaVersion: 3 });
    expect(r.success).toBe(false);
    if (r.success) return;
    expect(r.error.issues[0].path).toEqual(["schemaVersion"]);
    expect(r.error.issues[0].message).toBe(
      "This file was made by a newer version of Fernwater (schema 3); this version reads up to 2.",
    );
  });

  it("reads a file without a version as current, and rejects nonsense versions", () => {
    expect(parseScenario({}).success).toBe(true);
    expect(parseScenario({ schemaVersion: 1 }).success).toBe(true);
    expect(parseScenario({ schemaVersion: "one" }).success).toBe(false);
  });

  it("applies migrations step by step without touching the input", () => {
    // our own worked example: a pretend version 2 that renamed water.volumeL to water.litres
    const v1 = Object.freeze({ schemaVersion: 1, water: Object.freeze({ volumeL: 80 }) });
    const migrated = migrateScenario(
      v1,
      {
        1: (raw) => {
          const water = raw.water as { volumeL: number };
          return { ...raw, schemaVersion: 2, water: { litres: water.volumeL } };
        },
      },
      2,
    );
    expect(migrated).toEqual({ schemaVersion: 2, water: { litres: 80 } });
    expect(v1.water.volumeL).toBe(80);
    expect(() => migrateScenario({ schemaVersion: 1 }, {}, 2)).toThrow(/no way to read schema 1/);
  });
});

describe("reading version 1 files", () => {
  it("keeps a version 1 file's low-oxygen capacities and fills the new settings with defaults", () => {
    // our own worked example of the 1 → 2 migration (docs/engine.md, scenario format)
    const v1 = Object.freeze({
      schemaVersion: 1,
      lowOxygen: Object.freeze({ enabled: true, denitrificationCapacityMgNPerDay: 7 }),
    });
    const r = parseScenario(v1);
    expect(r.success).toBe(true);
    if (!r.success) return;
    expect(r.data.schemaVersion).toBe(2);
    expect(r.data.lowOxygen).toMatchObject({
      enabled: true,
      zoneSize: "fromCapacity",
      denitrificationCapacityMgNPerDay: 7,
    });
    expect(r.data.water.surfaceAgitation).toBe("rippling");
    expect(r.data.filter.turnoverPerHour).toBe(4);
    expect(v1.lowOxygen).toEqual({ enabled: true, denitrificationCapacityMgNPerDay: 7 });
    // a version 1 file without the section gets version 2's defaults (zones sized from media)
    const bare = parseScenario({ schemaVersion: 1 });
    expect(bare.success && bare.data.lowOxygen.zoneSize).toBe("fromMedia");
  });

  it("reads every example file and every preset", () => {
    const dir = join(__dirname, "../../models/examples");
    const files = readdirSync(dir).filter((f) => f.endsWith(".json"));
    expect(files.length).toBeGreaterThan(0);
    for (const f of files) expect(parseScenario(JSON.parse(readFileSync(join(dir, f), "utf8"))).success, f).toBe(true);
    for (const p of PRESETS) expect(parseScenario(p.scenario).success, p.id).toBe(true);
  });
});

describe("form metadata", () => {
  const fields = listScenarioFields();

  it("lists every leaf with a label, hint and quantity", () => {
    expect(fields.length).toBeGreaterThan(50);
    for (const f of fields) {
      expect(f.meta.label.length).toBeGreaterThan(0);
      expect(f.meta.hint.length).toBeGreaterThan(0);
      expect(f.meta.quantity).toBeTruthy();
    }
  });

  it("gives bounds, defaults and options", () => {
    const byKey = Object.fromEntries(fields.map((f) => [f.key, f]));
    expect(byKey["water.volumeL"]).toMatchObject({ kind: "number", min: 1, max: 10000, defaultValue: 100 });
    expect(byKey["water.volumeL"].meta).toMatchObject({ label: "Water volume", quantity: "volume", unit: "L" });
    expect(byKey["water.startNitrate"].meta.quantity).toBe("nitrate");
    expect(byKey["fish.feedsPerDay"].kind).toBe("integer");
    expect(byKey["plants.*.growthForm"].options).toEqual(["stem", "floating", "rosette", "moss", "custom"]);
    expect(byKey["plants.*.trim.rule"].options).toEqual(["none", "whenFull", "everyDays"]);
    expect(byKey["filter.establishedAtStart"]).toMatchObject({ kind: "boolean", defaultValue: true });
    expect(byKey["multipliers.feedLoad"]).toMatchObject({ min: 0.1, max: 10, defaultValue: 1 });
    // the settings new in version 2 carry the same metadata
    expect(byKey["water.surfaceAgitation"]).toMatchObject({ kind: "enum", defaultValue: "rippling" });
    expect(byKey["water.surfaceAgitation"].meta.optionLabels?.strong).toMatch(/air stone/);
    expect(byKey["filter.turnoverPerHour"]).toMatchObject({ kind: "number", min: 0, max: 30, defaultValue: 4 });
    expect(byKey["lowOxygen.porousRockL"]).toMatchObject({ min: 0, max: 500, defaultValue: 2 });
    expect(byKey["lowOxygen.porousRockL"].meta.quantity).toBe("volume");
    expect(byKey["lowOxygen.sandBedDepthCm"].meta.unit).toBe("cm");
    expect(byKey["lowOxygen.capacityEstimate"].options).toEqual(["low", "typical", "high"]);
  });
});

describe("parameters and growth forms", () => {
  it("every default parameter names its source", () => {
    const params = listParameters();
    expect(params.length).toBeGreaterThan(60);
    for (const p of params) expect(p.source.trim().length, p.key).toBeGreaterThan(5);
  });

  it("floating plants grow within the published duckweed range", () => {
    // Ziegler et al. 2015: relative growth rate 0.153–0.519 /d
    const r = GROWTH_FORM_DEFAULTS.floating.growthRatePerDay.value;
    expect(r).toBeGreaterThanOrEqual(0.153);
    expect(r).toBeLessThanOrEqual(0.519);
  });

  it("tissue nitrogen sits in the usual 2–4 % of dry mass", () => {
    // Duarte 1992 (from memory)
    for (const form of Object.values(GROWTH_FORM_DEFAULTS)) {
      expect(form.nitrogenContent.value).toBeGreaterThanOrEqual(0.02);
      expect(form.nitrogenContent.value).toBeLessThanOrEqual(0.04);
    }
  });
});
