/**
 * Quotas and run limits (issue 10): what one person may keep and run, answered with 413 or 429
 * and what to do, never a partial write; long runs stored compactly. Our own checks against the
 * numbers in app/quotas.server.ts and app/features/runs/run-gate.server.ts.
 */
import { count, eq } from "drizzle-orm";
import { afterEach, describe, expect, it } from "vitest";
import { ScenarioSchema, simulate } from "../../models";
import { getDb } from "~/db/client.server";
import { setEnginePool } from "~/features/jobs/engine-pool.server";
import { runEngineTask } from "~/features/jobs/engine-tasks.server";
import { readings, runs, scenarios, tanks } from "~/db/schema";
import { QUOTAS } from "~/quotas.server";
import { LIMITS, resetRateLimits } from "~/rate-limits.server";
import { REQUEST_RUN_LIMITS, resetRunGate, RUNS_IN_FLIGHT_PER_PERSON } from "~/features/runs/run-gate.server";
import { loader as accountLoader } from "~/routes/auth/account";
import { action as previewAction } from "~/routes/api/preview";
import { loader as runLoader } from "~/routes/api/run";
import { action as tankScenariosAction } from "~/routes/api/tank-scenarios";
import { action as uploadAction } from "~/routes/readings/upload";
import { action as newScenarioAction } from "~/routes/scenarios/new";
import { action as tanksAction } from "~/routes/tanks/list";
import { call, get, ORIGIN, post, postJson } from "../support/routes";
import { createScenario, createTank, setupFormFields } from "../support/tanks";
import { userWithCookie } from "../support/users";

afterEach(() => {
  resetRateLimits();
  resetRunGate();
});

/** Every table's row count: the same before and after a refusal means nothing was written. */
function rowCounts() {
  const db = getDb();
  return {
    tanks: db.select({ n: count() }).from(tanks).get()!.n,
    scenarios: db.select({ n: count() }).from(scenarios).get()!.n,
    runs: db.select({ n: count() }).from(runs).get()!.n,
    readings: db.select({ n: count() }).from(readings).get()!.n,
  };
}

function csvUpload(path: string, cookie: string, text: string): Request {
  const form = new FormData();
  form.set("file", new File([text], "readings.csv", { type: "text/csv" }));
  return new Request(ORIGIN + path, { method: "POST", body: form, headers: { Cookie: cookie, Origin: ORIGIN } });
}

