import fc from "fast-check";
import { describe, expect, it } from "vitest";
import {
  UNIT_OPTIONS,
  ammoniaFromN,
  ammoniaToN,
  fromCanonical,
  fromCelsius,
  fromDkh,
  fromLitres,
  nitrateFromN,
  nitrateToN,
  nitriteToN,
  toCanonical,
  toCelsius,
  toDkh,
  toLitres,
  unitSymbol,
} from "../../models/units";

const rel = (a: number, b: number) => Math.abs(a - b) / Math.abs(b);

describe("unit conversions", () => {
  it("50 mg/L nitrate as NO3 is 11.29 mg/L as N", () => {
    // WHO Guidelines for Drinking-water Quality (4th ed.), molar masses
    expect(rel(nitrateToN(50, "asNO3"), 11.29)).toBeLessThan(0.001);
    expect(nitrateFromN(nitrateToN(50, "asNO3"), "asNO3")).toBeCloseTo(50, 10);
  });

  it("10 mg/L nitrate as N is 44.3 mg/L as NO3", () => {
    // US EPA MCL (40 CFR 141.62)
    expect(nitrateFromN(10, "asNO3")).toBeCloseTo(44.3, 1);
  });

  it("3 mg/L nitrite as NO2 is 0.913 mg/L as N", () => {
    // WHO Guidelines for Drinking-water Quality (4th ed.); factor 0.30447 computed from atomic weights
    expect(nitriteToN(3, "asNO2")).toBeCloseTo(0.913, 3);
  });

  it("ammonia as NH4 and as NH3", () => {
    // NH4+→N ×0.77648; NH3→N ×0.82244 (computed from atomic weights, docs/sources.md)
    expect(ammoniaToN(1, "asNH4")).toBeCloseTo(0.77648, 4);
    expect(ammoniaToN(1, "asNH3")).toBeCloseTo(0.82244, 4);
    expect(ammoniaFromN(0.82244, "asNH3")).toBeCloseTo(1, 4);
  });

  it("a US gallon is 3.785411784 L", () => {
    // NIST
    expect(toLitres(1, "usgal")).toBeCloseTo(3.785411784, 9);
    expect(fromLitres(3.785411784, "usgal")).toBeCloseTo(1, 12);
  });

  it("an imperial gallon is 4.54609 L", () => {
    // NIST SP 811, from memory
    expect(toLitres(1, "impgal")).toBeCloseTo(4.54609, 9);
  });

  it("1 dKH is 17.848 mg/L as CaCO3", () => {
    // computed from the definition 10 mg CaO/L (docs/sources.md §3)
    expect(fromDkh(1, "mgCaCO3")).toBeCloseTo(17.848, 3);
    expect(toDkh(17.848, "mgCaCO3")).toBeCloseTo(1, 4);
  });

  it("77 °F is 25 °C and water freezes at 32 °F", () => {
    // definition of the Fahrenheit scale, from memory
    expect(toCelsius(77, "F")).toBeCloseTo(25, 10);
    expect(fromCelsius(0, "F")).toBeCloseTo(32, 10);
  });

  it("every conversion round-trips", () => {
    // our own property: both directions are inverses
    const quantities = Object.keys(UNIT_OPTIONS) as (keyof typeof UNIT_OPTIONS)[];
    fc.assert(
      fc.property(
        fc.constantFrom(...quantities),
        fc.nat(10),
        fc.double({ min: 0, max: 1000, noNaN: true }),
        (q, k, v) => {
          const options = UNIT_OPTIONS[q];
          const unit = options[k % options.length].id;
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
  });
});
