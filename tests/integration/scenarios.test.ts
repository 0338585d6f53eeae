import { eq } from "drizzle-orm";
import { describe, expect, it } from "vitest";
import { getDb } from "~/db/client.server";
import { readings, runs, scenarios, tanks } from "~/db/schema";
import { action as newAction, loader as newLoader } from "~/routes/scenarios/new";
import { action as editAction, loader as editLoader } from "~/routes/scenarios/edit";
import { loader as resultsLoader } from "~/routes/scenarios/results";
import { action as tankAction, loader as tankLoader } from "~/routes/tanks/detail";
import { action as tanksAction, loader as tanksLoader } from "~/routes/tanks/list";
import { call, get, post } from "../support/routes";
import { countScenarios, createScenario, createTank, setupFormFields } from "../support/tanks";
import { userWithCookie } from "../support/users";

describe("tanks", () => {
  it("creates, renames and lists a tank; refuses an empty name beside the field", async () => {
    const keeper = await userWithCookie();
    const bad = await call(tanksAction, post("/tanks", { name: "  " }, keeper.cookie));
    expect(bad.status).toBe(400);
    expect(bad.data.errors.name).toMatch(/name/);
    const made = await call(tanksAction, post("/tanks", { name: "Hall tank", notes: "by the door" }, keeper.cookie));
    expect(made.status).toBe(302);
    const tankId = made.location!.split("/").pop()!;
    const renamed = await call(
      tankAction,
      post(
        `/tanks/${tankId}`,
        { intent: "settings", name: "Hallway tank", notes: "", nitrateLow: 5, nitrateHigh: 20 },
        keeper.cookie,
      ),
      { tankId },
    );
    expect(renamed.status).toBe(302);
    const list = await call(tanksLoader, get("/tanks", keeper.cookie));
    expect(list.data.tanks.map((t: { name: string }) => t.name)).toEqual(["Hallway tank"]);
    // 20 mg/L as NO3 is stored as 4.518 mg N/L (WHO/molar masses: NO3 → N × 0.22590).
    const row = getDb()
      .select()
      .from(tanks)
      .where(eq(tanks.id, Number(tankId)))
      .get()!;
    expect(row.nitrateTargetHigh).toBeCloseTo(20 * 0.2259, 3);
  });

  it("refuses a nitrate band whose low end is above its high end", async () => {
    const keeper = await userWithCookie();
    const tankId = String(createTank(keeper.id));
    const bad = await call(
      tankAction,
      post(
        `/tanks/${tankId}`,
        { intent: "settings", name: "T", notes: "", nitrateLow: 30, nitrateHigh: 10 },
        keeper.cookie,
      ),
      { tankId },
    );
    expect(bad.status).toBe(400);
    expect(bad.data.errors.nitrateLow).toMatch(/low end/);
  });

  it("deletes a tank with its scenarios, runs and readings only when confirmed", async () => {
    const keeper = await userWithCookie();
    const tankId = createTank(keeper.id);
    await createScenario(keeper.id, tankId, { run: { lengthDays: 30 } });
    getDb().insert(readings).values({ tankId, takenAt: new Date(), nitrate: 3 }).run();
    const unconfirmed = await call(tankAction, post(`/tanks/${tankId}`, { intent: "delete-tank" }, keeper.cookie), {
      tankId: String(tankId),
    });
    expect(unconfirmed.status).toBe(400);
    expect(unconfirmed.data.errors.confirm).toMatch(/Tick the box/);
    expect(getDb().select().from(tanks).where(eq(tanks.id, tankId)).all()).toHaveLength(1);
    const done = await call(
      tankAction,
      post(`/tanks/${tankId}`, { intent: "delete-tank", confirm: "yes" }, keeper.cookie),
      {
        tankId: String(tankId),
      },
    );
    expect(done.status).toBe(302);
    expect(getDb().select().from(tanks).where(eq(tanks.id, tankId)).all()).toHaveLength(0);
    expect(getDb().select().from(scenarios).where(eq(scenarios.tankId, tankId)).all()).toHaveLength(0);
    expect(getDb().select().from(readings).where(eq(readings.tankId, tankId)).all()).toHaveLength(0);
  });

  it("answers 404 for another keeper's tank, and sends anonymous visitors to sign in", async () => {
    const owner = await userWithCookie();
    const other = await userWithCookie();
    const tankId = String(createTank(owner.id));
    expect((await call(tankLoader, get(`/tanks/${tankId}`, other.cookie), { tankId })).status).toBe(404);
    expect(
      (
        await call(tankAction, post(`/tanks/${tankId}`, { intent: "delete-tank", confirm: "yes" }, other.cookie), {
          tankId,
        })
      ).status,
    ).toBe(404);
    expect((await call(tankLoader, get(`/tanks/${tankId}`), { tankId })).status).toBe(302);
    expect((await call(tankLoader, get(`/tanks/abc`, owner.cookie), { tankId: "abc" })).status).toBe(404);
  });
});

