import { useEffect, useRef, useState } from "react";
import { Form, useFetcher } from "react-router";
import type { KeyFigures, ModelWarning, Series } from "~models";
import { toDisplay, unitLabel } from "~models/units";
import { displayKeyFigures, displaySeries } from "~/features/runs/display-figures";
import { resultWarnings, type ResultWarning } from "~/features/runs/run-warnings";
import { whatIfName, type WhatIfSettings, type WhatIfValues } from "~/features/runs/what-if";
import type { ChartSeries, DisplayKeyFigures } from "~/utils/chart-data";
import { formatNumber, type DisplayUnits } from "~/utils/display-units";

/** A preview in the viewer's units, converted here from the API's canonical answer. */
export type WhatIfPreview = { keyFigures: DisplayKeyFigures; series: ChartSeries; warnings: ResultWarning[] };

/** The preview API's canonical answer (docs/api.md), or its error. */
type PreviewAnswer = { keyFigures: KeyFigures; warnings?: ModelWarning[]; series: Series } | { error: string };

type Props = {
  scenarioId: number;
  scenarioName: string;
  base: WhatIfValues;
  hasPlants: boolean;
  /** Labels and quantities of the sliders' settings (the settings vocabulary). */
  settings: WhatIfSettings;
  /** The viewer's units: the panel converts canonical values itself. */
  units: DisplayUnits;
  onPreview: (preview: WhatIfPreview | null) => void;
};

const DEBOUNCE_MS = 300;

/** The levers moved away from the saved values, at the value held. */
function movedValues(values: WhatIfValues, base: WhatIfValues): Partial<WhatIfValues> {
  return Object.fromEntries(
    (Object.keys(base) as (keyof WhatIfValues)[])
      .filter((k) => Math.abs(values[k] - base[k]) > 1e-12)
      .map((k) => [k, values[k]]),
  );
}

function Slider({
  name,
  label,
  value,
  min,
  max,
  step,
  display,
  onChange,
}: {
  name: string;
  label: string;
  value: number;
  min: number;
  max: number;
  step: number;
  display: string;
  onChange: (v: number) => void;
}) {
  const id = `what-if-${name}`;
  return (
    <div className="space-y-1">
      <label htmlFor={id} className="flex justify-between text-sm font-semibold">
        <span>{label}</span>
        <output htmlFor={id} className="figure font-normal">
          {display}
        </output>
      </label>
      <input
        id={id}
        type="range"
        min={min}
        max={max}
        step={step}
        value={value}
        aria-valuetext={display}
        onChange={(e) => onChange(Number(e.target.value))}
        className="w-full accent-fern-700"
      />
    </div>
  );
}

/**
 * Sliders for a few settings; each change (debounced) asks the preview API for a run of the
 * changed scenario, and the page overlays it on the saved run. "Save as a new scenario" keeps it.
 */
