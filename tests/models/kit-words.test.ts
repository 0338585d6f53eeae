/**
 * A kit's words and step in the reader's units (issue 12, item 12): a nitrate kit read in steps
 * of 0.5 mg/L NO3 is, to someone who reads nitrate as N, steps of 0.113 mg/L NO3-N. Factor
 * NO3 → N = 14.007 / 62.004 (IUPAC standard atomic weights N 14.007, O 15.999; docs/sources.md §0).
 */
import { describe, expect, it } from "vitest";
import { describeKit, kitStepIn } from "../../models/nitrogen/calibrate";

const N_PER_NO3 = 14.007 / 62.004;

describe("a kit in the reader's units", () => {
  const steps = { kind: "steps", unit: "asNO3", step: 0.5 } as const;

  it("says its steps in mg/L NO3-N to a reader of N, in the kit's own unit otherwise", () => {
    expect(describeKit("no3", steps, "asN")).toBe(
      `rounded to steps of ${Number((0.5 * N_PER_NO3).toPrecision(3))} mg/L NO3-N`,
    );
    expect(describeKit("no3", steps, "asN")).toBe("rounded to steps of 0.113 mg/L NO3-N");
    expect(describeKit("no3", steps, "asNO3")).toBe("rounded to steps of 0.5 mg/L NO3");
    expect(describeKit("no3", steps)).toBe("rounded to steps of 0.5 mg/L NO3");
  });

  it("says a colour card's values in the reader's unit", () => {
    const card = { kind: "card" as const, unit: "asNO3", values: [0, 5, 10, 20, 40, 80, 160] };
    // 5 mg/L NO3 = 1.13 mg/L NO3-N, 160 = 36.1 (× 14.007 / 62.004).
    expect(describeKit("no3", card, "asN")).toBe("colour card 0, 1.13, 2.26, 4.52, 9.04, 18.1, 36.1 mg/L NO3-N");
  });

  it("gives the step field the step in the reader's unit, and the kit's own step back unchanged", () => {
    const inN = kitStepIn("no3", steps, "asN");
    expect(inN).toBeCloseTo(0.5 * N_PER_NO3, 10);
    // Typed back as N, the kit is the same to far below any kit's resolution.
    expect(kitStepIn("no3", { kind: "steps", unit: "asN", step: inN }, "asNO3")).toBeCloseTo(0.5, 9);
    expect(kitStepIn("no3", steps, "asNO3")).toBe(0.5);
  });
});
