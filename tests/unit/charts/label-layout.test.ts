import fc from "fast-check";
import { describe, expect, it } from "vitest";
import { boxesOverlap, estimateTextWidth, layoutLabels, type LabelRequest } from "~/components/charts/label-layout";

// Labels that overlap cannot be read: common practice, no source.
function noOverlaps(boxes: { left: number; right: number; top: number; bottom: number }[]): boolean {
  for (let a = 0; a < boxes.length; a++)
    for (let b = a + 1; b < boxes.length; b++) if (boxesOverlap(boxes[a], boxes[b])) return false;
  return true;
}

describe("layoutLabels", () => {
  it("nudges three cautions that all want the same height apart, keeping them in the plot", () => {
    const req = (id: string): LabelRequest => ({ id, x: 4, anchor: "start", y: 150, width: 120, height: 14 });
    const { placed, overflow } = layoutLabels([req("nh3"), req("tan"), req("no2")], { top: 0, bottom: 160 });
    expect(overflow).toEqual([]);
    expect(placed).toHaveLength(3);
    expect(noOverlaps(placed.map((p) => p.box))).toBe(true);
    for (const p of placed) {
      expect(p.box.top).toBeGreaterThanOrEqual(0);
      expect(p.box.bottom).toBeLessThanOrEqual(160);
    }
    // The first (most important) label keeps its wanted place.
    expect(placed[0].y).toBe(150);
  });

  it("moves labels that cannot fit into the overflow list instead of drawing them over others", () => {
    const reqs: LabelRequest[] = Array.from({ length: 10 }, (_, k) => ({
      id: `l${k}`,
      x: 0,
      anchor: "start",
      y: 20,
      width: 200,
      height: 14,
    }));
    const { placed, overflow } = layoutLabels(reqs, { top: 0, bottom: 50 });
    expect(placed.length).toBeLessThan(10);
    expect(placed.length + overflow.length).toBe(10);
    expect(noOverlaps(placed.map((p) => p.box))).toBe(true);
  });

  it("lets labels on opposite sides of a wide plot share a height", () => {
    const { placed } = layoutLabels(
      [
        { id: "left", x: 4, anchor: "start", y: 40, width: 100, height: 14 },
        { id: "right", x: 596, anchor: "end", y: 40, width: 40, height: 14 },
      ],
      { top: 0, bottom: 100 },
    );
    expect(placed.map((p) => p.y)).toEqual([40, 40]);
  });

  it("keeps clear of reserved boxes", () => {
    const reserved = [{ left: 0, right: 300, top: 30, bottom: 50 }];
    const { placed } = layoutLabels(
      [{ id: "a", x: 10, anchor: "start", y: 40, width: 50, height: 12 }],
      {
        top: 0,
        bottom: 100,
      },
      { reserved },
    );
    expect(boxesOverlap(placed[0].box, reserved[0])).toBe(false);
  });

  it("never overlaps and never leaves the bounds, whatever the crowd (property)", () => {
    const request = fc.record({
      x: fc.integer({ min: 0, max: 600 }),
      anchor: fc.constantFrom("start" as const, "end" as const),
      y: fc.double({ min: -50, max: 300, noNaN: true }),
      width: fc.integer({ min: 10, max: 400 }),
      height: fc.integer({ min: 8, max: 30 }),
    });
    fc.assert(
      fc.property(
        fc.array(request, { minLength: 1, maxLength: 25 }),
        fc.integer({ min: 20, max: 400 }),
        (raw, bottom) => {
          const reqs = raw.map((r, k) => ({ ...r, id: `l${k}` }));
          const { placed, overflow } = layoutLabels(reqs, { top: 0, bottom });
          expect(placed.length + overflow.length).toBe(reqs.length);
          expect(noOverlaps(placed.map((p) => p.box))).toBe(true);
          for (const p of placed) {
            expect(p.box.top).toBeGreaterThanOrEqual(-1e-9);
            expect(p.box.bottom).toBeLessThanOrEqual(bottom + 1e-9);
          }
        },
      ),
      { numRuns: 300 },
    );
  });

  it("estimates a wider box for longer and bolder text", () => {
    expect(estimateTextWidth("free NH3 caution 0.02", 11)).toBeGreaterThan(estimateTextWidth("NH3", 11));
    expect(estimateTextWidth("TAN", 18, true)).toBeGreaterThan(estimateTextWidth("TAN", 18));
  });
});
