import fc from "fast-check";
import { all, create } from "mathjs";
import { describe, expect, it } from "vitest";
import {
  CANONICAL_UNITS,
  UNITS,
  fromCanonical,
  fromDisplay,
  speciesFactor,
  toCanonical,
  toDisplay,
  unitLabel,
  unitSymbol,
  type ConvertibleQuantity,
  type DisplayUnits,
} from "../../models/units";

const rel = (a: number, b: number) => Math.abs(a - b) / Math.abs(b);

describe("unit conversions", () => {
  it("50 mg/L nitrate as NO3 is 11.29 mg/L as N", () => {
    // WHO Guidelines for Drinking-water Quality (4th ed.), molar masses (docs/sources.md §3)
    expect(rel(toCanonical("nitrate", 50, "asNO3"), 11.29)).toBeLessThan(0.001);
    expect(fromCanonical("nitrate", toCanonical("nitrate", 50, "asNO3"), "asNO3")).toBeCloseTo(50, 10);
  });

  it("10 mg/L nitrate as N is 44.3 mg/L as NO3", () => {
    // US EPA MCL (40 CFR 141.62) (docs/sources.md §3)
    expect(fromCanonical("nitrate", 10, "asNO3")).toBeCloseTo(44.3, 1);
  });

  it("3 mg/L nitrite as NO2 is 0.913 mg/L as N", () => {
    // WHO Guidelines for Drinking-water Quality (4th ed.); factor 0.30447 computed from atomic weights (docs/sources.md §0)
    expect(toCanonical("nitrite", 3, "asNO2")).toBeCloseTo(0.913, 3);
  });

  it("ammonia as NH4 and as NH3", () => {
    // NH4+→N ×0.77648; NH3→N ×0.82244 (computed from atomic weights, docs/sources.md §0)
    expect(toCanonical("ammonia", 1, "asNH4")).toBeCloseTo(0.77648, 4);
    expect(toCanonical("ammonia", 1, "asNH3")).toBeCloseTo(0.82244, 4);
    expect(fromCanonical("ammonia", 0.82244, "asNH3")).toBeCloseTo(1, 4);
  });

  it("a US gallon is 3.785411784 L", () => {
    // NIST SP 811 (docs/sources.md §3)
    expect(toCanonical("volume", 1, "usgal")).toBeCloseTo(3.785411784, 9);
    expect(fromCanonical("volume", 3.785411784, "usgal")).toBeCloseTo(1, 12);
  });

  it("an imperial gallon is 4.54609 L", () => {
    // NIST SP 811, from memory (docs/sources.md §3)
    expect(toCanonical("volume", 1, "impgal")).toBeCloseTo(4.54609, 9);
  });

  it("1 dKH is 17.848 mg/L as CaCO3", () => {
    // computed from the definition 10 mg CaO/L (docs/sources.md §3)
    expect(fromCanonical("kh", 1, "mgCaCO3")).toBeCloseTo(17.848, 3);
    expect(toCanonical("kh", 17.848, "mgCaCO3")).toBeCloseTo(1, 4);
  });

  it("77 °F is 25 °C and water freezes at 32 °F", () => {
    // definition of the Fahrenheit scale, from memory
    expect(toCanonical("temperature", 77, "F")).toBeCloseTo(25, 10);
    expect(fromCanonical("temperature", 0, "F")).toBeCloseTo(32, 10);
  });

  it("gallons and degrees Fahrenheit agree with mathjs's unit definitions", () => {
    // mathjs 15 (an outside reference library): its "gallon" is the US gallon; the imperial one is defined as NIST gives it
    const math = create(all, {});
    math.createUnit("imperialGallon", "4.54609 liter");
    const mathVolume = { L: "liter", usgal: "gallon", impgal: "imperialGallon" } as const;
    fc.assert(
      fc.property(
        fc.constantFrom("L", "usgal", "impgal" as const),
        fc.double({ min: 0, max: 5000, noNaN: true }),
        (unit, v) => {
          const reference = math.unit(v, mathVolume[unit]).toNumber("liter");
          expect(Math.abs(toCanonical("volume", v, unit) - reference)).toBeLessThanOrEqual(
            1e-9 * Math.max(1, reference),
          );
        },
      ),
      { numRuns: 100 },
    );
    fc.assert(
      fc.property(fc.double({ min: -40, max: 120, noNaN: true }), (f) => {
        const reference = math.unit(f, "degF").toNumber("degC");
        expect(Math.abs(toCanonical("temperature", f, "F") - reference)).toBeLessThanOrEqual(1e-9);
      }),
      { numRuns: 100 },
    );
  });

  it("every conversion round-trips", () => {
    // our own property: both directions are inverses
    const quantities = Object.keys(UNITS) as ConvertibleQuantity[];
    fc.assert(
      fc.property(
        fc.constantFrom(...quantities),
        fc.nat(10),
        fc.double({ min: 0, max: 1000, noNaN: true }),
        (q, k, v) => {
          const ids = Object.keys(UNITS[q]);
          const unit = ids[k % ids.length];
          const back = fromCanonical(q, toCanonical(q, v, unit), unit);
          expect(Math.abs(back - v)).toBeLessThanOrEqual(1e-9 * Math.max(1, Math.abs(v)));
        },
      ),
      { numRuns: 200 },
    );
  });

  it("names units for display and refuses unknown ones", () => {
    // common practice, no source
    expect(unitSymbol("nitrate", "asNO3")).toBe("mg/L NO3");
    expect(() => toCanonical("volume", 1, "barrel")).toThrow(/Unknown unit/);
    expect(() => toCanonical("volume", 1, "toString")).toThrow(/Unknown unit/);
  });
});

describe("display units", () => {
  const imperial: DisplayUnits = {
    volume: "usgal",
    temperature: "F",
    nitrate: "asNO3",
    nitrite: "asNO2",
    ammonia: "asNH3",
    kh: "mgCaCO3",
  };

  it("a field's quantity converts both ways, a fraction shows as a percentage, anything else as it is", () => {
    // NIST SP 811 and the Fahrenheit scale's definition (docs/sources.md §3); percentages: common practice, no source
    expect(toDisplay("volume", 3.785411784, imperial)).toBeCloseTo(1, 12);
    expect(toDisplay("temperature", 25, imperial)).toBeCloseTo(77, 10);
    expect(toDisplay("fraction", 0.25, imperial)).toBe(25);
    expect(toDisplay("mass", 12, imperial)).toBe(12);
    expect(fromDisplay("fraction", 30, imperial)).toBeCloseTo(0.3, 12);
    expect(fromDisplay("temperature", 77, imperial)).toBeCloseTo(25, 10);
  });

  it("species factors are the molar-mass factors", () => {
    // docs/sources.md §0: 1 mg/L NO3-N is 4.427 mg/L as NO3
    expect(speciesFactor("nitrate", imperial)).toBeCloseTo(1 / 0.2259, 2);
    expect(speciesFactor("nitrate", CANONICAL_UNITS)).toBe(1);
  });

  it("one label per quantity: the person's unit, a rate keeps its /day, a fraction is %", () => {
    // common practice, no source
    expect(unitLabel("volume", imperial, "L")).toBe("US gal");
    expect(unitLabel("volume", imperial, "L/day")).toBe("US gal/day");
    expect(unitLabel("ammonia", CANONICAL_UNITS, "mg N/L")).toBe("mg/L NH3-N");
    expect(unitLabel("fraction", imperial)).toBe("%");
    expect(unitLabel("mass", imperial, "g/day")).toBe("g/day");
  });
});
