import { useMemo } from "react";
import { TimeSeriesChart } from "~/components/charts/time-series-chart";
import { DEFAULT_EVENT_KINDS, type EventKind } from "~/components/charts/palette";
import type { PackedRunChart } from "~/features/runs/run-chart";
import { unpackSeries } from "~/features/runs/series-packing";
import type { ChartReading } from "~/utils/chart-data";
import { formatDate } from "~/utils/dates";

type Replay = PackedRunChart & {
  startMs: number;
  readings: ChartReading[];
  readingsTotal: number;
  /** How many samples and logged events the replay has (the page gets a thinned share of long ones). */
  samplesTotal: number;
  eventsTotal: number;
  /** The whole replay as CSV, from the server. */
  csvHref: string;
};

// The replay's events are the journal's (the scenario's meals are left out on the server), so a
// logged change of feeding is marked too.
const REPLAY_EVENT_KINDS: readonly EventKind[] = [...DEFAULT_EVENT_KINDS, "feeding"];

/**
 * The journal's replay drawn as a results page draws a run: TAN and free ammonia with their
 * caution lines (the TAN lines at the replay's pH), nitrite, nitrate with the target band, the
 * keeper's test readings as points, the logged events, the table and the CSV download.
 */
export function JournalReplayChart({ replay, tankName }: { replay: Replay; tankName: string }) {
  const series = useMemo(() => unpackSeries(replay.packedSeries), [replay.packedSeries]);
  const since = formatDate(replay.startMs);
  const { readings, readingsTotal } = replay;
  const thinned = series.t.length < replay.samplesTotal || replay.events.length < replay.eventsTotal;
  return (
    <figure className="space-y-2">
      <TimeSeriesChart
        title={`${tankName}: nitrogen as it happened since ${since}`}
        series={series}
        seriesLabel="As it happened"
        units={replay.labels}
        events={replay.events}
        eventKinds={REPLAY_EVENT_KINDS}
        guides={replay.guides}
        readings={readings}
        downloadName={`${tankName}-as-it-happened`}
        csvHref={replay.csvHref}
        csvDownloadHref={thinned ? replay.csvHref : undefined}
      />
      <figcaption className="text-sm text-stone-600">
        Days count from {since}, the journal's first day.{" "}
        {readings.length === readingsTotal
          ? readings.length
            ? "Points are your test readings. "
            : "No test readings in this time yet. "
          : `Points are ${readings.length} of your ${readingsTotal.toLocaleString("en")} test readings, evenly spread over time. `}
        {series.t.length < replay.samplesTotal
          ? `The chart holds the highest and lowest values of each stretch of time (${series.t.length.toLocaleString("en")} of the replay's ${replay.samplesTotal.toLocaleString("en")} samples), so no peak is lost. `
          : ""}
        {replay.events.length < replay.eventsTotal
          ? `${replay.events.length.toLocaleString("en")} of the ${replay.eventsTotal.toLocaleString("en")} logged events are marked on the time axis, the first of each kind in each stretch. `
          : ""}
        {thinned ? "The CSV download holds every sample and event. " : ""}
        This is a model, not a water test: test your water before acting on it.
      </figcaption>
    </figure>
  );
}
