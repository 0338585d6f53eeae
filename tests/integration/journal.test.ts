import { eq } from "drizzle-orm";
import { describe, expect, it, vi } from "vitest";
import { getEnginePool } from "~/features/jobs/engine-pool.server";
import { getDb } from "~/db/client.server";
import { readings, scenarios, users } from "~/db/schema";
import { journalEntries } from "~/db/schema-care";
import { budgetSections } from "~/components/charts/budget-model";
import { readStoredSettings } from "~/features/runs/simulation.server";
import { action as entryApi, loader as entryApiLoader } from "~/routes/api/tank-journal-entry";
import { action as journalApiPost, loader as journalApi } from "~/routes/api/tank-journal";
import ICAL from "ical.js";
import { loader as feedLoader } from "~/routes/calendar/feed";
import { loader as exportLoader } from "~/routes/journal/export";
import { action as pageAction, loader as pageLoader } from "~/routes/journal/journal";
import { call, get, ORIGIN, post, postJson } from "../support/routes";
import { createScenario, createTank } from "../support/tanks";
import { userWithCookie } from "../support/users";
import { climbingTankWithJournal, day, DAY } from "../support/journal";
import { unpackSeries } from "~/features/runs/series-packing";

const stored = (tankId: number) => getDb().select().from(journalEntries).where(eq(journalEntries.tankId, tankId)).all();

function upload(path: string, cookie: string, text: string): Request {
  const form = new FormData();
  form.set("file", new File([text], "journal.csv", { type: "text/csv" }));
  return new Request(ORIGIN + path, { method: "POST", body: form, headers: { Cookie: cookie, Origin: ORIGIN } });
}

async function keeperWithTank() {
  const keeper = await userWithCookie();
  const tankId = createTank(keeper.id);
  // A tank without scheduled changes, so the journal alone moves nitrate (our own worked example).
  await createScenario(keeper.id, tankId, {
    water: { volumeL: 100, startNitrate: 9 },
    fish: { feedGPerDay: 0.5 },
    maintenance: { waterChangeIntervalDays: 7, waterChangeFraction: 0.3 },
    tapWater: { nitrate: 0, roShare: 0 },
  });
  return { keeper, tankId: String(tankId) };
}

