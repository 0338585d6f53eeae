import type { ResultWarning } from "~/features/runs/run-warnings";

/**
 * The run's specific warnings, in plain words, above the chart: what crosses a caution, when
 * and how much, with the usual advice to test, act and ask someone local.
 */
export function RunWarnings({ warnings, large = false }: { warnings: readonly ResultWarning[]; large?: boolean }) {
  if (warnings.length === 0) return null;
  const harm = warnings.some((w) => w.severity === "caution");
  return (
    <section
      aria-labelledby="run-warnings-title"
      className={`rounded-lg border-2 border-red-700 bg-red-50 p-4 text-red-950 ${large ? "text-2xl" : "text-sm"}`}
      data-run-warnings
    >
      <h2 id="run-warnings-title" className={`mb-2 font-semibold ${large ? "text-3xl" : "text-base"}`}>
        {harm ? "Where fish could be harmed" : "Settings beyond a real tank"}
      </h2>
      <WarningList warnings={warnings} />
      {harm ? <HarmAdvice /> : null}
    </section>
  );
}

/** Warnings as a list, each marked with its code (for the tests and the print view). */
export function WarningList({ warnings }: { warnings: readonly ResultWarning[] }) {
  return (
    <ul className="list-disc space-y-1 pl-5">
      {warnings.map((w) => (
        <li key={w.code} data-warning={w.code}>
          {w.text}
        </li>
      ))}
    </ul>
  );
}

/** The usual advice under a warning that fish could be harmed: test, act, ask someone local. */
export function HarmAdvice() {
  return (
    <p className="mt-2">
      This is what the model predicts, not a measurement. Test the water now and on the days named; if a test shows
      ammonia or nitrite, change water at once. When in doubt, ask a local aquarium shop, club or a veterinarian who
      treats fish.
    </p>
  );
}
