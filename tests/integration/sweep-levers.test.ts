/**
 * A sweep offers only settings that act on the scenario: a setting the scenario switches off
 * would draw a flat line that reads as "no effect" (the low-oxygen zones' capacity with the
 * zones off, a stated capacity for zones sized from rock and sand, the dose without cycling).
 */
import { describe, expect, it } from "vitest";
import { ScenarioSchema, simulate } from "../../models";
import { sweepLevers } from "~/features/sweeps/sweeps.server";

const ids = (input: unknown) => sweepLevers(ScenarioSchema.parse(input)).map((l) => l.id);

describe("sweep levers", () => {
  it("leave out the low-oxygen zones' settings while the zones are off", () => {
    const off = ids({ lowOxygen: { enabled: false } });
    expect(off.filter((id) => id.startsWith("lowOxygen."))).toEqual([]);
    expect(off).toContain("fish.feedGPerDay");
    // our own check: with the zones off, their capacity changes nothing
    const run = (cap: number) =>
      simulate(
        ScenarioSchema.parse({
          lowOxygen: { enabled: false, zoneSize: "fromCapacity", denitrificationCapacityMgNPerDay: cap },
          run: { lengthDays: 30 },
        }),
      ).keyFigures.nitrateEnd;
    expect(run(500)).toBe(run(5));
  });

  it("offer the capacity the zones are sized by, and anammox only when it is on", () => {
    const stated = ids({ lowOxygen: { enabled: true, zoneSize: "fromCapacity", anammoxEnabled: false } });
    expect(stated).toContain("lowOxygen.denitrificationCapacityMgNPerDay");
    expect(stated).not.toContain("lowOxygen.porousRockL");
    expect(stated).not.toContain("lowOxygen.anammoxCapacityMgNPerDay");
    const media = ids({ lowOxygen: { enabled: true, zoneSize: "fromMedia", anammoxEnabled: true } });
    expect(media).toEqual(
      expect.arrayContaining([
        "lowOxygen.porousRockL",
        "lowOxygen.sandBedAreaM2",
        "lowOxygen.anammoxCapacityMgNPerDay",
      ]),
    );
    expect(media).not.toContain("lowOxygen.denitrificationCapacityMgNPerDay");
  });

  it("leave out the ammonia dose while fishless cycling is off", () => {
    expect(ids({ fishlessCycling: { enabled: false } })).not.toContain("fishlessCycling.doseMgNPerL");
    expect(ids({ fishlessCycling: { enabled: true } })).toContain("fishlessCycling.doseMgNPerL");
  });
});