describe("the journal", () => {
  it("adds an entry from the form, stores it canonical and lists it", async () => {
    const { keeper, tankId } = await keeperWithTank();
    const r = await call(
      pageAction,
      post(
        `/tanks/${tankId}/journal`,
        { intent: "add", date: day(3), kind: "water_change", water_changed_percent: "50", tap_nitrate_no3_mg_l: "10" },
        keeper.cookie,
      ),
      { tankId },
    );
    expect(r.status).toBe(200);
    const [row] = stored(Number(tankId));
    expect(row.kind).toBe("water_change");
    // docs/sources.md §0: NO3⁻ → N × 0.22590
    expect((row.details as { tapNitrateMgN: number }).tapNitrateMgN).toBeCloseTo(10 * 0.2259, 4);
    expect((row.details as { share: number }).share).toBeCloseTo(0.5, 12);
    const page = await call(pageLoader, get(`/tanks/${tankId}/journal`, keeper.cookie), { tankId });
    expect(page.data.entries[0].what).toContain("50 % changed");
  });

  it("a keeper who reads nitrate as N types tap nitrate in mg/L NO3-N: label, range and message in N, stored exactly, shown as typed; the CSV keeps NO3", async () => {
    const { keeper, tankId } = await keeperWithTank();
    getDb().update(users).set({ nitrateUnit: "N" }).where(eq(users.id, keeper.id)).run();
    const page0 = await call(pageLoader, get(`/tanks/${tankId}/journal`, keeper.cookie), { tankId });
    expect(page0.data.units).toEqual({ nitrate: "asN", ammonia: "asN" });
    // 400 mg/L NO3, the field's ceiling, is 90.4 mg/L NO3-N: × 14.007 / 62.004 (IUPAC atomic
    // weights N 14.007, O 15.999; docs/sources.md §0).
    const tooMuch = await call(
      pageAction,
      post(
        `/tanks/${tankId}/journal`,
        { intent: "add", date: day(3), kind: "water_change", water_changed_percent: "50", tap_nitrate_no3_mg_l: "95" },
        keeper.cookie,
      ),
      { tankId },
    );
    expect(tooMuch.status).toBe(400);
    expect(tooMuch.data.errors.tap_nitrate_no3_mg_l).toBe("Tap water nitrate must be between 0 and 90.4 mg/L NO3-N");
    expect(stored(Number(tankId))).toHaveLength(0);

    const r = await call(
      pageAction,
      post(
        `/tanks/${tankId}/journal`,
        {
          intent: "add",
          date: day(3),
          kind: "water_change",
          water_changed_percent: "50",
          tap_nitrate_no3_mg_l: "2.37",
        },
        keeper.cookie,
      ),
      { tankId },
    );
    expect(r.status).toBe(200);
    // Typed as N, stored as N: no conversion at all.
    expect((stored(Number(tankId))[0].details as { tapNitrateMgN: number }).tapNitrateMgN).toBe(2.37);
    const page = await call(pageLoader, get(`/tanks/${tankId}/journal`, keeper.cookie), { tankId });
    expect(page.data.entries[0].what).toBe("50 % changed, tap water 2.37 mg/L NO3-N");
    // The file keeps its column's unit, mg/L NO3: 2.37 × 62.004 / 14.007 = 10.491 (IUPAC atomic weights).
    const exported = await call(exportLoader, get(`/tanks/${tankId}/journal/export`, keeper.cookie), { tankId });
    const csv = String((exported as unknown as { data: unknown }).data);
    const [header, row] = csv.replace(/^\uFEFF/, "").split(/\r?\n/);
    const cell = Number(row.split(",")[header.split(",").indexOf("tap_nitrate_no3_mg_l")]);
    expect(cell).toBeCloseTo((2.37 * 62.004) / 14.007, 3);
  });

  it("a value typed in mg/L NO3 comes back exactly as typed, however many figures", async () => {
    const { keeper, tankId } = await keeperWithTank();
    await call(
      pageAction,
      post(
        `/tanks/${tankId}/journal`,
        {
          intent: "add",
          date: day(3),
          kind: "water_change",
          water_changed_percent: "33.3",
          tap_nitrate_no3_mg_l: "12.345",
        },
        keeper.cookie,
      ),
      { tankId },
    );
    const mgN = (stored(Number(tankId))[0].details as { tapNitrateMgN: number }).tapNitrateMgN;
    // mg/L NO3 → mg N/L: × 14.007 / 62.004 (IUPAC atomic weights; docs/sources.md §0).
    expect(mgN).toBeCloseTo((12.345 * 14.007) / 62.004, 10);
    const list = await call(journalApi, get(`/api/tanks/${tankId}/journal`, keeper.cookie), { tankId });
    const entryId = String(list.data.entries[0].id);
    // Changing only the note through the API keeps the nitrate as it was (the fields' text round trip is exact).
    const patched = await call(
      entryApi,
      postJson(`/api/tanks/${tankId}/journal/${entryId}`, { note: "checked" }, keeper.cookie, "PATCH"),
      { tankId, entryId },
    );
    expect(patched.status).toBe(200);
    expect((stored(Number(tankId))[0].details as { tapNitrateMgN: number }).tapNitrateMgN).toBe(mgN);
    const page = await call(pageLoader, get(`/tanks/${tankId}/journal`, keeper.cookie), { tankId });
    expect(page.data.entries[0].what).toBe("33.3 % changed, tap water 12.35 mg/L NO3");
  });

  it("refuses a form with a field next to it and stores nothing", async () => {
    const { keeper, tankId } = await keeperWithTank();
    const r = await call(
      pageAction,
      post(
        `/tanks/${tankId}/journal`,
        { intent: "add", date: day(1), kind: "water_change", water_changed_percent: "150", fish_count: "3" },
        keeper.cookie,
      ),
      { tankId },
    );
    expect(r.status).toBe(400);
    expect(r.data.errors.water_changed_percent).toMatch(/between 1 and 95/);
    expect(r.data.errors.fish_count).toMatch(/does not use/);
    expect(stored(Number(tankId))).toHaveLength(0);
  });

  it("replays the tank as it happened: a 50 % change on its day halves the modelled nitrate", async () => {
    const { keeper, tankId } = await keeperWithTank();
    for (const [d, kind, extra] of [
      [10, "note", {}],
      [4, "water_change", { water_changed_percent: "50" }],
    ] as const) {
      await call(
        pageAction,
        post(`/tanks/${tankId}/journal`, { intent: "add", date: day(d), kind, ...extra }, keeper.cookie),
        { tankId },
      );
    }
    // The replay and the forecast run on the engine pool's interactive lane, as the person's (not on the request thread).
    const pool = getEnginePool();
    const runs = vi.spyOn(pool, "run");
    const page = await call(pageLoader, get(`/tanks/${tankId}/journal`, keeper.cookie), { tankId });
    expect(runs.mock.calls.length).toBeGreaterThanOrEqual(2);
    for (const [task, place] of runs.mock.calls) {
      expect(task.kind).toBe("simulate");
      expect(place).toEqual({ lane: "interactive", owner: `user:${keeper.id}` });
    }
    runs.mockRestore();
    const { t, no3 } = unpackSeries(page.data.replay.packedSeries);
    const at = t.flatMap((x: number, k: number) => (Math.abs(x - 6) < 1e-9 ? [k] : []));
    expect(at).toHaveLength(2);
    // Dilution with nitrate-free water: (1 − 0.5) of what was there (mass balance)
    // (the page sends four significant figures, as the results page does: within half a unit of
    // each value's fourth figure, display-figures.ts)
    const half4th = (v: number) => 0.5 * 10 ** (Math.floor(Math.log10(Math.abs(v))) - 3);
    expect(Math.abs(no3[at[1]] - no3[at[0]] * 0.5)).toBeLessThanOrEqual(
      half4th(no3[at[1]]) + 0.5 * half4th(no3[at[0]]) + 1e-12,
    );
    // No other water change: the scenario's weekly 30 % is replaced by the journal
    const drops = no3.filter((v: number, k: number) => k > 0 && v < no3[k - 1] * 0.9).length;
    expect(drops).toBe(1);
  });

  it("books plants put in from the journal as a row of the replay's nitrogen budget", async () => {
    const { keeper, tankId } = await keeperWithTank();
    const page0 = await call(pageLoader, get(`/tanks/${tankId}/journal`, keeper.cookie), { tankId });
    expect(page0.data.replay).toBeNull();
    const settings = readStoredSettings(
      getDb()
        .select()
        .from(scenarios)
        .where(eq(scenarios.tankId, Number(tankId)))
        .get()!.settings,
    )!;
    const group = settings.plants[0];
    expect(group).toBeDefined();
    await call(
      pageAction,
      post(
        `/tanks/${tankId}/journal`,
        { intent: "add", date: day(6), kind: "plants_added", plant_group: group.name, plant_dry_g: "3" },
        keeper.cookie,
      ),
      { tankId },
    );
    const page = await call(pageLoader, get(`/tanks/${tankId}/journal`, keeper.cookie), { tankId });
    expect(page.data.replay.unused).toEqual([]);
    const [inputs] = budgetSections(page.data.replay.budget, page.data.replay.plantNames);
    const row = inputs.rows.find((r) => r.key === "plantsAdded");
    // 3 g dry at 2–4 % nitrogen is 60–120 mg N (Duarte 1992, docs/sources.md)
    expect(row?.mg).toBeGreaterThanOrEqual(60);
    expect(row?.mg).toBeLessThanOrEqual(120);
    expect(page.data.replay.budget.inputs.total).toBeGreaterThanOrEqual(row!.mg);
  });

  it("says how many entries are older than the replay's two years, instead of leaving them out silently", async () => {
    const { keeper, tankId } = await keeperWithTank();
    const now = Date.now();
    getDb()
      .insert(journalEntries)
      .values([
        { tankId: Number(tankId), doneAt: new Date(now - 800 * DAY), kind: "note", details: {} },
        { tankId: Number(tankId), doneAt: new Date(now - 760 * DAY), kind: "water_change", details: { share: 0.5 } },
        { tankId: Number(tankId), doneAt: new Date(now - 10 * DAY), kind: "water_change", details: { share: 0.3 } },
      ])
      .run();
    const page = await call(pageLoader, get(`/tanks/${tankId}/journal`, keeper.cookie), { tankId });
    // 730 days replayed at most (a model choice, journal-replay.server.ts).
    expect(page.data.replay.unused).toEqual([
      expect.stringMatching(
        /^2 entries from before \d{4}-\d{2}-\d{2} are left out: the replay covers the last two years\.$/,
      ),
    ]);
  });

  it("round-trips through CSV: the export uploads again to the same entries", async () => {
    const { keeper, tankId } = await keeperWithTank();
    const csv = [
      "date,kind,water_changed_percent,water_changed_l,tap_nitrate_no3_mg_l,ro_percent,filter_thoroughness,gravel_cleaned_percent,plant_group,plant_dry_g,feed_g_per_day,fish_count,ammonia_n_mg_l,note",
      `${day(9)},water_change,40,,12.5,20,,,,,,,,"weekly, late"`,
      `${day(8)},filter_cleaned,,,,,light,,,,,,,`,
      `${day(7)},plants_added,,,,,,,Stem plants,3,,,,floating bunch`,
      `${day(6)},feeding_changed,,,,,,,,,0.3,,,`,
      `${day(5)},fish_added,,,,,,,,,,4,,`,
      `${day(4)},water_change,,30,,,,,,,,,,`,
    ].join("\n");
    const up = await call(pageAction, upload(`/tanks/${tankId}/journal`, keeper.cookie, csv), { tankId });
    expect(up.status).toBe(200);
    expect(up.data.stored).toBe(6);
    const exported = await call(exportLoader, get(`/tanks/${tankId}/journal/export`, keeper.cookie), { tankId });
    const text = await (exported as unknown as { data: unknown }).data;
    const body = typeof text === "string" ? text : "";
    const other = await keeperWithTank();
    const again = await call(pageAction, upload(`/tanks/${other.tankId}/journal`, other.keeper.cookie, body), {
      tankId: other.tankId,
    });
    expect(again.status).toBe(200);
    const strip = (rows: ReturnType<typeof stored>) =>
      rows.map((r) => ({ doneAt: r.doneAt, kind: r.kind, details: r.details, note: r.note }));
    expect(strip(stored(Number(other.tankId)))).toEqual(strip(stored(Number(tankId))));
  });

  it("refuses a file with bad rows, naming each by its line, and stores nothing", async () => {
    const { keeper, tankId } = await keeperWithTank();
    const csv = [
      "date,kind,water_changed_percent,fish_count,note",
      `${day(3)},water_change,30,,`,
      `not-a-date,water_change,30,,`,
      `${day(2)},boiled_the_tank,,,`,
      `${day(1)},fish_added,,2.5,`,
    ].join("\n");
    const r = await call(pageAction, upload(`/tanks/${tankId}/journal`, keeper.cookie, csv), { tankId });
    expect(r.status).toBe(400);
    expect(r.data.message).toMatch(/Nothing was stored/);
    expect(r.data.problems.map((p: { line: number }) => p.line)).toEqual([3, 4, 5]);
    expect(stored(Number(tankId))).toHaveLength(0);
  });

  it("answers the API: list, add, change, delete; bad bodies with field paths", async () => {
    const { keeper, tankId } = await keeperWithTank();
    const added = await call(
      journalApiPost,
      postJson(
        `/api/tanks/${tankId}/journal`,
        { date: day(2), kind: "ammonia_dosed", ammonia_n_mg_l: 2 },
        keeper.cookie,
      ),
      { tankId },
    );
    expect(added.status).toBe(201);
    const entryId = String(added.data.entry.id);
    const bad = await call(
      journalApiPost,
      postJson(`/api/tanks/${tankId}/journal`, { date: day(2), kind: "water_change" }, keeper.cookie),
      { tankId },
    );
    expect(bad.status).toBe(400);
    expect(bad.data.issues[0].path).toBe("water_changed_percent");
    const patched = await call(
      entryApi,
      postJson(`/api/tanks/${tankId}/journal/${entryId}`, { ammonia_n_mg_l: 1 }, keeper.cookie, "PATCH"),
      { tankId, entryId },
    );
    expect(patched.status).toBe(200);
    expect(patched.data.entry.details.ammoniaMgN).toBe(1);
    const list = await call(journalApi, get(`/api/tanks/${tankId}/journal`, keeper.cookie), { tankId });
    expect(list.data.entries).toHaveLength(1);
    const gone = await call(
      entryApi,
      postJson(`/api/tanks/${tankId}/journal/${entryId}`, {}, keeper.cookie, "DELETE"),
      { tankId, entryId },
    );
    expect(gone.status).toBe(204);
    expect(stored(Number(tankId))).toHaveLength(0);
  });

  it("gives another keeper 404 everywhere and changes nothing", async () => {
    const { keeper, tankId } = await keeperWithTank();
    const added = await call(
      journalApiPost,
      postJson(`/api/tanks/${tankId}/journal`, { date: day(2), kind: "note", note: "mine" }, keeper.cookie),
      { tankId },
    );
    const entryId = String(added.data.entry.id);
    const stranger = await userWithCookie();
    const c = stranger.cookie;
    const answers = [
      await call(pageLoader, get(`/tanks/${tankId}/journal`, c), { tankId }),
      await call(pageAction, post(`/tanks/${tankId}/journal`, { intent: "delete", entryId }, c), { tankId }),
      await call(pageAction, upload(`/tanks/${tankId}/journal`, c, "date,kind\n2026-01-01,note"), { tankId }),
      await call(exportLoader, get(`/tanks/${tankId}/journal/export`, c), { tankId }),
      await call(journalApi, get(`/api/tanks/${tankId}/journal`, c), { tankId }),
      await call(journalApiPost, postJson(`/api/tanks/${tankId}/journal`, { date: day(1), kind: "note" }, c), {
        tankId,
      }),
      await call(entryApi, postJson(`/api/tanks/${tankId}/journal/${entryId}`, { note: "theirs" }, c, "PATCH"), {
        tankId,
        entryId,
      }),
      await call(entryApi, postJson(`/api/tanks/${tankId}/journal/${entryId}`, {}, c, "DELETE"), { tankId, entryId }),
    ];
    expect(answers.map((a) => a.status)).toEqual([404, 404, 404, 404, 404, 404, 404, 404]);
    expect(stored(Number(tankId)).map((r) => r.note)).toEqual(["mine"]);
    // The keeper's own entry id under another tank is not theirs either
    const strangerTank = String(createTank(stranger.id));
    const cross = await call(entryApi, postJson(`/api/tanks/${strangerTank}/journal/${entryId}`, {}, c, "DELETE"), {
      tankId: strangerTank,
      entryId,
    });
    expect(cross.status).toBe(404);
    expect(
      (await call(entryApiLoader, get(`/api/tanks/${tankId}/journal/${entryId}`, c), { tankId, entryId })).status,
    ).toBe(405);
    expect(getDb().select().from(readings).all().length).toBeGreaterThanOrEqual(0);
  });
});

