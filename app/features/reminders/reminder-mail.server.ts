/**
 * The reminder e-mail: the tank's planned tasks for the next two weeks and the journal's forecast
 * (the journal feature's own), the usual caution, and a one-click unsubscribe link (RFC 8058)
 * that works without signing in. Null when a "due" reminder has nothing due today.
 */
import { eq } from "drizzle-orm";
import { getDb } from "~/db/client.server";
import { tanks, users } from "~/db/schema";
import { getEnv, type Env } from "~/env.server";
import type { OutgoingMail } from "~/email.server";
import { upcomingTasks } from "~/features/journal/calendar-feed.server";
import { forecastCautions, forecastSentence } from "~/features/journal/forecast-text.server";
import { forecastJournal, type Forecast } from "~/features/journal/journal-replay.server";
import { planScenario, planStart, tankModelSettings } from "~/features/tanks/maintenance-plan.server";
import { displayUnitsFor, type DisplayUnits } from "~/utils/display-units";
import { listJournal } from "~/features/journal/journal.server";
import type { ReminderRow } from "~/features/reminders/reminder-schedule.server";
import { unsubscribeToken } from "~/features/reminders/unsubscribe-token.server";
import { readStoredSettings } from "~/features/runs/simulation.server";
import { DAY_MS, startOfDay, weekdayText } from "~/utils/dates";
import { wallClock } from "~/utils/time-zones";
import { zoneFor } from "~/features/accounts/time-zone.server";

const DIGEST_DAYS = 14;
function forecastText(f: Forecast | null, units: DisplayUnits): string {
  return (
    forecastSentence(f, units) ?? "No forecast yet: log what you did in the tank's journal and the model follows it."
  );
}

/** What the forecast crosses in the days ahead, one line each, under the forecast. */
function cautionLines(f: Forecast | null, units: DisplayUnits): string[] {
  const cautions = forecastCautions(f, units);
  return cautions.length ? ["", "Where fish could be harmed in the days ahead:", ...cautions.map((c) => `- ${c}`)] : [];
}

/** Where links in mail point: APP_URL (required in production), else this machine's port. */
function baseUrl(env: Env): string {
  return env.APP_URL ?? `http://localhost:${env.PORT}`;
}

/** `at` is the instant of the check; the keeper's days are those of their wall clock then. */
export async function reminderMail(row: ReminderRow, at: number): Promise<OutgoingMail | null> {
  const db = getDb();
  const tank = db.select().from(tanks).where(eq(tanks.id, row.tankId)).get();
  const user = db.select().from(users).where(eq(users.id, row.userId)).get();
  if (!tank || !user || tank.ownerId !== user.id) return null;
  const now = wallClock(at, zoneFor(null, user).zone);
  // The scenario the tank's plan is over, as the tank page's upcoming list uses.
  const scenario = planScenario(tank.id);
  const stored = scenario ? readStoredSettings(scenario.settings) : null;
  // The tank's own plan where the keeper edited one, as the tank page and calendar show it, and
  // the tank's nitrate band as the forecast's target, as the journal page says it.
  const settings = stored ? tankModelSettings(tank, stored) : null;
  const units = displayUnitsFor(user);
  const entries = listJournal(tank.id);
  // Where a task kind never logged counts from, as the tank page counts it.
  const start = scenario ? planStart(tank.id, scenario, entries[0]?.doneAt ?? null) : null;
  const tasks = settings && start ? upcomingTasks(settings, entries, start, now, DIGEST_DAYS) : [];
  const today = startOfDay(now);
  const dueToday = tasks.filter((t) => t.atMs < today + DAY_MS);
  if (row.mode === "due" && dueToday.length === 0) return null;
  let forecast: Forecast | null;
  try {
    // The server's own run (null), not the keeper's: their runs in flight must not empty the mail.
    forecast = settings && start ? await forecastJournal(settings, entries, now, null, start) : null;
  } catch {
    // A forecast the engine refuses (bad stored settings) still leaves the task list worth sending.
    forecast = null;
  }
  const env = getEnv();
  const link = new URL(`/reminders/unsubscribe/${unsubscribeToken(row.id)}`, baseUrl(env)).toString();
  const taskLines = tasks.length
    ? tasks.map((t) => `- ${weekdayText(t.atMs)}: ${t.title}`)
    : ["- Nothing planned in the next two weeks."];
  const text = [
    `Reminders for ${tank.name}`,
    "",
    row.mode === "due" ? "Due today:" : `Planned for the next ${DIGEST_DAYS} days:`,
    ...(row.mode === "due" ? dueToday.map((t) => `- ${t.title}`) : taskLines),
    "",
    `Forecast: ${forecastText(forecast, units)}`,
    ...cautionLines(forecast, units),
    "",
    "A model is not a water test: test the water before and after, and trust the test over the forecast.",
    "When fish gasp, hide or die, test at once and change water; ask your local shop or a vet.",
    "",
    `Stop these reminders: ${link}`,
  ].join("\n");
  return {
    to: user.email,
    subject: `${row.mode === "due" ? "Due today" : "This week"} · ${tank.name} · Fernwater`,
    text,
    headers: {
      "List-Unsubscribe": `<${link}>`,
      "List-Unsubscribe-Post": "List-Unsubscribe=One-Click",
    },
  };
}
