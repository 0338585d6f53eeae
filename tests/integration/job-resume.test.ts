/**
 * Jobs outlive the app process running them (issue 15 item 3, decision 0009): real second
 * processes on this file's SQLite database (tests/support/jobs-then-stop.ts) start sweeps and are
 * killed with SIGKILL, or stop normally; this process takes their jobs up and runs them again.
 * "16 s of silence" is written into a dead process's heartbeat instead of waited for, as the
 * reminder tests move their clock past a lease.
 */
import { spawn } from "node:child_process";
import { eq, inArray, sql } from "drizzle-orm";
import { afterEach, describe, expect, it } from "vitest";
import { getDb } from "~/db/client.server";
import { jobs, scenarios } from "~/db/schema";
import { journalEntries } from "~/db/schema-care";
import { resumeOrphans } from "~/features/jobs/job-resume.server";
import { getEnginePool } from "~/features/jobs/engine-pool.server";
import { JOB_LIMITS } from "~/features/jobs/job-limits.server";
import { clearJobs, jobJson, releaseLocalJobs, startJob, type JobJson } from "~/features/jobs/jobs.server";
import { action as calibrateAction } from "~/routes/calibrate/calibrate";
import { action as targetAction } from "~/routes/sweeps/target";
import { action as sweepsApi } from "~/routes/api/scenario-sweeps";
import { action as jobApiAction, loader as jobApi } from "~/routes/api/job";
import { call, get, ORIGIN, post, postJson } from "../support/routes";
import { PLANTED_START_MS, storePlantedReadings } from "../support/planted-readings";
import { createScenario, createTank } from "../support/tanks";
import { userWithCookie } from "../support/users";
import { PLANTED } from "../support/planted-scenario";

const SWEEP = { setting: "plantMass", from: 5, to: 60, points: 20, outcome: "nitrateBeforeLastWaterChange" };

afterEach(() => clearJobs());

async function world() {
  const user = await userWithCookie();
  const tankId = createTank(user.id);
  const scenarioId = await createScenario(user.id, tankId, PLANTED);
  return { user, scenarioId };
}

type Plan = {
  start?: { userId: number; scenarioId: number; input: unknown }[];
  resumeAt?: number;
  claimLoop?: boolean;
  stopAfterDone?: number;
  stop?: "kill" | "release";
};
type Stopped = { ids: string[]; done: number; instance: string; signal: NodeJS.Signals | null; code: number | null };

/** Runs tests/support/jobs-then-stop.ts as another process on this database. */
function spawnOther(plan: Plan) {
  const child = spawn(process.execPath, ["--import", "tsx", "tests/support/jobs-then-stop.ts", JSON.stringify(plan)], {
    env: process.env,
    stdio: ["pipe", "pipe", "pipe"],
  });
  let out = "";
  let err = "";
  let onOut = () => {};
  child.stdout.on("data", (chunk) => ((out += chunk), onOut()));
  child.stderr.on("data", (chunk) => (err += chunk));
  const exited = new Promise<Stopped>((resolve, reject) =>
    child.on("exit", (code, signal) =>
      err ? reject(new Error(err)) : resolve({ ...JSON.parse(out.replace(/^ready\n/, "")), code, signal }),
    ),
  );
  const ready = new Promise<void>((resolve) => (onOut = () => out.startsWith("ready\n") && resolve()));
  return { exited, ready, stop: () => child.stdin.end("stop\n") };
}

const otherProcess = (plan: Plan) => spawnOther(plan).exited;

const rowOf = (id: string) => getDb().select().from(jobs).where(eq(jobs.id, id)).get()!;

/** As if the dead process had been silent for 16 s (a job counts as lost after 15 s). */
function silence(ids: string[]) {
  getDb()
    .update(jobs)
    .set({ heartbeatAt: sql`${jobs.heartbeatAt} - 16000` })
    .where(inArray(jobs.id, ids))
    .run();
}

async function pollOnce(id: string, cookie: string): Promise<JobJson> {
  const r = await call(jobApi, get(`/api/jobs/${id}`, cookie), { jobId: id });
  expect(r.status).toBe(200);
  return r.data.job;
}

async function untilEnded(id: string, cookie: string): Promise<JobJson> {
  for (let i = 0; i < 3000; i++) {
    const job = await pollOnce(id, cookie);
    if (job.status !== "running" && job.status !== "waiting") return job;
    await new Promise((r) => setTimeout(r, 10));
  }
  throw new Error("the job did not end");
}

