/**
 * Migrate then validate: the one entry point for raw scenario objects (files, forms, the API,
 * the database).
 */
import { z } from "zod";
import { ScenarioVersionError, migrateScenario } from "./migrations";
import type { Scenario } from "./schema";
import { ScenarioSchema } from "./schema";

/**
 * Migrate then validate a raw scenario (e.g. JSON from a file, a form or the database).
 * Returns zod's SafeParse result; a newer schema version comes back as a failure on
 * `schemaVersion` with a message the keeper can act on.
 */
export function parseScenario(raw: unknown): z.ZodSafeParseResult<Scenario> {
  let migrated: unknown;
  try {
    migrated = migrateScenario(raw);
  } catch (e) {
    if (e instanceof ScenarioVersionError) {
      return {
        success: false,
        error: new z.ZodError([
          { code: "custom", path: ["schemaVersion"], message: e.message, input: e.version },
        ]) as z.ZodError<Scenario>,
      };
    }
    throw e;
  }
  return ScenarioSchema.safeParse(migrated);
}

/** One line per problem: "water.volumeL: Water volume must be at least 1 L". */
export function describeScenarioIssues(error: z.ZodError): string[] {
  return error.issues.map((i) => `${i.path.length ? i.path.join(".") : "(scenario)"}: ${i.message}`);
}
