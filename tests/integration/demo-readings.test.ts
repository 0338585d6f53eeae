import { and, eq } from "drizzle-orm";
import { beforeAll, describe, expect, it } from "vitest";
import { getDb } from "~/db/client.server";
import { scenarios, tanks } from "~/db/schema";
import { DEMO_PASSWORD, seedDemoData } from "~/db/seed.server";
import { demoReadingValues } from "~/db/seed-readings.server";
import { clearJobs, findJob, type Job } from "~/features/jobs/jobs.server";
import { action as calibrateAction } from "~/routes/calibrate/calibrate";
import { loader as resultsLoader } from "~/routes/scenarios/results";
import { loader as journalLoader } from "~/routes/journal/journal";
import { call, get, ORIGIN } from "../support/routes";
import { signIn } from "../support/users";
import { unpackSeries } from "~/features/runs/series-packing";

beforeAll(async () => {
  await seedDemoData(getDb());
}, 120_000);

async function finished(job: Job): Promise<Job> {
  while (job.status === "running") await new Promise((r) => setTimeout(r, 10));
  return job;
}

describe("demo readings", () => {
  it("puts a month of Jonah's readings on his baseline chart, and a calibration improves the fit to them", async () => {
    const jonah = await signIn("jonah@tidewell.example", DEMO_PASSWORD);
    const tank = getDb().select().from(tanks).where(eq(tanks.name, "Living-room 120")).get()!;
    const baseline = getDb()
      .select()
      .from(scenarios)
      .where(and(eq(scenarios.tankId, tank.id), eq(scenarios.name, "Baseline")))
      .get()!;
    const params = { tankId: String(tank.id), scenarioId: String(baseline.id) };
    const page = await call(resultsLoader, get(`/tanks/${tank.id}/scenarios/${baseline.id}`, jonah), params);
    expect(page.data.readings).toHaveLength(14);
    // Drawn from a known run (seed-readings.server.ts), entered as mg/L NO3 and shown back the same way.
    const drawn = demoReadingValues();
    expect(page.data.readings[0]).toMatchObject({ day: 1.35, no3: drawn[0].no3 });
    expect(page.data.readings.map((r: { no3: number }) => r.no3)).toEqual(drawn.map((r) => r.no3));

    const started = await call(
      calibrateAction,
      new Request(`${ORIGIN}/tanks/${tank.id}/scenarios/${baseline.id}/calibrate`, {
        method: "POST",
        body: new URLSearchParams([
          ["intent", "start"],
          ["fit", "feedLoad"],
          ["fit", "plantUptake"],
        ]),
        headers: { "Content-Type": "application/x-www-form-urlencoded", Cookie: jonah, Origin: ORIGIN },
      }),
      params,
    );
    expect(started.status).toBe(302);
    const id = new URL(started.location!, ORIGIN).searchParams.get("job")!;
    const job = await finished(findJob(tank.ownerId, id)!);
    expect(job.status).toBe("done");
    const result = job.result as {
      rmse: { species: string; before: number; after: number }[];
      multipliers: { key: string; value: number }[];
    };
    const no3 = result.rmse.find((r) => r.species === "no3")!;
    expect(no3.after).toBeLessThan(no3.before / 2);
    // The readings climb faster than the baseline (drawn with feed load 1.15): more nitrogen comes in than the model assumed.
    expect(result.multipliers.find((m) => m.key === "feedLoad")!.value).toBeGreaterThan(1);
    clearJobs();
  });
});

describe("demo journal", () => {
  it("gives Jonah's tank a month of entries the model follows: water changes drop nitrate where his readings do", async () => {
    const jonah = await signIn("jonah@tidewell.example", DEMO_PASSWORD);
    const tank = getDb().select().from(tanks).where(eq(tanks.name, "Living-room 120")).get()!;
    const tankId = String(tank.id);
    const page = await call(journalLoader, get(`/tanks/${tankId}/journal`, jonah), { tankId });
    expect(page.data.entries.length).toBeGreaterThanOrEqual(8);
    const { readings } = page.data.replay;
    const { t, no3 } = unpackSeries(page.data.replay.packedSeries);
    expect(readings.length).toBeGreaterThanOrEqual(12);
    // Five 25 % changes in the journal: nitrate drops at each, and only there (dilution)
    const drops = no3.filter((v: number, k: number) => k > 0 && t[k] === t[k - 1] && v < no3[k - 1] * 0.95).length;
    expect(drops).toBe(5);
    expect(page.data.forecast).toMatch(/Nitrate|nitrate/);
  });
});
