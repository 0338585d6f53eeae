/**
 * A tank's calendar feed as its subscriber's calendar reads it: turns the feed on from the
 * journal page, fetches it by its token, and parses it with ical.js, an independent RFC 5545
 * reader. Returns the events' titles (or titles and start dates).
 */
import ICAL from "ical.js";
import { loader as feedLoader } from "~/routes/calendar/feed";
import { action as journalAction, loader as journalLoader } from "~/routes/journal/journal";
import { call, get, post } from "./routes";

export async function calendarTitles(cookie: string, tankId: string): Promise<string[]> {
  return (await calendarEvents(cookie, tankId)).map((e) => e.summary);
}

export async function calendarEvents(cookie: string, tankId: string): Promise<{ summary: string; startMs: number }[]> {
  const page = await call(journalLoader, get(`/tanks/${tankId}/journal`, cookie), { tankId });
  const on = await call(
    journalAction,
    post(`/tanks/${tankId}/journal`, { intent: "calendar-on", scenarioId: String(page.data.scenarioId) }, cookie),
    { tankId },
  );
  const url = new URL(on.data.calendarUrl as string);
  const feed = await feedLoader({
    params: { token: url.pathname.split("/").at(-1)! },
    request: new Request(url),
    context: {},
  } as never);
  const cal = new ICAL.Component(ICAL.parse(await feed.text()));
  return cal.getAllSubcomponents("vevent").map((v) => {
    const e = new ICAL.Event(v);
    // All-day events: the date as written, read as UTC midnight.
    const d = e.startDate;
    return { summary: e.summary, startMs: Date.UTC(d.year, d.month - 1, d.day) };
  });
}