describe("scenario setup", () => {
  it("saves a valid form, runs the engine in the action and redirects to the results", async () => {
    const keeper = await userWithCookie();
    const tankId = String(createTank(keeper.id));
    const result = await call(newAction, post(`/tanks/${tankId}/scenarios/new`, setupFormFields(), keeper.cookie), {
      tankId,
    });
    expect(result.status).toBe(302);
    const scenarioId = result.location!.split("/").pop()!;
    const row = getDb()
      .select()
      .from(scenarios)
      .where(eq(scenarios.id, Number(scenarioId)))
      .get()!;
    const settings = row.settings as {
      fish: { proteinFraction: number };
      maintenance: { waterChangeFraction: number };
    };
    // Shares are typed in percent and stored as fractions.
    expect(settings.fish.proteinFraction).toBeCloseTo(0.42, 10);
    expect(settings.maintenance.waterChangeFraction).toBeCloseTo(0.25, 10);
    const stored = getDb()
      .select()
      .from(runs)
      .where(eq(runs.scenarioId, Number(scenarioId)))
      .all();
    expect(stored).toHaveLength(1);

    // Opening the results reuses the stored run.
    const page = await call(resultsLoader, get(`/tanks/${tankId}/scenarios/${scenarioId}`, keeper.cookie), {
      tankId,
      scenarioId,
    });
    expect(page.status).toBe(200);
    expect(page.data.results.runId).toBe(stored[0].id);
    expect(page.data.results.packedSeries.t.split(",").length).toBeGreaterThan(60);
  });

  it("converts US gallons, °F and nitrate as NO3 to the engine's units", async () => {
    const keeper = await userWithCookie();
    getDb()
      .update((await import("~/db/schema")).users)
      .set({ volumeUnit: "usgal", temperatureUnit: "F" })
      .where(eq((await import("~/db/schema")).users.id, keeper.id))
      .run();
    const tankId = String(createTank(keeper.id));
    const result = await call(
      newAction,
      post(
        `/tanks/${tankId}/scenarios/new`,
        setupFormFields({ "water.volumeL": 10, "water.temperatureC": 77, "water.startNitrate": 50 }),
        keeper.cookie,
      ),
      { tankId },
    );
    expect(result.status).toBe(302);
    const row = getDb()
      .select()
      .from(scenarios)
      .where(eq(scenarios.id, Number(result.location!.split("/").pop())))
      .get()!;
    const water = (row.settings as { water: { volumeL: number; temperatureC: number; startNitrate: number } }).water;
    expect(water.volumeL).toBeCloseTo(37.85411784, 6); // NIST SP 811: US gallon = 3.785411784 L exactly
    expect(water.temperatureC).toBeCloseTo(25, 6); // 77 °F = 25 °C (definition of the scales)
    // WHO Guidelines (4th ed.): 50 mg/L as NO3 = 11.3 mg/L as N; 11.295 computed from atomic weights N 14.007, O 15.999.
    expect(water.startNitrate).toBeCloseTo(11.295, 3);
  });

  it("shows each error beside its field, keeps the input and saves nothing", async () => {
    const keeper = await userWithCookie();
    const tankId = String(createTank(keeper.id));
    const before = countScenarios();
    const result = await call(
      newAction,
      post(
        `/tanks/${tankId}/scenarios/new`,
        setupFormFields({ name: "", "water.volumeL": -5, "water.pH": 15, "fish.fractionEaten": "lots" }),
        keeper.cookie,
      ),
      { tankId },
    );
    expect(result.status).toBe(400);
    expect(result.data.errors.name).toMatch(/name/);
    expect(result.data.errors["water.volumeL"]).toMatch(/Water volume must be at least 1 L/);
    expect(result.data.errors["water.pH"]).toMatch(/at most 10/);
    expect(result.data.errors["fish.fractionEaten"]).toMatch(/must be a number/);
    const volume = result.data.form.sections[0].fields.find((f: { name: string }) => f.name === "water.volumeL");
    expect(volume.value).toBe("-5");
    expect(countScenarios()).toBe(before);
  });

  it("adds and removes plant rows without saving (the form without JavaScript)", async () => {
    const keeper = await userWithCookie();
    const tankId = String(createTank(keeper.id));
    const before = countScenarios();
    const added = await call(
      newAction,
      post(
        `/tanks/${tankId}/scenarios/new`,
        setupFormFields({ intent: "add-plant", newPlantForm: "floating" }),
        keeper.cookie,
      ),
      { tankId },
    );
    expect(added.status).toBe(200);
    expect(added.data.form.plants).toHaveLength(1);
    const growthForm = added.data.form.plants[0].fields.find((f: { name: string }) => f.name === "plants.0.growthForm");
    expect(growthForm.value).toBe("floating");
    // The typed values survive the round trip.
    expect(added.data.form.sections[0].fields.find((f: { name: string }) => f.name === "water.volumeL").value).toBe(
      "100",
    );

    const withRows = setupFormFields({
      intent: "remove-plant:0",
      "plants.0.id": "a",
      "plants.0.name": "First",
      "plants.3.id": "b",
      "plants.3.name": "Second",
    });
    const removed = await call(newAction, post(`/tanks/${tankId}/scenarios/new`, withRows, keeper.cookie), { tankId });
    expect(removed.data.form.plants.map((p: { id: string }) => p.id)).toEqual(["b"]);
    expect(countScenarios()).toBe(before);
  });

  it("edits a scenario without drifting untouched values, and saves as new on request", async () => {
    const keeper = await userWithCookie();
    getDb()
      .update((await import("~/db/schema")).users)
      .set({ volumeUnit: "impgal" })
      .where(eq((await import("~/db/schema")).users.id, keeper.id))
      .run();
    const tankId = createTank(keeper.id);
    const scenarioId = await createScenario(keeper.id, tankId, {
      water: { volumeL: 123.456 },
      run: { lengthDays: 30 },
    });
    const params = { tankId: String(tankId), scenarioId: String(scenarioId) };
    const page = await call(editLoader, get(`/tanks/${tankId}/scenarios/${scenarioId}/edit`, keeper.cookie), params);
    const fields: Record<string, string> = { intent: "save", name: "Renamed" };
    for (const section of page.data.form.sections) for (const f of section.fields) fields[f.name] = f.value;
    for (const row of page.data.form.plants) {
      fields[`plants.${row.index}.id`] = row.id;
      for (const f of row.fields) fields[f.name] = f.value;
    }
    const saved = await call(
      editAction,
      post(`/tanks/${tankId}/scenarios/${scenarioId}/edit`, fields, keeper.cookie),
      params,
    );
    expect(saved.data?.errors).toBeUndefined();
    expect(saved.status).toBe(302);
    const row = getDb().select().from(scenarios).where(eq(scenarios.id, scenarioId)).get()!;
    expect(row.name).toBe("Renamed");
    expect((row.settings as { water: { volumeL: number } }).water.volumeL).toBe(123.456);

    const copy = await call(
      editAction,
      post(
        `/tanks/${tankId}/scenarios/${scenarioId}/edit`,
        { ...fields, intent: "save-as-new", name: "Copy" },
        keeper.cookie,
      ),
      params,
    );
    expect(copy.status).toBe(302);
    expect(copy.location).not.toBe(`/tanks/${tankId}/scenarios/${scenarioId}`);
    expect(getDb().select().from(scenarios).where(eq(scenarios.tankId, tankId)).all()).toHaveLength(2);
  });

  it("answers 404 for another keeper's scenario and tank", async () => {
    const owner = await userWithCookie();
    const other = await userWithCookie();
    const tankId = createTank(owner.id);
    const scenarioId = await createScenario(owner.id, tankId, { run: { lengthDays: 20 } });
    const params = { tankId: String(tankId), scenarioId: String(scenarioId) };
    expect(
      (await call(resultsLoader, get(`/tanks/${tankId}/scenarios/${scenarioId}`, other.cookie), params)).status,
    ).toBe(404);
    expect(
      (
        await call(
          editAction,
          post(`/tanks/${tankId}/scenarios/${scenarioId}/edit`, setupFormFields(), other.cookie),
          params,
        )
      ).status,
    ).toBe(404);
    expect(
      (await call(newLoader, get(`/tanks/${tankId}/scenarios/new`, other.cookie), { tankId: String(tankId) })).status,
    ).toBe(404);
    // A scenario of another tank of the same owner is not reachable under the wrong tank either.
    const secondTank = createTank(owner.id);
    expect(
      (
        await call(resultsLoader, get(`/tanks/${secondTank}/scenarios/${scenarioId}`, owner.cookie), {
          tankId: String(secondTank),
          scenarioId: String(scenarioId),
        })
      ).status,
    ).toBe(404);
  });

  it("starts the new-scenario form from a preset", async () => {
    const keeper = await userWithCookie();
    const tankId = String(createTank(keeper.id));
    const page = await call(
      newLoader,
      get(`/tanks/${tankId}/scenarios/new?preset=first-light-fishless`, keeper.cookie),
      { tankId },
    );
    expect(page.data.presetId).toBe("first-light-fishless");
    const fishless = page.data.form.sections
      .find((s: { id: string }) => s.id === "fish")
      .fields.find((f: { name: string }) => f.name === "fishlessCycling.enabled");
    expect(fishless.value).toBe("true");
    expect(page.data.presets.length).toBeGreaterThanOrEqual(4);
  });
});
