/**
 * Stored settings are read, and their run found by a hash of them, on every results view, so
 * the parse and the hash are kept by the settings' text (issue 15, item 5). A kept parse must
 * read exactly as a fresh one, no caller may change what the next caller gets, and the hash
 * must still ignore key order and see every value.
 */
import { describe, expect, it } from "vitest";
import { parseScenario, ScenarioSchema } from "~models";
import { readStoredSettings, settingsHash } from "~/features/runs/simulation.server";

const stored = () => JSON.parse(JSON.stringify(ScenarioSchema.parse({ run: { lengthDays: 90 } }))) as unknown;

describe("readStoredSettings", () => {
  it("reads a second time exactly as the schema parses, in a copy of its own", () => {
    const first = readStoredSettings(stored())!;
    const fresh = parseScenario(stored());
    expect(fresh.success).toBe(true);
    expect(first).toEqual(fresh.data);
    first.water.volumeL = 1;
    first.run.lengthDays = 1;
    const second = readStoredSettings(stored())!;
    expect(second).not.toBe(first);
    expect(second).toEqual(fresh.data);
  });

  it("reads other settings as themselves, not as a kept parse", () => {
    const bigger = stored() as { water: { volumeL: number } };
    bigger.water.volumeL = 240;
    expect(readStoredSettings(stored())!.water.volumeL).not.toBe(240);
    expect(readStoredSettings(bigger)!.water.volumeL).toBe(240);
  });

  it("reads settings that no longer validate as null every time", () => {
    const broken = { ...(stored() as object), water: { volumeL: -5 } };
    expect(readStoredSettings(broken)).toBeNull();
    expect(readStoredSettings(broken)).toBeNull();
    expect(readStoredSettings(undefined)).toBeNull();
  });
});

describe("settingsHash", () => {
  it("is the same for the same settings whatever their key order, and another for any changed value", () => {
    const settings = ScenarioSchema.parse({ run: { lengthDays: 90 } });
    const reordered = Object.fromEntries(Object.entries(settings).reverse()) as typeof settings;
    expect(JSON.stringify(reordered)).not.toBe(JSON.stringify(settings));
    expect(settingsHash(reordered)).toBe(settingsHash(settings));
    expect(settingsHash(settings)).toBe(settingsHash(structuredClone(settings)));
    expect(settingsHash({ ...settings, water: { ...settings.water, volumeL: 121 } })).not.toBe(settingsHash(settings));
    expect(settingsHash({ ...settings, run: { ...settings.run, lengthDays: 91 } })).not.toBe(settingsHash(settings));
  });
});