async function startByApi(user: { cookie: string }, scenarioId: number) {
  return call(sweepsApi, postJson(`/api/scenarios/${scenarioId}/sweeps`, SWEEP, user.cookie), {
    scenarioId: String(scenarioId),
  });
}

describe("jobs of a process that stopped", () => {
  it("a sweep whose process is killed mid-sweep is run again here, and gives what an uninterrupted sweep gives", async () => {
    const { user, scenarioId } = await world();
    // The reference: the same sweep, never interrupted (our own worked example).
    const first = await startByApi(user, scenarioId);
    expect(first.status).toBe(202);
    const reference = await untilEnded(first.data.job.id, user.cookie);
    expect(reference.status).toBe("done");

    const dead = await otherProcess({
      start: [{ userId: user.id, scenarioId, input: SWEEP }],
      stopAfterDone: 3,
      stop: "kill",
    });
    expect(dead.signal).toBe("SIGKILL");
    const [id] = dead.ids;
    expect(dead.done).toBeGreaterThanOrEqual(3);
    expect(dead.done).toBeLessThan(20);
    expect(rowOf(id)).toMatchObject({ status: "running", instance: dead.instance, attempts: 1 });
    // While its heartbeat is fresh it is simply running.
    expect(await pollOnce(id, user.cookie)).toMatchObject({ status: "running", note: null });

    silence([id]);
    const orphan = await pollOnce(id, user.cookie);
    expect(orphan.status).toBe("running");
    expect(orphan.note).toMatch(/stopped; another will restart it/);
    // Still the person's one job: a second start waits for it.
    expect((await startByApi(user, scenarioId)).status).toBe(429);

    const resumed = resumeOrphans();
    expect(resumed.map((j) => j.id)).toEqual([id]);
    expect(resumeOrphans()).toEqual([]); // taken once
    const job = await untilEnded(id, user.cookie);
    expect(job.status).toBe("done");
    expect(job.note).toBe("Restarted from the start after a server stopped.");
    expect(job.result).toEqual(reference.result);
    expect(rowOf(id)).toMatchObject({ attempts: 2, error: null });
  }, 60_000);

  it("takes a dead process's waiting jobs up in the order they were asked for, ahead of later ones", async () => {
    const capacity = JOB_LIMITS.runningPerWorker * getEnginePool().size;
    const people = await Promise.all(Array.from({ length: capacity + 2 }, world));
    const dead = await otherProcess({
      start: people.map(({ user, scenarioId }) => ({ userId: user.id, scenarioId, input: { ...SWEEP, points: 4 } })),
      stop: "kill",
    });
    expect(dead.signal).toBe("SIGKILL");
    expect(dead.ids.map((id) => rowOf(id).status)).toEqual([
      ...Array<string>(capacity).fill("running"),
      "waiting",
      "waiting",
    ]);

    // This process is full, with one job of its own already waiting (asked for after theirs).
    const releases: (() => void)[] = [];
    const held = () => new Promise<string>((resolve) => releases.push(() => resolve("done")));
    for (let i = 0; i < capacity; i++)
      startJob({ start: { user: { id: 90_000 + i }, kind: "sweep", label: "held", total: 1 }, work: held });
    const later = startJob({ start: { user: { id: 95_000 }, kind: "sweep", label: "later", total: 1 }, work: held });
    expect(later.status).toBe("waiting");

    silence(dead.ids);
    const resumed = resumeOrphans();
    expect(resumed.map((j) => j.id)).toEqual(dead.ids);
    expect(resumed.map((j) => jobJson(j).ahead)).toEqual(dead.ids.map((_id, i) => i));
    expect(jobJson(later).ahead).toBe(dead.ids.length);
    // Polled through the API (as another process would read the row): waiting, and why.
    const last = await pollOnce(dead.ids.at(-1)!, people.at(-1)!.user.cookie);
    expect(last).toMatchObject({ status: "waiting", note: "Restarted from the start after a server stopped." });

    releases.splice(0).forEach((r) => r());
    await new Promise((r) => setTimeout(r, 20));
    expect(resumed.map((j) => j.status).slice(capacity)).toEqual(["waiting", "waiting"]);
    expect(resumed.slice(0, capacity).every((j) => j.status === "running" || j.status === "done")).toBe(true);
    for (const [i, id] of dead.ids.entries()) expect((await untilEnded(id, people[i].user.cookie)).status).toBe("done");
    releases.splice(0).forEach((r) => r());
  }, 60_000);

  it("fails a job visibly after two processes in turn died running it, never running forever", async () => {
    const { user, scenarioId } = await world();
    const first = await otherProcess({
      start: [{ userId: user.id, scenarioId, input: SWEEP }],
      stopAfterDone: 3,
      stop: "kill",
    });
    const [id] = first.ids;
    silence([id]);
    // A second process takes it up, and dies too.
    const second = await otherProcess({ resumeAt: Date.now(), stopAfterDone: 2, stop: "kill" });
    expect(second.signal).toBe("SIGKILL");
    expect(second.ids).toEqual([id]);
    expect(rowOf(id)).toMatchObject({ status: "running", instance: second.instance, attempts: 2 });
    silence([id]);

    expect(resumeOrphans()).toEqual([]);
    const job = await pollOnce(id, user.cookie);
    expect(job.status).toBe("failed");
    expect(job.error).toMatch(/tried twice/);
    expect(job.error).toMatch(/start it again/);
    // The person may start again.
    expect((await startByApi(user, scenarioId)).status).toBe(202);
  }, 60_000);

  it("two processes racing for the same orphans: each is taken by exactly one", async () => {
    const people = await Promise.all([world(), world(), world()]);
    const dead = await otherProcess({
      start: people.map(({ user, scenarioId }) => ({ userId: user.id, scenarioId, input: SWEEP })),
      stop: "kill",
    });
    silence(dead.ids);
    // Two processes claim in a loop while more orphans appear one by one (rows as a dead process
    // leaves them), so their claims overlap many times.
    const racers = [spawnOther({ claimLoop: true }), spawnOther({ claimLoop: true })];
    await Promise.all(racers.map((r) => r.ready));
    const orphans = [...dead.ids];
    for (let i = 0; i < 200; i++) {
      const id = `orphan-${i}`;
      getDb()
        .insert(jobs)
        .values({
          id,
          userId: 70_000 + i,
          kind: "sweep",
          label: "x",
          status: "waiting",
          instance: "dead:1",
          attempts: 1,
          startedAt: 1,
          heartbeatAt: 1,
        })
        .run();
      orphans.push(id);
      await new Promise((r) => setTimeout(r, 4));
    }
    await new Promise((r) => setTimeout(r, 300));
    racers.forEach((r) => r.stop());
    const racing = Promise.all(racers.map((r) => r.exited));
    const [a, b] = await racing;
    expect(a.ids.length).toBeGreaterThan(0);
    expect(b.ids.length).toBeGreaterThan(0);
    expect([...a.ids, ...b.ids].sort()).toEqual(orphans.sort());
    expect(a.ids.filter((id) => b.ids.includes(id))).toEqual([]);
    for (const { instance, ids } of [a, b])
      for (const id of ids) expect(rowOf(id)).toMatchObject({ instance, attempts: 2, status: "waiting" });
  }, 60_000);

  it("a process stopping normally leaves its jobs to another at once, without counting an attempt", async () => {
    const { user, scenarioId } = await world();
    const stopped = await otherProcess({
      start: [{ userId: user.id, scenarioId, input: SWEEP }],
      stopAfterDone: 3,
      stop: "release",
    });
    expect(stopped.code).toBe(0);
    const [id] = stopped.ids;
    expect(rowOf(id)).toMatchObject({ status: "running", attempts: 0 });
    expect((await pollOnce(id, user.cookie)).note).toMatch(/another will restart it/);
    expect(resumeOrphans().map((j) => j.id)).toEqual([id]); // no 15 s wait
    const job = await untilEnded(id, user.cookie);
    expect(job.status).toBe("done");
    expect((job.result as { points: unknown[] }).points).toHaveLength(20);
    expect(rowOf(id).attempts).toBe(1);
  }, 60_000);

  it("does not run a job again on a scenario deleted or changed since it started, and says why", async () => {
    const [gone, edited] = await Promise.all([world(), world()]);
    const stopped = await otherProcess({
      start: [gone, edited].map(({ user, scenarioId }) => ({ userId: user.id, scenarioId, input: SWEEP })),
      stop: "release",
    });
    getDb().delete(scenarios).where(eq(scenarios.id, gone.scenarioId)).run();
    const row = getDb().select().from(scenarios).where(eq(scenarios.id, edited.scenarioId)).get()!;
    const settings = row.settings as { fish: { feedGPerDay: number } };
    getDb()
      .update(scenarios)
      .set({ settings: { ...settings, fish: { ...settings.fish, feedGPerDay: 2 } } })
      .where(eq(scenarios.id, edited.scenarioId))
      .run();

    expect(resumeOrphans()).toEqual([]);
    const [a, b] = stopped.ids.map(rowOf);
    expect(a.status).toBe("failed");
    expect(a.error).toMatch(/scenario this sweep ran on was deleted/);
    expect(b.status).toBe("failed");
    expect(b.error).toMatch(/scenario changed after this sweep started/);
  }, 60_000);

  it("rebuilds every kind from its row: a calibration on the journal and a target search give what uninterrupted ones give", async () => {
    const { user, scenarioId } = await world();
    const tankId = getDb().select().from(scenarios).where(eq(scenarios.id, scenarioId)).get()!.tankId;
    const base = `/tanks/${tankId}/scenarios/${scenarioId}`;
    const params = { tankId: String(tankId), scenarioId: String(scenarioId) };
    // Readings made by the engine with feed load x1.25 from 1 January 2026, and a journal from
    // that day (our own worked example, as in jobs.test.ts).
    storePlantedReadings(tankId, scenarioId);
    const start = PLANTED_START_MS;
    getDb()
      .insert(journalEntries)
      .values({ tankId, doneAt: new Date(start + 9 * 3_600_000), kind: "note", details: {} })
      .run();

    const forms: {
      action: typeof calibrateAction | typeof targetAction;
      path: string;
      fields: Record<string, string>;
    }[] = [
      {
        action: calibrateAction,
        path: `${base}/calibrate`,
        fields: { intent: "start", fit: "feedLoad", schedule: "journal" },
      },
      {
        action: targetAction,
        path: `${base}/target`,
        fields: { intent: "start", nitrateMax: "30", nh3Max: "", lever: "waterChangeFraction", intervalDays: "7" },
      },
    ];
    for (const form of forms) {
      const startIt = async () => {
        const started = await call(form.action, post(form.path, form.fields, user.cookie), params);
        expect(started.status).toBe(302);
        return new URL(started.location!, ORIGIN).searchParams.get("job")!;
      };
      const reference = await untilEnded(await startIt(), user.cookie);
      expect(reference.status).toBe("done");
      // Started again, and left at once by its process stopping (as if another process had run it).
      const id = await startIt();
      releaseLocalJobs();
      getDb().update(jobs).set({ instance: "stopped:1" }).where(eq(jobs.id, id)).run();
      expect(resumeOrphans().map((j) => j.id)).toEqual([id]);
      const job = await untilEnded(id, user.cookie);
      expect(job).toMatchObject({ status: "done", note: "Restarted from the start after a server stopped." });
      expect(job.result).toEqual(reference.result);
    }
  }, 60_000);

  it("cancels an orphan cancelled meanwhile instead of running it, and fails one nobody took up for two minutes", async () => {
    const [a, b] = await Promise.all([world(), world()]);
    // Rows as a dead process leaves them (its last heartbeat 20 s and 3 minutes ago).
    const orphan = (id: string, userId: number, silentMs: number) =>
      getDb()
        .insert(jobs)
        .values({
          id,
          userId,
          kind: "sweep",
          label: "x",
          status: "running",
          instance: "dead:1",
          attempts: 1,
          startedAt: 1,
          heartbeatAt: Date.now() - silentMs,
        })
        .run();
    orphan("cancelled-orphan", a.user.id, 20_000);
    orphan("forgotten-orphan", b.user.id, 180_000);

    const cancelled = await call(
      jobApiAction,
      new Request(`http://fernwater.test/api/jobs/cancelled-orphan`, {
        method: "DELETE",
        headers: { Cookie: a.user.cookie, Origin: ORIGIN },
      }),
      { jobId: "cancelled-orphan" },
    );
    expect(cancelled.status).toBe(200);
    // Nobody took the forgotten one up (no process ran the claimer): it fails when read.
    const forgotten = await pollOnce("forgotten-orphan", b.user.cookie);
    expect(forgotten.status).toBe("failed");
    expect(forgotten.error).toMatch(/no other took it up/);

    expect(resumeOrphans()).toEqual([]);
    expect(rowOf("cancelled-orphan").status).toBe("cancelled");
  });
});
