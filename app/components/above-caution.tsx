/**
 * A toxic peak above its caution line, in a table or a figure list: the cell is tinted and says
 * so in words (colour alone is not enough), as the results page's flagged cards do.
 */
export function AboveCaution({ above }: { above: boolean | null | undefined }) {
  if (!above) return null;
  return (
    <span className="block text-xs font-semibold text-red-800" data-above-caution>
      above caution
    </span>
  );
}

/** The class of a right-aligned number cell holding a toxic peak. */
export function peakCell(above: boolean | null | undefined): string {
  return above ? "num bg-red-50 py-2 pr-3 text-right text-red-900" : "num py-2 pr-3 text-right";
}
