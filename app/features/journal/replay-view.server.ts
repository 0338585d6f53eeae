/**
 * The journal page's "as it happened" section, built from a kept replay: the chart the results
 * page draws (TAN with its caution lines at the replay's pH, free ammonia, nitrite, nitrate with
 * the target band, the logged events) with its series packed, the keeper's test readings over
 * it, what the replay crossed in words, and its nitrogen budget.
 */
import type { Scenario } from "~models";
import { dayText } from "~/features/journal/forecast-text.server";
import type { Replay } from "~/features/journal/journal-replay.server";
import { replayChartInput, type ReplayChartData } from "~/features/journal/replay-chart.server";
import { replayChartOffThread } from "~/features/jobs/chores-pool.server";
import { readingsForChart } from "~/features/readings/readings.server";
import { resultWarnings } from "~/features/runs/run-warnings";
import { DAY_MS } from "~/utils/dates";
import type { DisplayUnits } from "~/utils/display-units";

/**
 * The packed chart per kept replay and units. A replay covers up to two years at six-hourly
 * samples (about 3,000 per column, some 33,000 samples for a full journal): it is converted,
 * thinned and packed once, on the chores thread (replay-chart.server.ts), not at every reload,
 * which keeps the page as cheap as the kept model (journal-page.server.ts) makes it. A replay
 * object is made once per journal version and settings, so it keys the chart; visitors who come
 * at once share one building.
 */
const charts = new WeakMap<Replay, Map<string, Promise<ReplayChartData>>>();

function replayChart(r: Replay, settings: Scenario, units: DisplayUnits): Promise<ReplayChartData> {
  const key = Object.values(units).join("|");
  let kept = charts.get(r);
  if (!kept) charts.set(r, (kept = new Map()));
  const hit = kept.get(key);
  if (hit) return hit;
  const made = replayChartOffThread(replayChartInput(r, settings, units));
  kept.set(key, made);
  // A failed building is tried again at the next view.
  made.catch(() => kept.delete(key));
  return made;
}

/**
 * A replay's model day as the date it was ("14 November", with the year when not this year). The
 * replay runs to the end of today, so a peak at its very end is dated today, not tomorrow.
 */
function replayDayWords(startMs: number, now: number) {
  const thisYear = new Date(now).getUTCFullYear();
  return (d: number) => {
    const ms = Math.min(startMs + d * DAY_MS, now);
    const year = new Date(ms).getUTCFullYear();
    return year === thisYear ? dayText(ms) : `${dayText(ms)} ${year}`;
  };
}

/** What the page shows of the replay `r` of tank `tankId`, run on `settings`, in `units`. */
export async function replayView(
  tankId: number,
  r: Replay,
  settings: Scenario,
  units: DisplayUnits,
  now: number,
  scenarioId: number,
) {
  // Readings are not journal entries (they do not bump the journal's version): read at every view.
  const readings = readingsForChart(tankId, r.startMs, r.lengthDays, units);
  const chart = await replayChart(r, settings, units);
  return {
    startMs: r.startMs,
    lengthDays: r.lengthDays,
    ...chart,
    // Every sample as CSV from the server (routes/journal/replay-csv.ts): for the table's link
    // without scripts, and the download of a thinned replay, whose CSV made in the browser
    // would hold only the share the page got.
    csvHref: `/tanks/${tankId}/journal/replay.csv?scenario=${scenarioId}`,
    // At most MAX_CHART_READINGS of them, an even sample (readings.server.ts); the page says how many.
    readings: readings.points,
    readingsTotal: readings.total,
    unused: r.unused,
    budget: r.result.budget,
    plantNames: settings.plants.map((g) => g.name),
    // What the replay crossed (free ammonia, nitrite, the ammonia criteria, KH, oxygen), in words
    // and the person's units: a logged dose or feeding change can harm fish between two readings.
    warnings: resultWarnings(
      {
        keyFigures: r.result.keyFigures,
        warnings: r.result.warnings,
        tapWater: settings.tapWater,
        volumeL: settings.water.volumeL,
        dayWords: replayDayWords(r.startMs, now),
      },
      units,
    ),
  };
}
