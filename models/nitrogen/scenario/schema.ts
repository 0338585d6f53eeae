/**
 * The scenario: everything a keeper describes about one tank, validated by zod 4.
 *
 * Canonical units inside (convert at the edges with models/units.ts):
 * volume litres; temperature °C; dissolved nitrogen mg N/L (TAN, nitrite-N, nitrate-N);
 * pools mg N; feed g/day; plant dry mass g; KH dKH; time days.
 *
 * Every leaf is built with the field kit (./field-kit.ts), which records its label, hint, unit,
 * bounds and default for the form; see listScenarioFields (./fields.ts).
 */
import { z } from "zod";
import {
  FilterSchema,
  FishlessCyclingSchema,
  LowOxygenSchema,
  MaintenanceSchema,
  MultipliersSchema,
  RunSchema,
  TapWaterSchema,
  TargetsSchema,
} from "./care-sections";
import { literal } from "./field-kit";
import { FishSchema, PlantGroupSchema, WaterSchema } from "./tank-sections";

/** Current scenario file format. Bump it and add a migration (./migrations.ts) when a field changes meaning. */
export const SCHEMA_VERSION = 2;

const MAX_PLANT_GROUPS = 12;

export const ScenarioSchema = z
  .object({
    schemaVersion: literal(
      SCHEMA_VERSION,
      { label: "Schema version", hint: "File format version." },
      `Schema version must be ${SCHEMA_VERSION}`,
    ),
    water: WaterSchema.prefault({}),
    fish: FishSchema.prefault({}),
    plants: z
      .array(PlantGroupSchema, { error: "Plants must be a list of plant groups" })
      .max(MAX_PLANT_GROUPS, { error: `At most ${MAX_PLANT_GROUPS} plant groups` })
      .default(() => [PlantGroupSchema.parse({ id: "stems", name: "Stem plants" })]),
    filter: FilterSchema.prefault({}),
    maintenance: MaintenanceSchema.prefault({}),
    tapWater: TapWaterSchema.prefault({}),
    lowOxygen: LowOxygenSchema.prefault({}),
    run: RunSchema.prefault({}),
    fishlessCycling: FishlessCyclingSchema.prefault({}),
    targets: TargetsSchema.prefault({}),
    multipliers: MultipliersSchema.prefault({}),
  })
  .superRefine((s, ctx) => {
    const seen = new Set<string>();
    s.plants.forEach((g, i) => {
      if (seen.has(g.id)) {
        ctx.addIssue({
          code: "custom",
          path: ["plants", i, "id"],
          message: `Two plant groups share the id "${g.id}"; give each group its own id`,
        });
      }
      seen.add(g.id);
    });
    if (s.water.phFollowsKh && s.water.khDkh <= 0) {
      ctx.addIssue({
        code: "custom",
        path: ["water", "khDkh"],
        message: "pH can only follow KH if KH at the start is above 0 dKH",
      });
    }
  });

/** A validated scenario with every default filled in (canonical units). */
export type Scenario = z.output<typeof ScenarioSchema>;
/** What a caller may pass in: any field may be left out and gets its default. */
export type ScenarioInput = z.input<typeof ScenarioSchema>;
export type PlantGroup = Scenario["plants"][number];
