/**
 * fourFigures must round as ECMAScript's Number.prototype.toPrecision(4) does (ECMA-262,
 * §21.1.3.5: the four-digit decimal nearest the exact value, the larger on a tie), read back
 * as a number: a chart's samples are sent this way.
 */
import fc from "fast-check";
import { describe, expect, it } from "vitest";
import { fourFigures } from "~/utils/four-figures";

const byTheStandard = (v: number) => Number(v.toPrecision(4));

/** Whether v lies within a few rounding errors of a half-way point between two four-figure decimals. */
function nearHalfWay(v: number): boolean {
  const a = Math.abs(v);
  const scaled = a * 10 ** (3 - Math.floor(Math.log10(a)));
  return Math.abs(scaled - Math.floor(scaled) - 0.5) < 1e-9;
}

describe("fourFigures", () => {
  it("gives what toPrecision(4) gives, for any finite double away from a half-way point", () => {
    fc.assert(
      fc.property(fc.double({ noNaN: true, noDefaultInfinity: true }), (v) => {
        if (v !== 0 && nearHalfWay(v)) return;
        expect(Object.is(fourFigures(v), byTheStandard(v)) || (v === 0 && fourFigures(v) === 0)).toBe(true);
      }),
      { numRuns: 20_000 },
    );
  });

  it("gives what toPrecision(4) gives over the range a chart draws (mg/L, grams, days)", () => {
    fc.assert(
      fc.property(fc.double({ min: 1e-9, max: 1e6, noNaN: true }), (v) => {
        if (nearHalfWay(v)) return;
        expect(fourFigures(v)).toBe(byTheStandard(v));
        expect(fourFigures(-v)).toBe(byTheStandard(-v));
      }),
      { numRuns: 20_000 },
    );
  });

  it("rounds exact ties away from zero, as toPrecision does", () => {
    // Exactly representable half-way values: the tie goes to the larger magnitude.
    for (const v of [1234.5, 1.0625, 12345, 99995])
      expect([fourFigures(v), fourFigures(-v)]).toEqual([byTheStandard(v), byTheStandard(-v)]);
  });

  it("keeps zero, infinities and NaN as they are", () => {
    expect(fourFigures(0)).toBe(0);
    expect(fourFigures(Infinity)).toBe(Infinity);
    expect(fourFigures(-Infinity)).toBe(-Infinity);
    expect(fourFigures(NaN)).toBeNaN();
  });
});
