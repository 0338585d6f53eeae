/**
 * Collision-free placement of the text labels inside a chart panel (caution lines, the target
 * band, direct line labels). Pure, so it can be tested without a browser.
 *
 * Greedy and simple: labels are placed in the order given (most important first); each tries
 * its wanted height, then heights ever further above and below it, and takes the first spot
 * that stays inside the bounds and clears every label already placed (and any box reserved by
 * the caller). A label that finds no spot is returned in `overflow`, for the chart to list
 * under the plot instead: a label is never drawn over another.
 */

export type LabelRequest = {
  id: string;
  /** Anchor x: the left edge for "start", the right edge for "end". */
  x: number;
  anchor: "start" | "end";
  /** Where the label's vertical centre wants to be. */
  y: number;
  width: number;
  height: number;
};

export type LabelBox = { left: number; right: number; top: number; bottom: number };

type PlacedLabel = { id: string; x: number; anchor: "start" | "end"; /** vertical centre */ y: number; box: LabelBox };

export type LabelLayout = { placed: PlacedLabel[]; overflow: string[] };

/** Width of a text in px, estimated from its length (no font metrics on the server). */
export function estimateTextWidth(text: string, fontSize: number, bold = false): number {
  // Average advance of a serif face is about 0.5 em; 0.6 (0.64 bold) leaves room for wide glyphs.
  return Math.ceil(text.length * fontSize * (bold ? 0.64 : 0.6)) + 2;
}

export function boxesOverlap(a: LabelBox, b: LabelBox, gap = 0): boolean {
  return a.left < b.right + gap && b.left < a.right + gap && a.top < b.bottom + gap && b.top < a.bottom + gap;
}

function boxOf(r: LabelRequest, y: number): LabelBox {
  const left = r.anchor === "start" ? r.x : r.x - r.width;
  return { left, right: left + r.width, top: y - r.height / 2, bottom: y + r.height / 2 };
}

/**
 * Place `requests` within [top, bottom] (vertical bounds for the label boxes), at least `gap` px
 * apart from each other and from `reserved` boxes. `step` is the nudge in px.
 */
export function layoutLabels(
  requests: readonly LabelRequest[],
  bounds: { top: number; bottom: number },
  opts: { gap?: number; step?: number; reserved?: readonly LabelBox[] } = {},
): LabelLayout {
  const gap = opts.gap ?? 1;
  const step = Math.max(0.5, opts.step ?? 2);
  const taken: LabelBox[] = [...(opts.reserved ?? [])];
  const placed: PlacedLabel[] = [];
  const overflow: string[] = [];
  const span = bounds.bottom - bounds.top;
  for (const r of requests) {
    const lo = bounds.top + r.height / 2;
    const hi = bounds.bottom - r.height / 2;
    if (!(hi >= lo) || !Number.isFinite(r.y)) {
      overflow.push(r.id);
      continue;
    }
    const start = Math.min(Math.max(r.y, lo), hi);
    let found: number | null = null;
    for (let k = 0; k * step <= span + step; k++) {
      for (const y of k === 0 ? [start] : [start - k * step, start + k * step]) {
        if (y < lo || y > hi) continue;
        const box = boxOf(r, y);
        if (!taken.some((t) => boxesOverlap(box, t, gap))) {
          found = y;
          break;
        }
      }
      if (found !== null) break;
    }
    if (found === null) {
      overflow.push(r.id);
      continue;
    }
    const box = boxOf(r, found);
    taken.push(box);
    placed.push({ id: r.id, x: r.x, anchor: r.anchor, y: found, box });
  }
  return { placed, overflow };
}
