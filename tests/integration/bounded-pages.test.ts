/**
 * Pages that list what a person stores stay bounded however much they store (issue 10: nobody can
 * freeze the server). A journal may hold 20,000 entries a tank; the journal page once sent every
 * one of them, 11 MB of page data rendered on the request thread, so a few reloads of a full
 * journal stalled everyone else's pages; its calendar feed, which anyone holding the address may
 * poll, read the whole journal on every poll (about 0.2 s).
 */
import { eq } from "drizzle-orm";
import { describe, expect, it } from "vitest";
import { getDb } from "~/db/client.server";
import { journalEntries } from "~/db/schema-care";
import { listJournal } from "~/features/journal/journal.server";
import { modelStartMs } from "~/features/readings/readings.server";
import { makeCalendarFeed, upcomingTasks } from "~/features/journal/calendar-feed.server";
import { readStoredSettings } from "~/features/runs/simulation.server";
import { plannedSettings, planStart } from "~/features/tanks/maintenance-plan.server";
import { readings, scenarios } from "~/db/schema";
import { loader as feedLoader } from "~/routes/calendar/feed";
import { loader as journalLoader } from "~/routes/journal/journal";
import { loader as resultsLoader } from "~/routes/scenarios/results";
import { call, get } from "../support/routes";
import { createScenario, createTank } from "../support/tanks";
import { userWithCookie } from "../support/users";

const DAY = 86_400_000;
// A page's data beyond a few hundred kB is slow to render and to send (common practice, no source).
const PAGE_DATA_BYTES = 300_000;

describe("the journal page of a full journal", () => {
  it("sends a bounded page of entries, and every entry is on exactly one page", async () => {
    const keeper = await userWithCookie();
    const tankId = createTank(keeper.id);
    const start = Date.now() - 600 * DAY;
    const count = 2_500;
    const rows = Array.from({ length: count }, (_, i) => ({
      tankId,
      doneAt: new Date(start + i * 3 * 3_600_000),
      kind: "note" as const,
      details: {},
      note: `entry ${i} ${"x".repeat(480)}`,
    }));
    for (let i = 0; i < rows.length; i += 1000)
      getDb()
        .insert(journalEntries)
        .values(rows.slice(i, i + 1000))
        .run();

    const open = async (query = "") => {
      const r = await call(journalLoader, get(`/tanks/${tankId}/journal${query}`, keeper.cookie), {
        tankId: String(tankId),
      });
      expect(r.status).toBe(200);
      expect(JSON.stringify(r.data).length).toBeLessThan(PAGE_DATA_BYTES);
      return r.data as { entries: { note: string }[]; entryPages: number; entryCount: number };
    };
    const first = await open();
    expect(first.entryCount).toBe(count);
    // Newest first: the last entry written leads the first page.
    expect(first.entries[0].note).toMatch(new RegExp(`^entry ${count - 1} `));

    const seen: string[] = [];
    for (let page = 1; page <= first.entryPages; page++) {
      const data = page === 1 ? first : await open(`?page=${page}`);
      seen.push(...data.entries.map((e) => e.note.split(" ")[1]));
    }
    expect(seen).toHaveLength(count);
    expect(new Set(seen).size).toBe(count);
    expect(seen.at(-1)).toBe("0");
    // A page past the end, or not a number, still answers a bounded page.
    await open("?page=999999");
    await open("?page=-3");
    await open("?page=abc");
  });
});

describe("the journal replay of a full journal", () => {
  it("sends each stretch's extremes and a share of the event markers, with the totals the caption gives", async () => {
    const keeper = await userWithCookie();
    const tankId = createTank(keeper.id);
    await createScenario(keeper.id, tankId, { maintenance: { waterChangeIntervalDays: 7, waterChangeFraction: 0.3 } });
    // 20,000 entries over 700 days (one every 50 minutes): some 33,000 samples, 15,000 events.
    const start = Date.now() - 700 * DAY;
    const kinds = ["water_change", "note", "filter_cleaned", "feeding_changed"] as const;
    const rows = Array.from({ length: 20_000 }, (_, i) => ({
      tankId,
      doneAt: new Date(start + i * 3_000_000),
      kind: kinds[i % kinds.length],
      details: kinds[i % kinds.length] === "feeding_changed" ? { gramsPerDay: 0.5 + (i % 7) * 0.1 } : { share: 0.2 },
      note: "",
    }));
    for (let i = 0; i < rows.length; i += 1000)
      getDb()
        .insert(journalEntries)
        .values(rows.slice(i, i + 1000))
        .run();
    const r = await call(journalLoader, get(`/tanks/${tankId}/journal`, keeper.cookie), { tankId: String(tankId) });
    expect(r.status).toBe(200);
    expect(r.data.problem).toBeNull();
    expect(JSON.stringify(r.data).length).toBeLessThan(PAGE_DATA_BYTES);
    const replay = r.data.replay;
    const sent = replay.packedSeries.t.split(",").length;
    expect(replay.samplesTotal).toBeGreaterThan(30_000);
    expect(sent).toBeLessThan(replay.samplesTotal / 4);
    expect(replay.eventsTotal).toBeGreaterThan(10_000);
    expect(replay.events.length).toBeLessThan(replay.eventsTotal / 4);
  }, 120_000);
});

