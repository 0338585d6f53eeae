/**
 * The what-if panel's place before the page's script runs. Its sliders preview a change through
 * the API and show their values as they move, and its save keeps only the levers moved: all of
 * that is the script's, so without it the panel offered sliders that showed nothing and a save
 * button that stayed off. The server sends this instead, at the drawn panel's height, and the
 * browser draws the panel right after (decision 0012).
 */
export function WhatIfBeforeScript({ editHref }: { editHref: string }) {
  return (
    // The drawn panel and its summary, measured in Chromium on the demo's results page: 352 px
    // high beside each other (Tailwind's lg breakpoint), 780 px one under the other.
    <section className="card min-h-[780px] space-y-2 lg:min-h-[352px]" aria-label="What if…" data-what-if-stand-in="">
      <h2 className="text-lg">What if…</h2>
      <p className="text-sm text-stone-600">The sliders appear when the page has loaded.</p>
      <noscript>
        {/* Without scripts the panel never comes: no empty box, only why and what to do instead. */}
        <style>
          {"[data-what-if-stand-in] { min-height: 0 !important; } [data-what-if-stand-in] > p { display: none; }"}
        </style>
        <p className="text-sm text-stone-700">
          Trying a change needs the page’s script, which is off in this browser. To change the scenario without it,{" "}
          <a className="link" href={editHref}>
            edit its settings
          </a>
          .
        </p>
      </noscript>
    </section>
  );
}
