import { describe, expect, it } from "vitest";
import { ScenarioSchema, simulate } from "../../models/index";
import { sandDepthFactor, zoneCapacity } from "../../models/nitrogen/low-oxygen-zones";
import { bareTank, lastIndex } from "./helpers";

describe("low-oxygen zones", () => {
  it("remove no nitrate without organic carbon", () => {
    // Denitrifiers need an electron donor (Veraart et al. 2011; Metcalf & Eddy; docs/sources.md §8)
    const r = simulate(
      bareTank({
        water: { startNitrate: 10 },
        lowOxygen: { enabled: true, zoneSize: "fromCapacity", denitrificationCapacityMgNPerDay: 10000 },
        run: { lengthDays: 60 },
      }),
    );
    expect(r.budget.outputs.denitrificationN2).toBeLessThan(1);
  });

  it("work harder when the water holds less oxygen", () => {
    // Oxygen inhibits denitrification (Henze et al. ASM1, K_OH 0.2 mg/L, from memory; docs/sources.md §12)
    const run = (surfaceAgitation: "still" | "strong") =>
      simulate(
        bareTank({
          water: { startNitrate: 10, khDkh: 8, surfaceAgitation },
          fish: { feedGPerDay: 3, fractionEaten: 0.7 },
          filter: { turnoverPerHour: 0 },
          lowOxygen: { enabled: true, zoneSize: "fromCapacity", denitrificationCapacityMgNPerDay: 50 },
          run: { lengthDays: 30 },
        }),
      ).budget.outputs.denitrificationN2;
    expect(run("still")).toBeGreaterThan(1.2 * run("strong"));
  });

  it("are sized from rock and sand with a range that spans the published rates", () => {
    // Grommen et al. 2006 reactor rates (18–36 mg N/L/day) as the ceiling for rock; freshwater
    // sediment rates for sand (from memory; docs/sources.md §16)
    const s = ScenarioSchema.parse({
      lowOxygen: { enabled: true, porousRockL: 10, sandBedAreaM2: 0.5, sandBedDepthCm: 5, capacityEstimate: "high" },
    });
    const z = zoneCapacity(s)!;
    expect(z.sizedFrom).toBe("fromMedia");
    expect(z.lowMgNPerDay).toBeLessThan(z.typicalMgNPerDay);
    expect(z.typicalMgNPerDay).toBeLessThan(z.highMgNPerDay);
    expect(z.highMgNPerDay / z.lowMgNPerDay).toBeGreaterThan(10);
    expect(z.usedMgNPerDay).toBe(z.highMgNPerDay);
    // rock alone never beats a dedicated reactor of the same volume
    const rockOnly = zoneCapacity(
      ScenarioSchema.parse({
        lowOxygen: { enabled: true, porousRockL: 10, sandBedAreaM2: 0, capacityEstimate: "high" },
      }),
    )!;
    expect(rockOnly.highMgNPerDay).toBeLessThan(10 * 18);
    // a shallow bed has no anoxic layer; depth helps up to a few centimetres, not beyond
    expect(sandDepthFactor(0.5)).toBe(0);
    expect(sandDepthFactor(2)).toBeGreaterThan(0);
    expect(sandDepthFactor(10)).toBe(sandDepthFactor(20));
    expect(simulate(s).lowOxygenZones).toEqual(z);
  });

  it("say nothing when switched off", () => {
    expect(simulate(bareTank({ run: { lengthDays: 2 } })).lowOxygenZones).toBeNull();
  });

  it("a known capacity is used as stated", () => {
    const s = bareTank({
      lowOxygen: { enabled: true, zoneSize: "fromCapacity", denitrificationCapacityMgNPerDay: 42 },
    });
    expect(zoneCapacity(s)).toMatchObject({ lowMgNPerDay: 42, highMgNPerDay: 42, usedMgNPerDay: 42 });
    expect(lastIndex(simulate(s))).toBeGreaterThan(0);
  });
});
