/**
 * Packed series (the strings pages send) read back to the very numbers packed, column by
 * column on first use, with absent columns still absent: the chart tells an engine run without
 * oxygen or criteria lines by the missing key. A plumbing round trip, no outside source.
 */
import fc from "fast-check";
import { describe, expect, it } from "vitest";
import { packSeries, unpackSeries } from "~/features/runs/series-packing";
import type { ChartSeries } from "~/utils/chart-data";

const column = (n: number) =>
  fc.array(fc.double({ noNaN: true, noDefaultInfinity: true }), { minLength: n, maxLength: n });

describe("unpackSeries", () => {
  it("gives back every number packed, and no column that was not there", () => {
    fc.assert(
      fc.property(
        fc.integer({ min: 0, max: 30 }).chain((n) =>
          fc.record({
            t: column(n),
            tan: column(n),
            nh3: column(n),
            no2: column(n),
            no3: column(n),
            plants: fc.array(fc.record({ id: fc.string(), name: fc.string(), massG: column(n) }), { maxLength: 2 }),
            o2: fc.option(column(n), { nil: undefined }),
            tanLongTerm: fc.option(column(n), { nil: undefined }),
          }),
        ),
        (drawn) => {
          const series = Object.fromEntries(
            Object.entries(drawn).filter(([, v]) => v !== undefined),
          ) as unknown as ChartSeries;
          const back = unpackSeries(packSeries(series));
          // -0 packs as "0": equal as numbers, which is all a chart reads.
          const plain = JSON.parse(JSON.stringify(back)) as ChartSeries;
          expect(plain).toEqual(JSON.parse(JSON.stringify(series)));
          expect(Object.keys(back).sort()).toEqual(Object.keys(series).sort());
          expect("tanShortTerm" in back).toBe(false);
        },
      ),
    );
  });

  it("keeps a column once it is read", () => {
    const packed = packSeries({ t: [0, 1], tan: [0.5, 1], nh3: [0, 0], no2: [0, 0], no3: [2, 3], plants: [] });
    const back = unpackSeries(packed);
    const first = back.no3;
    expect(first).toEqual([2, 3]);
    expect(back.no3).toBe(first);
  });
});
