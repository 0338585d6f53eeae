import { eq } from "drizzle-orm";
import { describe, expect, it } from "vitest";
import { getDb } from "~/db/client.server";
import { readings, scenarios } from "~/db/schema";
import { loader as tankReadingsApi } from "~/routes/api/tank-readings";
import { loader as exportLoader } from "~/routes/readings/export";
import { action as listAction, loader as listLoader } from "~/routes/readings/list";
import { loader as templateLoader } from "~/routes/readings/template";
import { action as uploadAction } from "~/routes/readings/upload";
import { action as editAction, loader as editLoader } from "~/routes/scenarios/edit";
import { action as newAction } from "~/routes/scenarios/new";
import { loader as resultsLoader } from "~/routes/scenarios/results";
import { call, get, ORIGIN, post } from "../support/routes";
import { createScenario, createTank, setupFormFields, startScenarioOn } from "../support/tanks";
import { userWithCookie } from "../support/users";

const DAY = 86_400_000;

function upload(
  path: string,
  cookie: string,
  text: string,
  fields: Record<string, string> = {},
  name = "readings.csv",
): Request {
  const form = new FormData();
  for (const [k, v] of Object.entries(fields)) form.set(k, v);
  form.set("file", new File([text], name, { type: "text/csv" }));
  return new Request(ORIGIN + path, { method: "POST", body: form, headers: { Cookie: cookie, Origin: ORIGIN } });
}

const stored = (tankId: number) => getDb().select().from(readings).where(eq(readings.tankId, tankId)).all();

/** A date `days` before today, ISO, at 08:30. */
const daysAgo = (days: number) =>
  new Date(Math.floor(Date.now() / DAY) * DAY - days * DAY + 8.5 * 3_600_000).toISOString().slice(0, 16);