describe("what one person may keep", () => {
  it(`stops at ${QUOTAS.tanksPerPerson} tanks with 413 and what to do, writing nothing`, async () => {
    const keeper = await userWithCookie();
    getDb()
      .insert(tanks)
      .values(Array.from({ length: QUOTAS.tanksPerPerson }, (_, i) => ({ ownerId: keeper.id, name: `Tank ${i}` })))
      .run();
    const before = rowCounts();
    const refused = await call(tanksAction, post("/tanks", { name: "One too many" }, keeper.cookie));
    expect(refused.status).toBe(413);
    expect(refused.data.errors.name).toMatch(/50 tanks.*Delete a tank/);
    expect(rowCounts()).toEqual(before);
  });

  it(`stops at ${QUOTAS.scenariosPerTank} scenarios in a tank, from the form and the API alike`, async () => {
    const keeper = await userWithCookie();
    const tankId = createTank(keeper.id);
    getDb()
      .insert(scenarios)
      .values(
        Array.from({ length: QUOTAS.scenariosPerTank }, (_, i) => ({
          tankId,
          name: `S${i}`,
          settings: {},
          schemaVersion: 1,
        })),
      )
      .run();
    const before = rowCounts();
    const form = await call(
      newScenarioAction,
      post(`/tanks/${tankId}/scenarios/new`, setupFormFields(), keeper.cookie),
      { tankId: String(tankId) },
    );
    expect(form.status).toBe(413);
    expect(form.data.errors[""]).toMatch(/100 scenarios.*Delete scenarios/);
    const api = await call(
      tankScenariosAction,
      postJson(`/api/tanks/${tankId}/scenarios`, { name: "x", settings: {} }, keeper.cookie),
      { tankId: String(tankId) },
    );
    expect(api.status).toBe(413);
    expect(api.data).toMatchObject({ status: 413, error: expect.stringMatching(/Delete scenarios/) });
    expect(rowCounts()).toEqual(before);
  });

  it(`stops at ${QUOTAS.readingsPerPerson.toLocaleString("en")} readings: an upload past it stores none of its rows`, async () => {
    const keeper = await userWithCookie();
    const tankId = createTank(keeper.id);
    const start = Date.UTC(2020, 0, 1);
    getDb().transaction((tx) => {
      for (let i = 0; i < QUOTAS.readingsPerPerson - 2; i += 1000) {
        tx.insert(readings)
          .values(
            Array.from({ length: Math.min(1000, QUOTAS.readingsPerPerson - 2 - i) }, (_, j) => ({
              tankId,
              takenAt: new Date(start + (i + j) * 60_000),
              nitrate: 1,
            })),
          )
          .run();
      }
    });
    const before = rowCounts();
    const csv = ["datetime,nitrate_no3_mg_l", "2026-01-01T08:00,10", "2026-01-02T08:00,11", "2026-01-03T08:00,12"].join(
      "\n",
    );
    const refused = await call(uploadAction, csvUpload(`/tanks/${tankId}/readings/upload`, keeper.cookie, csv), {
      tankId: String(tankId),
    });
    expect(refused.status).toBe(413);
    expect(refused.data.error).toMatch(/20,000.*Delete old readings/);
    expect(rowCounts()).toEqual(before);
  });

  it("stops at 50 MB of stored runs with 413 and what to do, and keeps long runs compact", async () => {
    const keeper = await userWithCookie();
    const tankId = String(createTank(keeper.id));
    // A two-year run at hourly points: ~3.2 MB of JSON, stored packed.
    const long = await call(
      tankScenariosAction,
      postJson(
        `/api/tanks/${tankId}/scenarios`,
        { name: "Long", settings: { run: { lengthDays: 730, outputIntervalDays: 1 / 24 } } },
        keeper.cookie,
      ),
      { tankId },
    );
    expect(long.status).toBe(201);
    const row = getDb().select().from(runs).where(eq(runs.scenarioId, long.data.scenario.id)).get()!;
    expect(row.seriesPacked).not.toBeNull();
    expect(row.seriesPacked!.byteLength).toBeLessThan(1.5 * 1024 * 1024);
    // Read back whole: the same numbers the engine gives (the packing loses nothing).
    const served = await call(runLoader, get(`/api/runs/${row.id}`, keeper.cookie), { runId: String(row.id) });
    const direct = simulate(ScenarioSchema.parse(long.data.scenario.settings), REQUEST_RUN_LIMITS);
    expect(served.data.run.series.t.length).toBe(direct.series.t.length);
    expect(served.data.run.series.no3).toEqual(direct.series.no3);

    // Fill the rest of the quota with one stored run, then a save past it writes nothing.
    const filler = await createScenario(keeper.id, Number(tankId), { run: { lengthDays: 5 } }, "Filler");
    getDb()
      .update(runs)
      .set({ seriesPacked: Buffer.alloc(QUOTAS.storedRunBytesPerPerson - 1024 * 1024) })
      .where(eq(runs.scenarioId, filler))
      .run();
    const before = rowCounts();
    const refused = await call(
      tankScenariosAction,
      postJson(
        `/api/tanks/${tankId}/scenarios`,
        { name: "Past it", settings: { run: { lengthDays: 730, outputIntervalDays: 1 / 24 } } },
        keeper.cookie,
      ),
      { tankId },
    );
    expect(refused.status).toBe(413);
    expect(refused.data.error).toMatch(/stored runs take .* of the 50\.0 MB.*Delete scenarios/);
    expect(rowCounts()).toEqual(before);
    // The account page shows the usage.
    const account = await call(accountLoader, get("/account", keeper.cookie));
    expect(account.data.usage.storedRunBytes.used).toBeGreaterThan(QUOTAS.storedRunBytesPerPerson - 1024 * 1024);
    expect(account.data.usage.tanks).toEqual({ used: 1, limit: QUOTAS.tanksPerPerson });
    expect(account.data.usage.scenariosInFullestTank).toEqual({ used: 2, limit: QUOTAS.scenariosPerTank });
  }, 60_000);
});

