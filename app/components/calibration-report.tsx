/**
 * What a calibration found: the fitted multipliers with their 95 % ranges and, for each, plainly
 * whether the readings determine it (and if not, why and which reading would help); the kits the
 * readings were read with; the error of the model against the readings before and after;
 * residual plots (one per measured species, so ammonia's small numbers are not squashed by
 * nitrate's); and "save as a new scenario", not offered when the fit is no good fit.
 */
import { useMemo } from "react";
import { Form, useNavigation } from "react-router";
import { XYChart, type XYSeries } from "~/components/charts/xy-chart";
import { SERIES_COLORS } from "~/components/charts/palette";
import { FormMessage, TextField } from "~/components/ui/field";
import type { CalibrationJson } from "~/features/calibration/calibration-json";
import { formatNumber } from "~/utils/display-units";

const SPECIES_COLOR = { tan: SERIES_COLORS.tan, no2: SERIES_COLORS.no2, no3: SERIES_COLORS.no3 } as const;

const WHY = {
  noEffect: (m: CalibrationJson["multipliers"][number]) =>
    `changing it barely moves what you measured (a doubling moves no reading by more than ${formatNumber(m.effectPercent, 2)} % of its level)`,
  correlated: (m: CalibrationJson["multipliers"][number]) =>
    `it trades off against ${m.correlatedWith?.label.toLowerCase() ?? "another multiplier"} (correlation ${formatNumber(m.correlatedWith?.correlation ?? 0, 2)}): the readings fix their combination, not each one`,
  wide: () => "its 95 % range is too wide to act on",
  poorFit: () => "the model does not follow your readings (see above), so no range drawn from them can be trusted",
  determined: () => "",
} as const;

/** One plain sentence per fitted multiplier: determined or not, why, and which reading would help. */
function Verdicts({ result }: { result: CalibrationJson }) {
  const fitted = result.multipliers.filter((m) => m.fitted);
  return (
    <ul className="space-y-2 text-sm" aria-label="What the readings tell">
      {fitted.map((m) => (
        <li key={m.key} data-verdict-of={m.key} className={m.determined ? "text-fern-900" : "text-amber-900"}>
          {m.determined ? (
            <>
              <strong>{m.label} is determined</strong> by your readings: ×{formatNumber(m.value)}, about 95 % sure
              between {formatNumber(m.low95)} and {formatNumber(m.high95)}.
            </>
          ) : (
            <>
              <strong>{m.label} is not determined</strong> by these readings: {WHY[m.reason ?? "wide"](m)}. Keep its
              value with care. {m.suggestion}
            </>
          )}
        </li>
      ))}
    </ul>
  );
}

/** Said instead of "save as a new scenario" when the fit does not follow the readings. */
export const NO_GOOD_FIT_SAVE =
  "These multipliers are not offered for saving: the model does not follow your readings, so the values it settled on are not trustworthy. Check the readings and the journal, then fit again.";

