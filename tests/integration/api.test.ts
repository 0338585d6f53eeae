import { describe, expect, it } from "vitest";
import { SCHEMA_VERSION } from "../../models";
import { action as previewAction } from "~/routes/api/preview";
import { loader as runLoader } from "~/routes/api/run";
import { loader as scenarioLoader, action as scenarioAction } from "~/routes/api/scenario";
import { loader as scenarioRunLoader, action as scenarioRunAction } from "~/routes/api/scenario-run";
import { loader as tankScenariosLoader, action as tankScenariosAction } from "~/routes/api/tank-scenarios";
import { loader as tanksLoader } from "~/routes/api/tanks";
import { loader as exportLoader } from "~/routes/scenarios/export";
import { action as importAction } from "~/routes/scenarios/import";
import { ORIGIN, call, get, postJson } from "../support/routes";
import { countScenarios, createScenario, createTank } from "../support/tanks";
import { userWithCookie } from "../support/users";

describe("JSON API", () => {
  it("lists tanks and scenarios, creates a scenario, runs it and returns the run as JSON and CSV", async () => {
    const keeper = await userWithCookie();
    const tankId = String(createTank(keeper.id, "API tank"));
    const tanks = await call(tanksLoader, get("/api/tanks", keeper.cookie));
    expect(tanks.status).toBe(200);
    expect(tanks.data.tanks).toEqual([expect.objectContaining({ id: Number(tankId), name: "API tank" })]);

    const created = await call(
      tankScenariosAction,
      postJson(
        `/api/tanks/${tankId}/scenarios`,
        { name: "From the API", settings: { water: { volumeL: 80 }, run: { lengthDays: 30 } } },
        keeper.cookie,
      ),
      { tankId },
    );
    expect(created.status).toBe(201);
    const scenarioId = String(created.data.scenario.id);
    expect(created.data.scenario.settings.water.volumeL).toBe(80);

    const list = await call(tankScenariosLoader, get(`/api/tanks/${tankId}/scenarios`, keeper.cookie), { tankId });
    expect(list.data.scenarios).toHaveLength(1);

    const one = await call(scenarioLoader, get(`/api/scenarios/${scenarioId}`, keeper.cookie), { scenarioId });
    expect(one.data.scenario.name).toBe("From the API");

    const run = await call(scenarioRunAction, postJson(`/api/scenarios/${scenarioId}/run`, {}, keeper.cookie), {
      scenarioId,
    });
    expect(run.status).toBe(200); // the run stored at creation is reused
    expect(run.data.reused).toBe(true);
    const got = await call(scenarioRunLoader, get(`/api/scenarios/${scenarioId}/run`, keeper.cookie), { scenarioId });
    expect(got.data.run.id).toBe(run.data.run.id);

    const runId = String(run.data.run.id);
    const full = await call(runLoader, get(`/api/runs/${runId}`, keeper.cookie), { runId });
    expect(full.data.run.series.t[0]).toBe(0);
    expect(full.data.run.keyFigures.nitrateEnd).toBeGreaterThan(0);
    const csv = await call(runLoader, get(`/api/runs/${runId}?format=csv`, keeper.cookie), { runId });
    expect(csv.headers.get("Content-Type")).toMatch(/text\/csv/);
    const lines = (csv.data as string).trim().split(/\r\n/);
    expect(lines[0]).toMatch(/^day,tan_mg_n_per_l,free_nh3_mg_n_per_l,nitrite_mg_n_per_l,nitrate_mg_n_per_l/);
    expect(lines[0]).toMatch(/,tan_long_term_limit_mg_n_per_l,tan_short_term_criterion_mg_n_per_l$/);
    expect(lines.length - 1).toBe(full.data.run.series.t.length);

    const updated = await call(
      scenarioAction,
      postJson(
        `/api/scenarios/${scenarioId}`,
        { settings: { water: { volumeL: 160 }, run: { lengthDays: 30 } } },
        keeper.cookie,
        "PUT",
      ),
      { scenarioId },
    );
    expect(updated.status).toBe(200);
    expect(updated.data.scenario.settings.water.volumeL).toBe(160);
    const rerun = await call(scenarioRunLoader, get(`/api/scenarios/${scenarioId}/run`, keeper.cookie), { scenarioId });
    expect(rerun.data.run.id).not.toBe(run.data.run.id);
    // The new run's CSV carries the caution lines too, at its own settings.
    const newId = String(rerun.data.run.id);
    const newCsv = await call(runLoader, get(`/api/runs/${newId}?format=csv`, keeper.cookie), { runId: newId });
    expect((newCsv.data as string).split(/\r\n/)[0]).toMatch(/tan_long_term_limit_mg_n_per_l/);
  });

  it("answers validation errors as JSON with field paths, and saves nothing", async () => {
    const keeper = await userWithCookie();
    const tankId = String(createTank(keeper.id));
    const before = countScenarios();
    const bad = await call(
      tankScenariosAction,
      postJson(
        `/api/tanks/${tankId}/scenarios`,
        { name: "Bad", settings: { water: { volumeL: -1, pH: "seven" } } },
        keeper.cookie,
      ),
      { tankId },
    );
    expect(bad.status).toBe(400);
    expect(bad.data.status).toBe(400);
    expect(bad.data.issues.map((i: { path: string }) => i.path)).toEqual(
      expect.arrayContaining(["settings.water.volumeL", "settings.water.pH"]),
    );
    const noName = await call(
      tankScenariosAction,
      postJson(`/api/tanks/${tankId}/scenarios`, { settings: {} }, keeper.cookie),
      { tankId },
    );
    expect(noName.data.issues[0].path).toBe("name");
    const notJson = await call(
      tankScenariosAction,
      new Request(`${ORIGIN}/api/tanks/${tankId}/scenarios`, {
        method: "POST",
        body: "{oops",
        headers: { "Content-Type": "application/json", Cookie: keeper.cookie },
      }),
      { tankId },
    );
    expect(notJson.status).toBe(400);
    expect(notJson.data.error).toMatch(/not valid JSON/);
    const newer = await call(
      tankScenariosAction,
      postJson(`/api/tanks/${tankId}/scenarios`, { name: "Future", settings: { schemaVersion: 99 } }, keeper.cookie),
      { tankId },
    );
    expect(newer.status).toBe(400);
    expect(newer.data.issues[0].message).toMatch(/newer version of Fernwater/);
    expect(countScenarios()).toBe(before);
  });

  it("answers 401 to anonymous callers and 404 for another keeper's things", async () => {
    const owner = await userWithCookie();
    const other = await userWithCookie();
    const tankId = createTank(owner.id);
    const scenarioId = String(await createScenario(owner.id, tankId, { run: { lengthDays: 20 } }));
    const anon = await call(tanksLoader, get("/api/tanks"));
    expect(anon.status).toBe(401);
    expect(anon.data.error).toMatch(/Sign in/);
    expect((await call(scenarioLoader, get(`/api/scenarios/${scenarioId}`, other.cookie), { scenarioId })).status).toBe(
      404,
    );
    expect(
      (await call(tankScenariosLoader, get(`/api/tanks/${tankId}/scenarios`, other.cookie), { tankId: String(tankId) }))
        .status,
    ).toBe(404);
    const runs = await call(scenarioRunLoader, get(`/api/scenarios/${scenarioId}/run`, owner.cookie), { scenarioId });
    const runId = String(runs.data.run.id);
    const leaked = await call(runLoader, get(`/api/runs/${runId}`, other.cookie), { runId });
    expect(leaked.status).toBe(404);
    expect(leaked.data.error).toMatch(/no such run/);
  });

  it("previews unsaved settings and what-if changes without saving", async () => {
    const keeper = await userWithCookie();
    const tankId = createTank(keeper.id);
    const scenarioId = await createScenario(keeper.id, tankId, { fish: { feedGPerDay: 1 }, run: { lengthDays: 60 } });
    const before = countScenarios();
    const preview = await call(
      previewAction,
      postJson("/api/preview", { settings: { run: { lengthDays: 30 } } }, keeper.cookie),
    );
    expect(preview.status).toBe(200);
    expect(preview.data.series.t.at(-1)).toBe(30);
    const tooLong = await call(
      previewAction,
      postJson("/api/preview", { settings: { run: { lengthDays: 700 } } }, keeper.cookie),
    );
    expect(tooLong.status).toBe(400);
    expect(tooLong.data.issues[0].path).toBe("settings.run.lengthDays");

    const base = await call(previewAction, postJson("/api/preview", { scenarioId, whatIf: {} }, keeper.cookie));
    const lessFood = await call(
      previewAction,
      postJson("/api/preview", { scenarioId, whatIf: { feedGPerDay: 0.3 } }, keeper.cookie),
    );
    // Common practice, no source: feeding less ends with less nitrate.
    expect(lessFood.data.keyFigures.nitrateEnd).toBeLessThan(base.data.keyFigures.nitrateEnd);
    const display = await call(
      previewAction,
      postJson("/api/preview?units=display", { scenarioId, whatIf: {} }, keeper.cookie),
    );
    // Nitrate as NO3 = nitrate as N / 0.22590 (molar masses).
    expect(display.data.keyFigures.nitrateEnd).toBeCloseTo(base.data.keyFigures.nitrateEnd / 0.2259, 1);
    const badChange = await call(
      previewAction,
      postJson("/api/preview", { scenarioId, whatIf: { feedGPerDay: -1 } }, keeper.cookie),
    );
    expect(badChange.status).toBe(400);
    expect(countScenarios()).toBe(before);
  });
});