describe("the calendar feed of a full journal", () => {
  it("answers quickly, with the same tasks as the whole journal gives", async () => {
    const keeper = await userWithCookie();
    const tankId = createTank(keeper.id);
    const scenarioId = await createScenario(keeper.id, tankId, {
      plants: [{ id: "stems", name: "Stems", trim: { rule: "everyDays", everyDays: 10 } }],
      maintenance: { waterChangeIntervalDays: 7, waterChangeFraction: 0.3 },
    });
    const start = Date.now() - 700 * DAY;
    const kinds = ["water_change", "note", "filter_cleaned", "plants_trimmed", "feeding_changed"] as const;
    const rows = Array.from({ length: 20_000 }, (_, i) => ({
      tankId,
      doneAt: new Date(start + i * 3_000_000),
      kind: kinds[i % kinds.length],
      details:
        kinds[i % kinds.length] === "plants_trimmed" ? { plantGroup: i % 2 ? " stems " : "Other" } : { share: 0.2 },
      note: "x".repeat(480),
    }));
    // Logged last, for an earlier day: the newest by date is not the newest by id.
    rows.push({ ...rows[0], doneAt: new Date(start + 1000), kind: "water_change", details: { share: 0.5 } });
    for (let i = 0; i < rows.length; i += 1000)
      getDb()
        .insert(journalEntries)
        .values(rows.slice(i, i + 1000))
        .run();
    const token = makeCalendarFeed(tankId, scenarioId);

    const times: number[] = [];
    let body = "";
    for (let i = 0; i < 5; i++) {
      const t = performance.now();
      const r = await call(feedLoader, get(`/calendar/${token}.ics`), { token: `${token}.ics` });
      times.push(performance.now() - t);
      expect(r.status).toBe(200);
      body = String(r.data);
    }
    // A poll of a public address should cost a page's worth, not a fifth of a second (common
    // practice, no source); the best of five, so a busy machine does not fail it.
    expect(Math.min(...times)).toBeLessThan(100);

    // The tasks equal those the whole journal gives (dates and titles in the feed).
    const row = getDb().select().from(scenarios).where(eq(scenarios.id, scenarioId)).get()!;
    const settings = plannedSettings(tankId, readStoredSettings(row.settings)!);
    const journal = listJournal(tankId);
    const expected = upcomingTasks(settings, journal, planStart(tankId, row, journal[0].doneAt), Date.now());
    expect(expected.length).toBeGreaterThan(0);
    expect(expected.some((t) => t.kind === "trim")).toBe(true);
    const summaries = [...body.matchAll(/^SUMMARY:(.*)$/gm)].map((m) => m[1].trim().split(" · ")[0]);
    const days = [...body.matchAll(/^DTSTART;VALUE=DATE:(\d{8})/gm)].map((m) => m[1]);
    const ymd = (ms: number) => new Date(ms).toISOString().slice(0, 10).replaceAll("-", "");
    expect(summaries.map((t, i) => `${days[i]} ${t}`).sort()).toEqual(
      expected.map((t) => `${ymd(t.atMs)} ${t.title}`).sort(),
    );
  });
});

describe("the results page of a run with many readings", () => {
  it("draws a bounded, even sample of them over time and says how many there are", async () => {
    const keeper = await userWithCookie();
    const tankId = createTank(keeper.id);
    const scenarioId = await createScenario(keeper.id, tankId, { run: { lengthDays: 365 } });
    // 20,000 readings (one person's whole quota) inside the run, every 25 minutes from its start.
    const start = modelStartMs(getDb().select().from(scenarios).where(eq(scenarios.id, scenarioId)).get()!);
    const count = 20_000;
    const rows = Array.from({ length: count }, (_, i) => ({
      tankId,
      takenAt: new Date(start + 60_000 + i * 1_500_000),
      nitrate: 2 + (i % 50) / 10,
      note: "y".repeat(200),
    }));
    for (let i = 0; i < rows.length; i += 1000)
      getDb()
        .insert(readings)
        .values(rows.slice(i, i + 1000))
        .run();

    const params = { tankId: String(tankId), scenarioId: String(scenarioId) };
    const page = await call(resultsLoader, get(`/tanks/${tankId}/scenarios/${scenarioId}`, keeper.cookie), params);
    expect(page.status).toBe(200);
    expect(page.data.readingsTotal).toBe(count);
    const days = (page.data.readings as { day: number }[]).map((r) => r.day);
    // A chart 720 points wide shows no more than about one reading a point (common practice, no source).
    expect(days.length).toBeLessThanOrEqual(1000);
    expect(days.length).toBeGreaterThan(100);
    // The whole span, in time order: the first and the last reading are drawn.
    expect(days[0]).toBeCloseTo(1 / 1440, 6);
    expect(days.at(-1)).toBeCloseTo((60_000 + (count - 1) * 1_500_000) / DAY, 6);
    expect(days.every((d, i) => i === 0 || d > days[i - 1])).toBe(true);
    expect(JSON.stringify(page.data.readings).length).toBeLessThan(PAGE_DATA_BYTES);
  });
});