describe("the forecast", () => {
  it("says when nitrate crosses the upper target and which change keeps it under", async () => {
    // Nitrate must climb past the target (tests/support/journal.ts).
    const { keeper, tankId: id } = await climbingTankWithJournal();
    const page = await call(pageLoader, get(`/tanks/${id}/journal`, keeper.cookie), { tankId: id });
    // The tank's default upper target, 4.52 mg N/L, is 20 mg/L NO3 (docs/sources.md §0: ×4.4268)
    expect(page.data.forecast).toMatch(
      /^Nitrate passes your upper target of 20 mg\/L NO3 around \d+ \w+ \([\d.]+ mg\/L NO3 before the next planned change\); a \d+ % change by \d+ \w+ keeps it below 20 mg\/L NO3 until \d+ \w+\.$/,
    );
    // In the person's units: as nitrogen, 20 mg/L NO3 is 4.52 mg/L NO3-N (docs/sources.md §0: ×0.22590)
    getDb().update(users).set({ nitrateUnit: "N" }).where(eq(users.id, keeper.id)).run();
    const asN = await call(pageLoader, get(`/tanks/${id}/journal`, keeper.cookie), { tankId: id });
    expect(asN.data.forecast).toMatch(/upper target of 4\.52 mg\/L NO3-N .* keeps it below 4\.52 mg\/L NO3-N/);
  });
});