describe("scenario files", () => {
  it("exports a scenario and imports it back; refuses newer files with a clear message", async () => {
    const keeper = await userWithCookie();
    const tankId = createTank(keeper.id);
    const scenarioId = await createScenario(
      keeper.id,
      tankId,
      { water: { volumeL: 77 }, run: { lengthDays: 20 } },
      "Exported one",
    );
    const params = { tankId: String(tankId), scenarioId: String(scenarioId) };
    const file = await call(
      exportLoader,
      get(`/tanks/${tankId}/scenarios/${scenarioId}/export`, keeper.cookie),
      params,
    );
    expect(file.headers.get("Content-Disposition")).toMatch(/exported-one\.fernwater\.json/);
    const json = typeof file.data === "string" ? JSON.parse(file.data) : file.data;
    expect(json).toMatchObject({ fernwater: "scenario", schemaVersion: SCHEMA_VERSION, name: "Exported one" });

    const upload = (content: string) => {
      const form = new FormData();
      form.set("file", new File([content], "shared.fernwater.json", { type: "application/json" }));
      return new Request(`${ORIGIN}/tanks/${tankId}/import`, {
        method: "POST",
        body: form,
        headers: { Cookie: keeper.cookie, Origin: ORIGIN },
      });
    };
    const before = countScenarios();
    const imported = await call(importAction, upload(JSON.stringify(json)), { tankId: String(tankId) });
    expect(imported.status).toBe(302);
    expect(countScenarios()).toBe(before + 1);

    // a file written before model v2 (schema 1) still imports, migrated
    const v1 = {
      ...json,
      schemaVersion: 1,
      settings: { water: { volumeL: 50 }, lowOxygen: { enabled: true, denitrificationCapacityMgNPerDay: 9 } },
    };
    expect((await call(importAction, upload(JSON.stringify(v1)), { tankId: String(tankId) })).status).toBe(302);
    expect(countScenarios()).toBe(before + 2);

    const newer = await call(importAction, upload(JSON.stringify({ ...json, schemaVersion: 7 })), {
      tankId: String(tankId),
    });
    expect(newer.status).toBe(400);
    expect(newer.data.errors.file).toMatch(/newer version of Fernwater \(schema 7\)/);
    const broken = await call(importAction, upload("not json at all"), { tankId: String(tankId) });
    expect(broken.data.errors.file).toMatch(/not valid JSON/);
    const invalidValues = await call(
      importAction,
      upload(JSON.stringify({ ...json, settings: { water: { volumeL: -3 } } })),
      { tankId: String(tankId) },
    );
    expect(invalidValues.data.errors.file).toMatch(/water\.volumeL/);
    const tooBig = await call(importAction, upload("x".repeat(300 * 1024)), { tankId: String(tankId) });
    expect(tooBig.data.errors.file).toMatch(/larger than 256 kB/);
    expect(countScenarios()).toBe(before + 2);
  });

  it("PATCH merges a partial settings object into the saved one; unknown names answer 400 naming them, and nothing changes", async () => {
    const keeper = await userWithCookie();
    const tankId = String(createTank(keeper.id, "Patch tank"));
    const created = await call(
      tankScenariosAction,
      postJson(
        `/api/tanks/${tankId}/scenarios`,
        {
          name: "Patched",
          settings: { water: { volumeL: 80, temperatureC: 22 }, fish: { feedGPerDay: 2.5 }, run: { lengthDays: 45 } },
        },
        keeper.cookie,
      ),
      { tankId },
    );
    const scenarioId = String(created.data.scenario.id);
    const patched = await call(
      scenarioAction,
      postJson(`/api/scenarios/${scenarioId}`, { settings: { water: { volumeL: 120 } } }, keeper.cookie, "PATCH"),
      { scenarioId },
    );
    expect(patched.status).toBe(200);
    const after = patched.data.scenario.settings;
    expect(after.water.volumeL).toBe(120);
    // What the patch left out stays as saved, not back to its default.
    expect(after.water.temperatureC).toBe(22);
    expect(after.fish.feedGPerDay).toBe(2.5);
    expect(after.run.lengthDays).toBe(45);
    expect(after.plants).toEqual(created.data.scenario.settings.plants);

    const before = JSON.stringify(
      (await call(scenarioLoader, get(`/api/scenarios/${scenarioId}`, keeper.cookie), { scenarioId })).data,
    );
    const typo = await call(
      scenarioAction,
      postJson(
        `/api/scenarios/${scenarioId}`,
        { settings: { water: { volumeLitres: 50, temperatureC: 30 }, fsh: {} } },
        keeper.cookie,
        "PATCH",
      ),
      { scenarioId },
    );
    expect(typo.status).toBe(400);
    expect(typo.data.error).toMatch(/water\.volumeLitres/);
    expect(typo.data.error).toMatch(/fsh/);
    expect(typo.data.issues.map((i: { path: string }) => i.path)).toEqual(
      expect.arrayContaining(["settings.water.volumeLitres", "settings.fsh"]),
    );
    expect(
      JSON.stringify(
        (await call(scenarioLoader, get(`/api/scenarios/${scenarioId}`, keeper.cookie), { scenarioId })).data,
      ),
    ).toBe(before);
    // The same for a new scenario and a preview.
    const newTypo = await call(
      tankScenariosAction,
      postJson(
        `/api/tanks/${tankId}/scenarios`,
        { name: "x", settings: { plants: [{ id: "a", mass: 3 }] } },
        keeper.cookie,
      ),
      { tankId },
    );
    expect(newTypo.status).toBe(400);
    expect(newTypo.data.error).toMatch(/plants\.0\.mass/);
    const patchNotObject = await call(
      scenarioAction,
      postJson(`/api/scenarios/${scenarioId}`, { settings: [1] }, keeper.cookie, "PATCH"),
      { scenarioId },
    );
    expect(patchNotObject.status).toBe(400);
  });
});
