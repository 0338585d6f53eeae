/**
 * The journal replay's chart as CSV with every sample. The page gets a thinned share of a long
 * replay (thin-series.ts), so a CSV made in the browser from it would hold stretches' extremes,
 * not the replay; this one is made from the kept run itself (journal-runs.server.ts), in the
 * same columns as the chart's own CSV, written on the chores thread (a full journal's replay is
 * some 33,000 samples).
 */
import { journalScenario } from "~/features/journal/journal-scenario.server";
import { replayJournal } from "~/features/journal/journal-replay.server";
import { journalOf } from "~/features/journal/journal.server";
import { replayCsvOffThread } from "~/features/jobs/chores-pool.server";
import { replayChartInput } from "~/features/journal/replay-chart.server";
import type { TankRow } from "~/features/tanks/tanks.server";
import type { DisplayUnits } from "~/utils/display-units";

/** The CSV text, or null when there is nothing to replay (no scenario, no entries). */
export async function replayCsv(
  tank: TankRow,
  scenarioParam: string | null,
  units: DisplayUnits,
  now = Date.now(),
): Promise<string | null> {
  const { settings } = journalScenario(tank, scenarioParam);
  if (!settings) return null;
  const replay = await replayJournal(settings, journalOf(tank), now, tank.ownerId);
  if (!replay) return null;
  return replayCsvOffThread(replayChartInput(replay, settings, units));
}
