// Our own worked examples of which samples the data table lists.
import { describe, expect, it } from "vitest";
import { tableRowIndices } from "~/components/charts/table-rows";

describe("tableRowIndices", () => {
  it("lists one row per whole day for hourly output, at the first sample of the day", () => {
    const t: number[] = [];
    for (let k = 0; k <= 3 * 24; k++) {
      t.push(k / 24);
      if (k === 24) t.push(1); // event pair at day 1
    }
    const { indices, daily } = tableRowIndices(t);
    expect(daily).toBe(true);
    expect(indices.map((i) => t[i])).toEqual([0, 1, 2, 3]);
    expect(indices[1]).toBe(24); // the sample before the event
  });

  it("lists every sample, both halves of event pairs, when output is daily or coarser", () => {
    const t = [0, 1, 2, 2, 3, 4];
    expect(tableRowIndices(t)).toEqual({ indices: [0, 1, 2, 3, 4, 5], daily: false });
  });

  it("handles an empty run", () => {
    expect(tableRowIndices([])).toEqual({ indices: [], daily: false });
  });
});
