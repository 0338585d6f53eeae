/** The model caution, short form, for the footer of every page. */
export function FooterCaution() {
  return (
    <p>
      Fernwater is a model, not a water test. Test your water; act on real ammonia or nitrite readings at once; change
      water with temperature-matched, dechlorinated water; never release aquarium plants or animals into the wild.
    </p>
  );
}

/** The cautions panel of every results view (the brief's list), plus the tap-water warning when it applies. */
export function CautionsPanel({
  tapNitrateAboveDrinkingLimit,
  tapNitrateText,
  limitText,
}: {
  tapNitrateAboveDrinkingLimit: boolean;
  tapNitrateText: string;
  /** The WHO limit in the same units as tapNitrateText: "50 mg/L NO3", "11.3 mg/L NO3-N". */
  limitText: string;
}) {
  return (
    <aside
      className="rounded-lg border border-amber-300 bg-amber-50 p-4 text-sm text-stone-800"
      aria-labelledby="cautions-title"
    >
      <h2 id="cautions-title" className="mb-2 text-base font-semibold">
        Before you act on this
      </h2>
      <ul className="list-disc space-y-1 pl-5">
        <li>Fernwater is a model, not a water test. Test your water with a kit or a laboratory.</li>
        <li>If a test shows ammonia or nitrite, act at once: a water change first, then find the cause.</li>
        <li>Change water with dechlorinated water at the tank’s temperature.</li>
        <li>Never release aquarium plants or animals into the wild: many become invasive.</li>
        {tapNitrateAboveDrinkingLimit ? (
          <li className="font-semibold text-red-900">
            The tap nitrate entered ({tapNitrateText}) is above the drinking-water limit of {limitText} (WHO). That is a
            matter for your local water supplier and health advice, not for this app.
          </li>
        ) : null}
      </ul>
    </aside>
  );
}