describe("readings by hand", () => {
  it("adds a reading typed in the keeper's units and stores it canonical", async () => {
    const keeper = await userWithCookie();
    const tankId = String(createTank(keeper.id));
    const added = await call(
      listAction,
      post(
        `/tanks/${tankId}/readings`,
        { intent: "add", takenAt: "2026-01-10T08:30", nitrate: "20", tan: "0,25", ph: "7.1", note: "weekly" },
        keeper.cookie,
      ),
      { tankId },
    );
    expect(added.status).toBe(302);
    expect(added.location).toBe(`/tanks/${tankId}/readings?saved=added`);
    const [row] = stored(Number(tankId));
    // Default units: nitrate as NO3, ammonia as NH3 — docs/sources.md §0: NO3⁻→N ×0.22590, NH3→N ×0.82244
    expect(row.nitrate).toBeCloseTo(20 * 0.2259, 3);
    expect(row.tan).toBeCloseTo(0.25 * 0.82244, 3);
    expect(row.takenAt.getTime()).toBe(Date.UTC(2026, 0, 10, 8, 30));
    const page = await call(listLoader, get(`/tanks/${tankId}/readings`, keeper.cookie), { tankId });
    expect(page.data.rows[0].values.nitrate).toBeCloseTo(20, 6);
    expect(page.data.rows[0].takenAt).toBe("2026-01-10 08:30");
  });

  it("puts each problem beside its field and stores nothing", async () => {
    const keeper = await userWithCookie();
    const tankId = String(createTank(keeper.id));
    const cases: [Record<string, string>, string, RegExp][] = [
      [{ takenAt: "", nitrate: "5" }, "takenAt", /date and time/],
      [{ takenAt: "2026-01-10T08:30", nitrate: "lots" }, "nitrate", /must be a number/],
      [{ takenAt: "2026-01-10T08:30", nitrate: "5000" }, "nitrate", /between 0 and 885.3 mg\/L NO3/],
      [{ takenAt: "2099-01-10T08:30", nitrate: "5" }, "takenAt", /future/],
      [{ takenAt: "2026-01-10T08:30" }, "", /at least one test result/],
    ];
    for (const [fields, key, message] of cases) {
      const bad = await call(
        listAction,
        post(`/tanks/${tankId}/readings`, { intent: "add", ...fields }, keeper.cookie),
        { tankId },
      );
      expect(bad.status, key).toBe(400);
      expect(bad.data.errors[key], key).toMatch(message);
      expect(bad.data.values.nitrate ?? "").toBe(fields.nitrate ?? "");
    }
    expect(stored(Number(tankId))).toHaveLength(0);
  });

  it("refuses a second reading at the same time, edits and deletes", async () => {
    const keeper = await userWithCookie();
    const tankId = String(createTank(keeper.id));
    const add = (takenAt: string, nitrate: string) =>
      call(listAction, post(`/tanks/${tankId}/readings`, { intent: "add", takenAt, nitrate }, keeper.cookie), {
        tankId,
      });
    expect((await add("2026-01-10T08:30", "10")).status).toBe(302);
    expect((await add("2026-01-11T08:30", "12")).status).toBe(302);
    const twice = await add("2026-01-10T08:30", "11");
    expect(twice.status).toBe(400);
    expect(twice.data.errors.takenAt).toMatch(/already a reading at 2026-01-10 08:30/);
    const [first, second] = stored(Number(tankId)).sort((a, b) => a.takenAt.getTime() - b.takenAt.getTime());
    const moved = await call(
      listAction,
      post(
        `/tanks/${tankId}/readings`,
        { intent: "update", id: String(second.id), takenAt: "2026-01-10T08:30", nitrate: "12" },
        keeper.cookie,
      ),
      { tankId },
    );
    expect(moved.data.errors.takenAt).toMatch(/already a reading/);
    const edited = await call(
      listAction,
      post(
        `/tanks/${tankId}/readings`,
        { intent: "update", id: String(second.id), takenAt: "2026-01-11T09:00", nitrate: "15", note: "retest" },
        keeper.cookie,
      ),
      { tankId },
    );
    expect(edited.status).toBe(302);
    const after = stored(Number(tankId)).find((r) => r.id === second.id)!;
    expect(after.note).toBe("retest");
    expect(after.takenAt.getTime()).toBe(Date.UTC(2026, 0, 11, 9, 0));
    const gone = await call(
      listAction,
      post(`/tanks/${tankId}/readings`, { intent: "delete", id: String(first.id) }, keeper.cookie),
      { tankId },
    );
    expect(gone.status).toBe(302);
    expect(stored(Number(tankId)).map((r) => r.id)).toEqual([second.id]);
  });

  it("sorts and pages the table, and keeps another keeper's tank private", async () => {
    const keeper = await userWithCookie();
    const other = await userWithCookie();
    const tankId = createTank(keeper.id);
    getDb()
      .insert(readings)
      .values(
        Array.from({ length: 30 }, (_v, i) => ({
          tankId,
          takenAt: new Date(Date.UTC(2026, 0, 1) + i * DAY),
          nitrate: (i * 7) % 30,
          ph: i < 3 ? null : 7,
        })),
      )
      .run();
    const page2 = await call(listLoader, get(`/tanks/${tankId}/readings?page=2`, keeper.cookie), {
      tankId: String(tankId),
    });
    expect(page2.data.total).toBe(30);
    expect(page2.data.pages).toBe(2);
    expect(page2.data.rows).toHaveLength(5);
    // newest first by default: page 2 ends with the oldest
    expect(page2.data.rows.at(-1).takenAt).toBe("2026-01-01 00:00");
    const byNitrate = await call(listLoader, get(`/tanks/${tankId}/readings?sort=nitrate&dir=asc`, keeper.cookie), {
      tankId: String(tankId),
    });
    const values = byNitrate.data.rows.map((r: { values: { nitrate: number } }) => r.values.nitrate);
    expect(values).toEqual([...values].sort((a, b) => a - b));
    // unmeasured values go last whichever way
    const byPh = await call(listLoader, get(`/tanks/${tankId}/readings?sort=ph&dir=asc&page=2`, keeper.cookie), {
      tankId: String(tankId),
    });
    expect(byPh.data.rows.slice(-3).every((r: { values: { ph: number | null } }) => r.values.ph === null)).toBe(true);
    // nonsense in the query string falls back to the defaults
    const odd = await call(listLoader, get(`/tanks/${tankId}/readings?sort=drop&dir=up&page=-3`, keeper.cookie), {
      tankId: String(tankId),
    });
    expect(odd.status).toBe(200);
    expect(odd.data.query).toMatchObject({ sort: "takenAt", dir: "desc", page: 1 });
    const peek = await call(listLoader, get(`/tanks/${tankId}/readings`, other.cookie), { tankId: String(tankId) });
    expect(peek.status).toBe(404);
    const poke = await call(
      listAction,
      post(`/tanks/${tankId}/readings`, { intent: "delete", id: "1" }, other.cookie),
      { tankId: String(tankId) },
    );
    expect(poke.status).toBe(404);
    expect(stored(tankId)).toHaveLength(30);
  });
});

