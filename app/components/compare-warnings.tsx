import { HarmAdvice, WarningList } from "~/components/run-warnings";
import type { ResultWarning } from "~/features/runs/run-warnings";

type RunWithWarnings = { id: number; name: string; warnings: readonly ResultWarning[] };

/**
 * The compared scenarios' warnings, each under its scenario's name: a scenario that harms fish
 * says so on the compare page as on its own results page, with the usual advice.
 */
export function CompareWarnings({ runs }: { runs: readonly RunWithWarnings[] }) {
  const warned = runs.filter((r) => r.warnings.length > 0);
  if (warned.length === 0) return null;
  const harm = warned.some((r) => r.warnings.some((w) => w.severity === "caution"));
  return (
    <section
      aria-labelledby="compare-warnings-title"
      className="rounded-lg border-2 border-red-700 bg-red-50 p-4 text-sm text-red-950"
      data-run-warnings
    >
      <h2 id="compare-warnings-title" className="mb-2 text-base font-semibold">
        {harm ? "Where fish could be harmed" : "Settings beyond a real tank"}
      </h2>
      {warned.map((r) => (
        <div key={r.id} className="mb-2" data-compare-warnings={r.id}>
          <h3 className="font-semibold">{r.name}</h3>
          <WarningList warnings={r.warnings} />
        </div>
      ))}
      {harm ? <HarmAdvice /> : null}
    </section>
  );
}
