import { useEffect, useMemo, useState } from "react";
import {} from "react-router";
import type { Route } from "./+types/present";
import { CautionsPanel } from "~/components/cautions";
import { nearestIndex } from "~/utils/series-lookup";
import { SERIES_COLORS } from "~/components/charts/palette";
import { TimeSeriesChart } from "~/components/charts/time-series-chart";
import { FormMessage } from "~/components/ui/field";
import { lessonRun, requireLesson, requireOwnClass } from "~/features/classes/classes.server";
import { requireUser } from "~/permissions.server";
import { packedResultsPayload, resultsPayload } from "~/features/runs/results.server";
import { runProblem } from "~/http/pages.server";
import { displayUnitsFor, formatNumber } from "~/utils/display-units";
import { unpackSeries } from "~/features/runs/series-packing";
import { Breadcrumbs } from "~/components/breadcrumbs";
import { RunWarnings } from "~/components/run-warnings";

export const meta: Route.MetaFunction = ({ data }) => [
  { title: `Presenting ${data?.lesson.title ?? "a lesson"} · Fernwater` },
];

// Rendered from its loader data alone (no clock, no randomness): a repeat view may reuse the rendering (app/http/render-cache.server.ts).
export const handle = { renderCache: true, wide: true };

export async function loader({ request, params }: Route.LoaderArgs) {
  const user = await requireUser(request);
  const cls = requireOwnClass(user, params.classId);
  const lesson = requireLesson(cls, params.lessonId);
  const base = {
    cls: { id: cls.id, name: cls.name },
    lesson: { id: lesson.id, title: lesson.title, question: lesson.question },
  };
  try {
    const found = await lessonRun(lesson, user.id);
    if (!found) return { ...base, results: null, error: "The lesson’s settings can no longer be read." };
    return {
      ...base,
      results: packedResultsPayload(resultsPayload(found.run, found.settings, displayUnitsFor(user))),
      error: null,
    };
  } catch (error) {
    const problem = runProblem(error);
    if (problem) return { ...base, results: null, error: problem };
    throw error;
  }
}

/** Model days per second while playing: a 60-day cycle plays in about ten seconds. */
const DAYS_PER_SECOND = 6;

export default function PresentLessonPage({ loaderData }: Route.ComponentProps) {
  const { cls, lesson, results, error } = loaderData;
  const series = useMemo(() => (results ? unpackSeries(results.packedSeries) : null), [results]);
  const lastDay = series ? Math.round(series.t[series.t.length - 1] ?? 0) : 0;
  const [day, setDay] = useState(0);
  const [playing, setPlaying] = useState(false);
  // Playing stops by itself at the last day.
  const running = playing && day < lastDay;

  useEffect(() => {
    if (!running) return;
    const timer = setInterval(() => setDay((d) => Math.min(d + 1, lastDay)), 1000 / DAYS_PER_SECOND);
    return () => clearInterval(timer);
  }, [running, lastDay]);

  const i = series ? nearestIndex(series.t, day, "before") : -1;
  const figures =
    results && series && i >= 0
      ? [
          {
            key: "tan",
            label: "Total ammonia",
            value: series.tan[i],
            unit: results.labels.ammonia,
            color: SERIES_COLORS.tan,
          },
          {
            key: "nh3",
            label: "Free ammonia",
            value: series.nh3[i],
            unit: results.labels.ammonia,
            color: SERIES_COLORS.nh3,
          },
          {
            key: "no2",
            label: "Nitrite",
            value: series.no2[i],
            unit: results.labels.nitrite,
            color: SERIES_COLORS.no2,
          },
          {
            key: "no3",
            label: "Nitrate",
            value: series.no3[i],
            unit: results.labels.nitrate,
            color: SERIES_COLORS.no3,
          },
        ]
      : [];

  return (
    <div className="space-y-4">
      <Breadcrumbs trail={[{ to: `/classes/${cls.id}/lessons/${lesson.id}`, label: "Back to the lesson" }]} />
      <h1 className="text-3xl sm:text-4xl">{lesson.title}</h1>
      <p className="text-lg sm:text-xl">{lesson.question}</p>
      {error ? <FormMessage>{error}</FormMessage> : null}
      {results && series ? (
        <>
          <div className="card space-y-3">
            <div className="flex flex-wrap items-center gap-4">
              <button
                type="button"
                className="btn px-6 py-3 text-lg"
                onClick={() => {
                  if (!running && day >= lastDay) setDay(0);
                  setPlaying(!running);
                }}
                aria-pressed={running}
              >
                {running ? "Pause" : day >= lastDay ? "Play again" : "Play"}
              </button>
              <label htmlFor="day-slider" className="figure text-3xl font-semibold" aria-live="off">
                Day {day}
              </label>
              <input
                id="day-slider"
                type="range"
                min={0}
                max={lastDay}
                step={1}
                value={day}
                onChange={(e) => {
                  setPlaying(false);
                  setDay(Number(e.currentTarget.value));
                }}
                className="h-3 min-w-48 flex-1 accent-fern-700"
                aria-valuetext={`day ${day} of ${lastDay}`}
              />
            </div>
            <dl className="grid grid-cols-2 gap-3 lg:grid-cols-4" aria-label={`Values on day ${day}`}>
              {figures.map((f) => (
                <div key={f.key} className="rounded-md border-2 p-3" style={{ borderColor: f.color }}>
                  <dt className="text-base text-stone-700">{f.label}</dt>
                  <dd className="figure text-3xl font-semibold sm:text-4xl" style={{ color: f.color }}>
                    {formatNumber(f.value)}
                  </dd>
                  <dd className="text-sm text-stone-600">{f.unit}</dd>
                </div>
              ))}
            </dl>
          </div>
          <RunWarnings warnings={results.warnings} large />
          <TimeSeriesChart
            title={`${lesson.title}: nitrogen over ${results.lengthDays} days`}
            series={series}
            units={results.labels}
            events={results.events}
            guides={results.guides}
            height={640}
            presentation
            cursorDay={day}
            table={false}
            downloadName={false}
          />
          <CautionsPanel
            tapNitrateAboveDrinkingLimit={results.tapNitrateAboveDrinkingLimit}
            tapNitrateText={`${formatNumber(results.tapNitrateDisplay)} ${results.labels.nitrate}`}
            limitText={`${formatNumber(results.tapNitrateLimitDisplay)} ${results.labels.nitrate}`}
          />
        </>
      ) : null}
    </div>
  );
}