describe("how much one person may run", () => {
  it(`runs at most ${RUNS_IN_FLIGHT_PER_PERSON} saves of one person at once; the rest answer 429 at once and write nothing`, async () => {
    const keeper = await userWithCookie();
    const tankId = String(createTank(keeper.id));
    const before = rowCounts();
    // A pool whose runs wait until released: the saves surely overlap, however fast the machine.
    const held: (() => void)[] = [];
    const previous = setEnginePool({
      mode: "inline",
      size: 1,
      run: (task) => new Promise((resolve) => held.push(() => resolve(runEngineTask(task)))),
      waiting: () => ({ interactive: held.length, job: 0 }),
      close: async () => {},
    });
    let answers;
    try {
      const pending = Array.from({ length: 6 }, (_, i) =>
        call(
          tankScenariosAction,
          postJson(
            `/api/tanks/${tankId}/scenarios`,
            { name: `Parallel ${i}`, settings: { run: { lengthDays: 60 } } },
            keeper.cookie,
          ),
          { tankId },
        ),
      );
      await expect.poll(() => held.length).toBe(RUNS_IN_FLIGHT_PER_PERSON);
      await new Promise((r) => setTimeout(r, 50));
      held.splice(0).forEach((release) => release());
      answers = await Promise.all(pending);
    } finally {
      setEnginePool(previous!);
    }
    const statuses = answers.map((a) => a.status).sort();
    expect(statuses).toEqual([
      ...Array(RUNS_IN_FLIGHT_PER_PERSON).fill(201),
      ...Array(6 - RUNS_IN_FLIGHT_PER_PERSON).fill(429),
    ]);
    expect(answers.find((a) => a.status === 429)!.data.error).toMatch(/model runs going/);
    expect(rowCounts().scenarios).toBe(before.scenarios + RUNS_IN_FLIGHT_PER_PERSON);
  });

  it(`saves at most ${LIMITS.savesPerPerson.points} a minute, and previews at most ${LIMITS.previewsPerPerson.points}`, async () => {
    const keeper = await userWithCookie();
    const tankId = String(createTank(keeper.id));
    const statuses: number[] = [];
    for (let i = 0; i <= LIMITS.savesPerPerson.points; i++) {
      const r = await call(
        tankScenariosAction,
        postJson(
          `/api/tanks/${tankId}/scenarios`,
          { name: `S${i}`, settings: { run: { lengthDays: 3 } } },
          keeper.cookie,
        ),
        { tankId },
      );
      statuses.push(r.status);
      if (r.status === 429) expect(r.data.error).toMatch(/at most 30 a minute/);
    }
    expect(statuses.filter((s) => s === 201)).toHaveLength(LIMITS.savesPerPerson.points);
    expect(statuses.at(-1)).toBe(429);
    const previews: number[] = [];
    for (let i = 0; i <= LIMITS.previewsPerPerson.points; i++) {
      previews.push(
        (await call(previewAction, postJson("/api/preview", { settings: { run: { lengthDays: 3 } } }, keeper.cookie)))
          .status,
      );
    }
    expect(previews.filter((s) => s === 200)).toHaveLength(LIMITS.previewsPerPerson.points);
    expect(previews.at(-1)).toBe(429);
  }, 60_000);
});
