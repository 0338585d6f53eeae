/**
 * The journal's forecast box: the nitrate sentence, what the days ahead cross in words (free
 * ammonia, nitrite, the ammonia criteria, KH, oxygen), and the usual caution.
 */
export function JournalForecast({ forecast, cautionsAhead }: { forecast: string; cautionsAhead: readonly string[] }) {
  return (
    <div className="rounded border border-stone-300 p-3" data-testid="forecast">
      <h3 className="font-semibold">Forecast</h3>
      <p>{forecast}</p>
      {cautionsAhead.length > 0 ? (
        <div className="mt-2 rounded border-2 border-red-700 bg-red-50 p-2 text-red-950" data-cautions-ahead>
          <p className="font-semibold">Where fish could be harmed in the days ahead</p>
          <ul className="list-disc pl-5">
            {cautionsAhead.map((text) => (
              <li key={text}>{text}</li>
            ))}
          </ul>
        </div>
      ) : null}
      <p className="text-sm text-stone-600">
        A forecast is a model, not a water test: test your water before and after acting on it, and ask an experienced
        keeper or a vet if fish show stress.
      </p>
    </div>
  );
}