describe("CSV upload, export and template", () => {
  it("stores nothing while a row is bad, naming its line; stores all once fixed; skips them on a second upload", async () => {
    const keeper = await userWithCookie();
    const tankId = String(createTank(keeper.id));
    const path = `/tanks/${tankId}/readings/upload`;
    const good = [
      "datetime,tan_nh3_mg_l,nitrate_no3_mg_l,note",
      `${daysAgo(9)},0,15,`,
      `${daysAgo(6)},0.25,20,`,
      `${daysAgo(3)},0,25,`,
    ];
    const bad = [...good.slice(0, 2), `${daysAgo(6).slice(0, 10)}T07:00,0,twenty,typo`, ...good.slice(2)];
    const refused = await call(uploadAction, upload(path, keeper.cookie, bad.join("\r\n")), { tankId });
    expect(refused.status).toBe(400);
    expect(refused.data.error).toMatch(/^Nothing was stored: one row needs attention/);
    expect(refused.data.problems).toEqual([
      { line: 3, message: expect.stringMatching(/Nitrate must be a number.*“twenty”/) },
    ]);
    expect(stored(Number(tankId))).toHaveLength(0);

    const accepted = await call(uploadAction, upload(path, keeper.cookie, good.join("\r\n")), { tankId });
    expect(accepted.status).toBe(200);
    expect(accepted.data).toMatchObject({ stored: 3, error: null, skipped: [] });
    expect(stored(Number(tankId))).toHaveLength(3);

    const again = await call(
      uploadAction,
      upload(path, keeper.cookie, [...good, `${daysAgo(1)},0,30,new`].join("\n")),
      { tankId },
    );
    expect(again.data.stored).toBe(1);
    expect(again.data.skipped.map((s: { line: number }) => s.line)).toEqual([2, 3, 4]);
    expect(stored(Number(tankId))).toHaveLength(4);
  });

  it("takes units from the form for unnamed columns", async () => {
    const keeper = await userWithCookie();
    const tankId = String(createTank(keeper.id));
    const r = await call(
      uploadAction,
      upload(`/tanks/${tankId}/readings/upload`, keeper.cookie, `datetime,nitrate,temperature\n${daysAgo(2)},4,77\n`, {
        "unit.nitrate": "asN",
        "unit.temperatureC": "F",
      }),
      { tankId },
    );
    expect(r.data.stored).toBe(1);
    const [row] = stored(Number(tankId));
    expect(row.nitrate).toBe(4);
    expect(row.temperatureC).toBeCloseTo(25, 6);
    const odd = await call(
      uploadAction,
      upload(`/tanks/${tankId}/readings/upload`, keeper.cookie, `datetime,nitrate\n${daysAgo(1)},4\n`, {
        "unit.nitrate": "furlongs",
      }),
      { tankId },
    );
    expect(odd.status).toBe(400);
    expect(odd.data.error).toMatch(/Choose the units/);
  });

  it("refuses a file over 1 MB, a form that is not an upload, and an empty file, with a clear message", async () => {
    const keeper = await userWithCookie();
    const tankId = String(createTank(keeper.id));
    const path = `/tanks/${tankId}/readings/upload`;
    const big = "datetime,note\n" + `${daysAgo(1)},${"x".repeat(400)}\n`.repeat(2700);
    const tooBig = await call(uploadAction, upload(path, keeper.cookie, big), { tankId });
    expect(tooBig.status).toBe(400);
    expect(tooBig.data.error).toBe("The file is larger than 1 MB.");
    const plain = await call(uploadAction, post(path, { file: "datetime,nitrate" }, keeper.cookie), { tankId });
    expect(plain.status).toBe(400);
    expect(plain.data.error).toMatch(/file upload/);
    const empty = await call(uploadAction, upload(path, keeper.cookie, "  \n"), { tankId });
    expect(empty.data.error).toMatch(/Choose a CSV file/);
    expect(stored(Number(tankId))).toHaveLength(0);
  });

  it("exports in the keeper's units with formula-like notes neutralised, and the template and export upload back unchanged", async () => {
    const keeper = await userWithCookie();
    const tankId = createTank(keeper.id);
    getDb()
      .insert(readings)
      .values([
        { tankId, takenAt: new Date(Date.UTC(2026, 0, 5, 8)), nitrate: 4.518, note: "=1+2" },
        { tankId, takenAt: new Date(Date.UTC(2026, 0, 8, 8)), nitrate: 3, tan: 0.1 },
      ])
      .run();
    const res = await call(exportLoader, get(`/tanks/${tankId}/readings/export`, keeper.cookie), {
      tankId: String(tankId),
    });
    expect(res.status).toBe(200);
    expect(res.headers.get("Content-Type")).toMatch(/text\/csv/);
    expect(res.headers.get("Content-Disposition")).toMatch(/attachment; filename="test-tank-readings.csv"/);
    const lines = (res.data as string).replace(/^\uFEFF/, "").split("\r\n");
    expect(lines[0]).toBe("datetime,tan_nh3_mg_l,nitrite_no2_mg_l,nitrate_no3_mg_l,ph,kh_dkh,temperature_c,note");
    // 4.518 mg N/L is 20 mg/L as NO3 (docs/sources.md §0)
    expect(lines[1]).toMatch(/^2026-01-05T08:00,,,(19\.99\d*|20),,,,'=1\+2$/);

    const template = await call(templateLoader, get(`/tanks/${tankId}/readings/template`, keeper.cookie), {
      tankId: String(tankId),
    });
    const otherTank = String(createTank(keeper.id, "Second"));
    const back = await call(
      uploadAction,
      upload(`/tanks/${otherTank}/readings/upload`, keeper.cookie, template.data as string),
      { tankId: otherTank },
    );
    expect(back.data).toMatchObject({ stored: 3, error: null });
    const exported = await call(
      uploadAction,
      upload(`/tanks/${otherTank}/readings/upload`, keeper.cookie, res.data as string),
      { tankId: otherTank },
    );
    expect(exported.data).toMatchObject({ stored: 2, error: null });
    // The neutralising quote comes off on upload: the note is back exactly as it was (issue 10).
    const copy = stored(Number(otherTank)).find((r) => r.note === "=1+2")!;
    expect(copy.nitrate).toBeCloseTo(4.518, 4);

    const api = await call(tankReadingsApi, get(`/api/tanks/${tankId}/readings`, keeper.cookie), {
      tankId: String(tankId),
    });
    expect(api.data.readings).toHaveLength(2);
    expect(api.data.readings[0]).toMatchObject({ takenAt: "2026-01-05T08:00:00.000Z", nitrateMgNPerL: 4.518 });
  });
});

describe("readings on a scenario's timeline", () => {
  it("stores the run's start date from the setup form and refuses a bad one beside the field", async () => {
    const keeper = await userWithCookie();
    const tankId = String(createTank(keeper.id));
    const bad = await call(
      newAction,
      post(`/tanks/${tankId}/scenarios/new`, setupFormFields({ startDate: "2026-02-30" }), keeper.cookie),
      { tankId },
    );
    expect(bad.status).toBe(400);
    expect(bad.data.errors.startDate).toMatch(/like 2026-03-01/);
    expect(bad.data.form.startDate).toBe("2026-02-30");
    const made = await call(
      newAction,
      post(`/tanks/${tankId}/scenarios/new`, setupFormFields({ startDate: "2026-01-01" }), keeper.cookie),
      { tankId },
    );
    expect(made.status).toBe(302);
    const scenarioId = made.location!.split("/").pop()!;
    const row = getDb()
      .select()
      .from(scenarios)
      .where(eq(scenarios.id, Number(scenarioId)))
      .get()!;
    expect(row.startDate?.getTime()).toBe(Date.UTC(2026, 0, 1));
    const form = await call(editLoader, get(`/tanks/${tankId}/scenarios/${scenarioId}/edit`, keeper.cookie), {
      tankId,
      scenarioId,
    });
    expect(form.data.form.startDate).toBe("2026-01-01");
    // Emptied: back to the day the scenario was made.
    await call(
      editAction,
      post(`/tanks/${tankId}/scenarios/${scenarioId}/edit`, setupFormFields({ startDate: "" }), keeper.cookie),
      { tankId, scenarioId },
    );
    expect(
      getDb()
        .select()
        .from(scenarios)
        .where(eq(scenarios.id, Number(scenarioId)))
        .get()!.startDate,
    ).toBeNull();
  });

  it("draws the readings within the run on the results chart, in the viewer's units, on model days", async () => {
    const keeper = await userWithCookie();
    const tankId = createTank(keeper.id);
    const scenarioId = await createScenario(keeper.id, tankId, { run: { lengthDays: 30 } });
    startScenarioOn(scenarioId, Date.UTC(2026, 0, 1));
    getDb()
      .insert(readings)
      .values([
        { tankId, takenAt: new Date(Date.UTC(2025, 11, 31)), nitrate: 2 }, // before day 0
        { tankId, takenAt: new Date(Date.UTC(2026, 0, 3, 12)), nitrate: 4.518, tan: 0.0822 }, // day 2.5
        { tankId, takenAt: new Date(Date.UTC(2026, 0, 10)), ph: 7 }, // no nitrogen species
        { tankId, takenAt: new Date(Date.UTC(2026, 1, 15)), nitrate: 3 }, // after day 30
      ])
      .run();
    const page = await call(resultsLoader, get(`/tanks/${tankId}/scenarios/${scenarioId}`, keeper.cookie), {
      tankId: String(tankId),
      scenarioId: String(scenarioId),
    });
    expect(page.status).toBe(200);
    expect(page.data.readings).toHaveLength(1);
    const [r] = page.data.readings;
    expect(r.day).toBe(2.5);
    // 4.518 mg N/L = 20 mg/L NO3; 0.0822 mg N/L = 0.1 mg/L NH3 (docs/sources.md §0)
    expect(r.no3).toBeCloseTo(20, 2);
    expect(r.tan).toBeCloseTo(0.1, 3);
    expect(r.no2).toBeNull();
  });
});