export function WhatIfPanel({ scenarioId, scenarioName, base, hasPlants, settings, units, onPreview }: Props) {
  const fetcher = useFetcher<PreviewAnswer>();
  const [values, setValues] = useState(base);
  const moved = Object.keys(movedValues(values, base)) as (keyof WhatIfValues)[];
  const changed = moved.length > 0;
  const timer = useRef<ReturnType<typeof setTimeout> | undefined>(undefined);
  const submit = fetcher.submit;

  useEffect(() => {
    clearTimeout(timer.current);
    if (!changed) {
      onPreview(null);
      return;
    }
    timer.current = setTimeout(() => {
      submit(
        { scenarioId, whatIf: movedValues(values, base) },
        { method: "post", action: "/api/preview", encType: "application/json" },
      );
    }, DEBOUNCE_MS);
    return () => clearTimeout(timer.current);
  }, [values, base, changed, scenarioId, submit, onPreview]);

  useEffect(() => {
    if (!changed) return;
    const data = fetcher.data;
    if (data && "series" in data && data.series) {
      onPreview({
        keyFigures: displayKeyFigures(data.keyFigures, units),
        series: displaySeries(data.series, units),
        // The same cautions as the saved run's, in words (the sliders leave the change water's KH alone).
        warnings: resultWarnings({ keyFigures: data.keyFigures, warnings: data.warnings ?? [] }, units),
      });
    }
  }, [fetcher.data, changed, onPreview, units]);

  const set = (key: keyof WhatIfValues) => (v: number) => setValues((old) => ({ ...old, [key]: v }));
  const feedMax = Math.max(2, base.feedGPerDay * 3);
  const tapMax = Math.max(25, base.tapNitrate * 2);
  const error = fetcher.data && "error" in fetcher.data ? fetcher.data.error : null;
  const shown = (key: keyof WhatIfSettings) =>
    `${formatNumber(toDisplay(settings[key].quantity, values[key], units))} ${unitLabel(settings[key].quantity, units, settings[key].unit)}`;

  return (
    <section className="card space-y-4" aria-labelledby="what-if-title">
      <div className="flex flex-wrap items-baseline justify-between gap-2">
        <h2 id="what-if-title" className="text-lg">
          What if…
        </h2>
        <p className="text-sm text-stone-600" aria-live="polite">
          {fetcher.state !== "idle"
            ? "Running the model…"
            : changed
              ? "The changed run is drawn thin over the saved one."
              : "Move a slider to try a change."}
        </p>
      </div>
      <Form method="post" className="space-y-4">
        <input type="hidden" name="intent" value="save-what-if" />
        {/* Only the levers moved, at the value held (a range input would post its step-snapped
            value, changing settings nobody touched). */}
        {moved.map((key) => (
          <input key={key} type="hidden" name={key} value={String(values[key])} />
        ))}
        <div className="grid gap-4 sm:grid-cols-2">
          <Slider
            name="feedGPerDay"
            label={settings.feedGPerDay.label}
            value={values.feedGPerDay}
            min={0}
            max={feedMax}
            step={0.05}
            display={`${formatNumber(values.feedGPerDay)} g`}
            onChange={set("feedGPerDay")}
          />
          <Slider
            name="waterChangeFraction"
            label={settings.waterChangeFraction.label}
            value={values.waterChangeFraction}
            min={0}
            max={0.9}
            step={0.05}
            display={`${Math.round(values.waterChangeFraction * 100)} %`}
            onChange={set("waterChangeFraction")}
          />
          <Slider
            name="waterChangeIntervalDays"
            label={settings.waterChangeIntervalDays.label}
            value={values.waterChangeIntervalDays}
            min={0}
            max={42}
            step={1}
            display={values.waterChangeIntervalDays === 0 ? "never" : `${values.waterChangeIntervalDays} days`}
            onChange={set("waterChangeIntervalDays")}
          />
          <Slider
            name="plantMassFactor"
            label={hasPlants ? "Plant mass (× saved)" : "Plant mass (no plant groups saved)"}
            value={values.plantMassFactor}
            min={0}
            max={4}
            step={0.1}
            display={`× ${formatNumber(values.plantMassFactor)}`}
            onChange={set("plantMassFactor")}
          />
          <Slider
            name="tapNitrate"
            label={settings.tapNitrate.label}
            value={values.tapNitrate}
            min={0}
            max={tapMax}
            step={tapMax / 100}
            display={shown("tapNitrate")}
            onChange={set("tapNitrate")}
          />
        </div>
        {error ? (
          <p className="text-sm font-semibold text-red-800" role="alert">
            {error}
          </p>
        ) : null}
        <div className="flex flex-wrap items-end gap-3">
          <div className="space-y-1">
            <label htmlFor="what-if-name" className="block text-sm font-semibold">
              Name of the new scenario
            </label>
            <input
              id="what-if-name"
              name="name"
              className="input"
              defaultValue={whatIfName(scenarioName)}
              maxLength={120}
            />
          </div>
          <button type="submit" className="btn" disabled={!changed}>
            Save as a new scenario
          </button>
          <button type="button" className="btn-secondary" disabled={!changed} onClick={() => setValues(base)}>
            Back to the saved values
          </button>
        </div>
      </Form>
    </section>
  );
}