describe("the calendar feed", () => {
  it("parses back as a valid RFC 5545 calendar with one event per planned task in the next 90 days; revoked answers 404", async () => {
    const keeper = await userWithCookie();
    const tankId = createTank(keeper.id);
    await createScenario(keeper.id, tankId, {
      maintenance: { waterChangeIntervalDays: 7, waterChangeFraction: 0.3 },
      filter: { cleaningIntervalDays: 30 },
    });
    const id = String(tankId);
    await call(
      pageAction,
      post(
        `/tanks/${id}/journal`,
        { intent: "add", date: day(2), kind: "water_change", water_changed_percent: "30" },
        keeper.cookie,
      ),
      { tankId: id },
    );
    const page = await call(pageLoader, get(`/tanks/${id}/journal`, keeper.cookie), { tankId: id });
    const on = await call(
      pageAction,
      post(`/tanks/${id}/journal`, { intent: "calendar-on", scenarioId: String(page.data.scenarioId) }, keeper.cookie),
      { tankId: id },
    );
    const url = new URL(on.data.calendarUrl as string);
    const token = url.pathname.split("/").at(-1)!;
    const feed = await feedLoader({ params: { token }, request: new Request(url), context: {} } as never);
    expect(feed.status).toBe(200);
    expect(feed.headers.get("Content-Type")).toMatch(/^text\/calendar/);
    // Parsed with ical.js, an independent RFC 5545 reader
    const cal = new ICAL.Component(ICAL.parse(await feed.text()));
    expect(cal.name).toBe("vcalendar");
    const events = cal.getAllSubcomponents("vevent").map((v) => new ICAL.Event(v));
    const titles = events.map((e) => e.summary);
    // Weekly changes resumed from the one 2 days ago: days 5, 12, …, 89 → 13; monthly cleaning, never
    // logged, from the journal's first day 2 days ago (a model choice): 28, 58, 88 → 3 (our own worked example)
    expect(titles.filter((t) => t.startsWith("Water change"))).toHaveLength(13);
    expect(titles.filter((t) => t.startsWith("Clean the filter"))).toHaveLength(3);
    for (const e of events) expect(e.startDate.toJSDate().getTime()).toBeLessThan(Date.now() + 90 * DAY);
    await call(pageAction, post(`/tanks/${id}/journal`, { intent: "calendar-off" }, keeper.cookie), { tankId: id });
    const gone = await feedLoader({ params: { token }, request: new Request(url), context: {} } as never);
    expect(gone.status).toBe(404);
  });
});
