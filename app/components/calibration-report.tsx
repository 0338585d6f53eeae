/**
 * What a calibration found: the fitted multipliers with their uncertainty, the error of the
 * model against the readings before and after, residual plots (one per measured species, so
 * ammonia's small numbers are not squashed by nitrate's), and "save as a new scenario".
 */
import { useMemo } from "react";
import { Form, useNavigation } from "react-router";
import { XYChart, type XYSeries } from "~/components/charts/xy-chart";
import { SERIES_COLORS } from "~/components/charts/palette";
import { FormMessage, TextField } from "~/components/ui/field";
import type { CalibrationJson } from "~/features/calibration/calibration-json";
import { formatNumber } from "~/utils/display-units";

const SPECIES_COLOR = { tan: SERIES_COLORS.tan, no2: SERIES_COLORS.no2, no3: SERIES_COLORS.no3 } as const;

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
  return (
    <div className="space-y-5">
      {!result.converged ? (
        <FormMessage tone="info">
          The fit stopped at its limit of iterations before settling; the values below are its best so far.
        </FormMessage>
      ) : null}
      <div className="overflow-x-auto">
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
              <th scope="col" className="py-1 text-right font-normal">
                About 95 % sure between
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
                  {m.fitted && m.standardError !== null ? (
                    <span className="font-normal text-stone-600"> ± {formatNumber(m.standardError, 2)}</span>
                  ) : null}
                </td>
                <td className="num py-1 text-right">
                  {!m.fitted
                    ? ""
                    : m.low95 === null
                      ? "cannot tell from these readings"
                      : `${formatNumber(m.low95)}–${formatNumber(m.high95)}`}
                  {m.atBound ? (
                    <span className="block text-xs text-amber-800">
                      at the limit of 0.1–10: the readings push further than the model allows
                    </span>
                  ) : null}
                </td>
              </tr>
            ))}
          </tbody>
        </table>
      </div>
      <div className="overflow-x-auto">
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
        {result.iterations} iterations, {result.evaluations} model runs. The ranges assume the model’s shape is right
        and the readings’ errors are independent: treat them as a guide. A fitted model is still a model, not a water
        test.
      </p>
      {fitted.length ? (
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