export function CalibrationReport({
  result,
  errors,
  values,
}: {
  result: CalibrationJson;
  errors: Record<string, string>;
  values: Record<string, string>;
}) {
  const busy = useNavigation().state === "submitting";
  const plots = useMemo(
    () =>
      result.rmse.map((r) => {
        const points = result.residuals.filter((p) => p.species === r.species);
        const series: XYSeries[] = [
          {
            key: "before",
            label: "before the fit",
            color: SPECIES_COLOR[r.species],
            shape: "ring",
            points: points.map((p) => ({ x: p.day, y: p.before })),
          },
          {
            key: "after",
            label: "after the fit",
            color: SPECIES_COLOR[r.species],
            shape: "filled",
            points: points.map((p) => ({ x: p.day, y: p.after })),
          },
        ];
        return { ...r, series };
      }),
    [result],
  );
  const fitted = result.multipliers.filter((m) => m.fitted);
  const poorFit = result.fitQuality ? !result.fitQuality.good : false;
  return (
    <div className="space-y-5">
      {!result.converged ? (
        <FormMessage tone="info">
          The fit did not settle on one best point within its limits (or found a better one nearby at the last check);
          the values below are the best it found.
        </FormMessage>
      ) : null}
      {result.fitQuality && !result.fitQuality.good ? (
        <FormMessage tone="error">
          <span data-fit-quality="poor">{result.fitQuality.text}</span>
        </FormMessage>
      ) : null}
      <Verdicts result={result} />
      <div className="relative overflow-x-auto">
        <table className="w-full text-sm">
          <caption className="mb-1 text-left font-semibold">
            Fitted multipliers ({result.readingsUsed} readings, {result.residualCount} values)
          </caption>
          <thead className="text-left text-xs text-stone-600">
            <tr>
              <th scope="col" className="py-1 pr-3 font-normal">
                Multiplier
              </th>
              <th scope="col" className="py-1 pr-3 text-right font-normal">
                Before
              </th>
              <th scope="col" className="py-1 pr-3 text-right font-normal">
                Fitted
              </th>
              <th scope="col" className="py-1 pr-3 text-right font-normal">
                About 95 % sure between
              </th>
              <th scope="col" className="py-1 text-left font-normal">
                Told by the readings?
              </th>
            </tr>
          </thead>
          <tbody>
            {result.multipliers.map((m) => (
              <tr key={m.key} className="border-t border-stone-100" data-multiplier={m.key}>
                <th scope="row" className="py-1 pr-3 text-left font-normal">
                  {m.label}
                </th>
                <td className="num py-1 pr-3 text-right">×{formatNumber(m.start)}</td>
                <td className="num py-1 pr-3 text-right font-semibold">
                  {m.fitted ? `×${formatNumber(m.value)}` : "not fitted"}
                </td>
                <td className="num py-1 pr-3 text-right">
                  {!m.fitted || m.low95 === null
                    ? ""
                    : m.reason === "poorFit"
                      ? "no good fit"
                      : `${m.lowOpen ? "≤ " : ""}${formatNumber(m.low95)}–${formatNumber(m.high95)}${m.highOpen ? " or more" : ""}`}
                </td>
                <td
                  className="py-1 text-left"
                  data-verdict={m.fitted ? (m.determined ? "determined" : "undetermined") : "not-fitted"}
                >
                  {!m.fitted ? "" : m.determined ? "yes" : "no"}
                </td>
              </tr>
            ))}
          </tbody>
        </table>
      </div>
      <div className="relative overflow-x-auto">
        <table className="w-full text-sm">
          <caption className="mb-1 text-left font-semibold">
            How far the model is from the readings (root mean square)
          </caption>
          <thead className="text-left text-xs text-stone-600">
            <tr>
              <th scope="col" className="py-1 pr-3 font-normal">
                Species
              </th>
              <th scope="col" className="py-1 pr-3 text-right font-normal">
                Before
              </th>
              <th scope="col" className="py-1 text-right font-normal">
                After
              </th>
            </tr>
          </thead>
          <tbody>
            {result.rmse.map((r) => (
              <tr key={r.species} className="border-t border-stone-100">
                <th scope="row" className="py-1 pr-3 text-left font-normal">
                  {r.name} <span className="text-xs text-stone-600">{r.unit}</span>
                </th>
                <td className="num py-1 pr-3 text-right">{formatNumber(r.before)}</td>
                <td className="num py-1 text-right font-semibold">{formatNumber(r.after)}</td>
              </tr>
            ))}
            <tr className="border-t border-stone-200">
              <th scope="row" className="py-1 pr-3 text-left font-normal">
                All, on each species’ scale
              </th>
              <td className="num py-1 pr-3 text-right">{formatNumber(result.weightedRmseBefore)}</td>
              <td className="num py-1 text-right font-semibold">{formatNumber(result.weightedRmseAfter)}</td>
            </tr>
          </tbody>
        </table>
      </div>
      <div className="grid gap-6 lg:grid-cols-2">
        {plots.map((p) => (
          <XYChart
            key={p.species}
            title={`${p.name}: reading − model`}
            description={`${p.name} residuals (reading minus model, ${p.unit}) by day, before the fit as rings and after it as dots. Points near the dashed zero line fit well.`}
            xLabel="day"
            yLabel={`${p.name} reading − model, ${p.unit}`}
            series={p.series}
            zeroLine
            height={220}
          />
        ))}
      </div>
      <p className="text-xs text-stone-600">
        {result.evaluations} model runs from {result.localFits} starting points. Readings were taken as:{" "}
        {result.kits.map((k) => `${k.name} ${k.text}`).join("; ")}; beyond that, the readings and the model disagree by
        about {formatNumber(result.noisePercent, 2)} % of each species’ level. The ranges assume the model’s shape is
        right and the readings’ errors are independent: treat them as a guide. A fitted model is still a model, not a
        water test.
      </p>
      {fitted.length && poorFit ? (
        <p className="border-t border-stone-200 pt-4 text-sm" data-no-save>
          {NO_GOOD_FIT_SAVE}
        </p>
      ) : fitted.length ? (
        <Form method="post" className="flex flex-wrap items-end gap-3 border-t border-stone-200 pt-4">
          <input type="hidden" name="intent" value="save" />
          {result.multipliers.map((m) => (
            <input key={m.key} type="hidden" name={m.key} value={m.value} />
          ))}
          <div className="min-w-[16rem] flex-1">
            <TextField
              label="Name of the new scenario"
              name="name"
              maxLength={120}
              defaultValue={values.name ?? `${result.scenario.name} (calibrated)`}
              error={errors.name}
            />
          </div>
          <button type="submit" className="btn" disabled={busy}>
            Save the fitted multipliers as a new scenario
          </button>
        </Form>
      ) : null}
    </div>
  );
}
