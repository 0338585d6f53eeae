/**
 * Settings that do not apply are hidden (issue 12, item 12): the trim interval under "when
 * full", dosing while fishless cycling is off. Common practice, no source.
 */
import { describe, expect, it } from "vitest";
import { listScenarioFields } from "~models";
import { fieldApplies, isSwitchField } from "~/features/scenarios/field-visibility";

const form = (values: Record<string, string>) => (name: string) => values[name];

describe("which setup fields apply", () => {
  it("names only fields the scenario has", () => {
    const keys = new Set(
      listScenarioFields().map((f) => f.key.replace(/\.\*\./, ".0.").replace(/^plants\.\*/, "plants.0")),
    );
    for (const name of [
      "plants.0.trim.rule",
      "plants.0.trim.everyDays",
      "plants.0.trim.fullAtFraction",
      "plants.0.trim.trimToFraction",
      "fishlessCycling.enabled",
      "fishlessCycling.doseMgNPerL",
      "fishlessCycling.doseIntervalDays",
      "fishlessCycling.stopRule",
      "fishlessCycling.stopAfterDays",
    ])
      expect(keys, name).toContain(name);
  });

  it("hides the trim interval when trimming is “when full”, and shows it for the fixed schedule", () => {
    expect(fieldApplies("plants.0.trim.everyDays", form({ "plants.0.trim.rule": "whenFull" }))).toBe(false);
    expect(fieldApplies("plants.0.trim.fullAtFraction", form({ "plants.0.trim.rule": "whenFull" }))).toBe(true);
    expect(fieldApplies("plants.2.trim.everyDays", form({ "plants.2.trim.rule": "everyDays" }))).toBe(true);
    expect(fieldApplies("plants.2.trim.fullAtFraction", form({ "plants.2.trim.rule": "everyDays" }))).toBe(false);
    expect(fieldApplies("plants.1.trim.trimToFraction", form({ "plants.1.trim.rule": "none" }))).toBe(false);
    // Each group follows its own rule.
    expect(
      fieldApplies(
        "plants.1.trim.everyDays",
        form({ "plants.0.trim.rule": "everyDays", "plants.1.trim.rule": "whenFull" }),
      ),
    ).toBe(false);
  });

  it("hides the dosing fields while fishless cycling is off", () => {
    const off = form({ "fishlessCycling.enabled": "false", "fishlessCycling.stopRule": "afterDays" });
    for (const f of ["doseMgNPerL", "doseIntervalDays", "stopRule", "stopAfterDays"])
      expect(fieldApplies(`fishlessCycling.${f}`, off), f).toBe(false);
    expect(fieldApplies("fishlessCycling.enabled", off)).toBe(true);
    const on = form({ "fishlessCycling.enabled": "true", "fishlessCycling.stopRule": "whenCycled" });
    expect(fieldApplies("fishlessCycling.doseMgNPerL", on)).toBe(true);
    expect(fieldApplies("fishlessCycling.stopAfterDays", on)).toBe(false);
    expect(
      fieldApplies(
        "fishlessCycling.stopAfterDays",
        form({ "fishlessCycling.enabled": "true", "fishlessCycling.stopRule": "afterDays" }),
      ),
    ).toBe(true);
  });

  it("shows the low-oxygen zones' fields only while the zones are on, and only those of how they are sized", () => {
    const off = form({
      "lowOxygen.enabled": "false",
      "lowOxygen.zoneSize": "fromMedia",
      "lowOxygen.anammoxEnabled": "true",
    });
    for (const f of [
      "zoneSize",
      "porousRockL",
      "sandBedAreaM2",
      "denitrificationCapacityMgNPerDay",
      "anammoxEnabled",
      "anammoxCapacityMgNPerDay",
    ])
      expect(fieldApplies(`lowOxygen.${f}`, off), f).toBe(false);
    expect(fieldApplies("lowOxygen.enabled", off)).toBe(true);
    const media = form({
      "lowOxygen.enabled": "true",
      "lowOxygen.zoneSize": "fromMedia",
      "lowOxygen.anammoxEnabled": "false",
    });
    expect(fieldApplies("lowOxygen.porousRockL", media)).toBe(true);
    expect(fieldApplies("lowOxygen.capacityEstimate", media)).toBe(true);
    expect(fieldApplies("lowOxygen.denitrificationCapacityMgNPerDay", media)).toBe(false);
    expect(fieldApplies("lowOxygen.anammoxCapacityMgNPerDay", media)).toBe(false);
    const stated = form({
      "lowOxygen.enabled": "true",
      "lowOxygen.zoneSize": "fromCapacity",
      "lowOxygen.anammoxEnabled": "true",
    });
    expect(fieldApplies("lowOxygen.denitrificationCapacityMgNPerDay", stated)).toBe(true);
    expect(fieldApplies("lowOxygen.sandBedDepthCm", stated)).toBe(false);
    expect(fieldApplies("lowOxygen.anammoxCapacityMgNPerDay", stated)).toBe(true);
    for (const f of ["enabled", "zoneSize", "anammoxEnabled"]) expect(isSwitchField(`lowOxygen.${f}`), f).toBe(true);
  });

  it("leaves every other field shown, and knows which fields are switches", () => {
    expect(fieldApplies("water.volumeL", form({}))).toBe(true);
    expect(isSwitchField("plants.3.trim.rule")).toBe(true);
    expect(isSwitchField("fishlessCycling.enabled")).toBe(true);
    expect(isSwitchField("water.volumeL")).toBe(false);
  });
});
