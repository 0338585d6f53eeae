/**
 * What the TAN caution lines mean, under a chart that draws them: both are averages (US EPA
 * 2013, docs/sources.md §2), so TAN may rise above the long-term line for a while without a
 * breach, and the warnings judge the averages (models/nitrogen/warnings.ts). Without this a
 * keeper sees a spike cross the line and no warning, and trusts neither.
 */
export function TanCriteriaNote({ shortTerm }: { shortTerm: boolean }) {
  return (
    <p className="text-xs text-stone-600" data-tan-criteria-note>
      The TAN lines are US EPA 2013 ammonia criteria at each day’s pH and the tank’s temperature. The long-term limit
      holds for 30-day averages (and 4-day averages up to 2.5 times it): TAN may rise above the line for a few days
      without breaching it, and the warnings say when an average does.
      {shortTerm
        ? " The short-term criterion holds for 1-hour averages: above it fish are at risk within hours, so test the water at once."
        : ""}
    </p>
  );
}
