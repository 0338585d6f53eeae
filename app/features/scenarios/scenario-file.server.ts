/**
 * Scenario files: what "Export" writes and "Import" reads. A file is JSON:
 * `{ "fernwater": "scenario", "schemaVersion": 1, "name": "…", "exportedAt": "…", "settings": { … } }`.
 * A bare settings object (as in models/examples/) is read too. Older schema versions are
 * migrated by the engine; a newer one is refused with a message saying so.
 */
import { z } from "zod";
import { parseScenario, type Scenario } from "~models";
import type { FieldErrors } from "~/utils/form-errors";

const FileSchema = z.object({
  fernwater: z.literal("scenario").optional(),
  schemaVersion: z.number().int().optional(),
  name: z.string().trim().min(1).max(120).optional(),
  settings: z.record(z.string(), z.unknown()),
});

export function scenarioFile(name: string, settings: Scenario, exportedAt: Date) {
  return {
    fernwater: "scenario",
    schemaVersion: settings.schemaVersion,
    name,
    exportedAt: exportedAt.toISOString(),
    settings,
  };
}

type ReadOk = { ok: true; name: string | null; scenario: Scenario };
type ReadFail = { ok: false; message: string; issues: FieldErrors };

export function readScenarioFile(text: string): ReadOk | ReadFail {
  let raw: unknown;
  try {
    raw = JSON.parse(text);
  } catch {
    return {
      ok: false,
      message: "The file is not valid JSON. Export a scenario from Fernwater and upload that file.",
      issues: {},
    };
  }
  if (raw === null || typeof raw !== "object" || Array.isArray(raw)) {
    return { ok: false, message: "The file does not hold a scenario object.", issues: {} };
  }
  const wrapped = FileSchema.safeParse(raw);
  let name: string | null = null;
  let settings: unknown = raw;
  if (wrapped.success) {
    name = wrapped.data.name ?? null;
    // The file's own version speaks for its settings.
    const version = wrapped.data.schemaVersion ?? wrapped.data.settings.schemaVersion;
    settings = version === undefined ? wrapped.data.settings : { ...wrapped.data.settings, schemaVersion: version };
  } else if ("settings" in raw) {
    return { ok: false, message: "The file's name or settings are malformed.", issues: {} };
  }
  const parsed = parseScenario(settings);
  if (!parsed.success) {
    const issues: FieldErrors = {};
    for (const i of parsed.error.issues) issues[i.path.map(String).join(".") || "(scenario)"] ??= i.message;
    const version = parsed.error.issues.find((i) => i.path[0] === "schemaVersion");
    return {
      ok: false,
      message: version ? version.message : "Some settings in the file are not valid; nothing was imported.",
      issues: version ? {} : issues,
    };
  }
  return { ok: true, name, scenario: parsed.data };
}
