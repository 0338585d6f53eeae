import { readdirSync, readFileSync } from "node:fs";
import { afterEach, describe, expect, it } from "vitest";
import { ScenarioSchema } from "~models";
import { createEnginePool, FairTaskQueue, sourceWorkerUrl, type EnginePool } from "~/features/jobs/engine-pool.server";
import { REQUEST_RUN_LIMITS } from "~/features/runs/run-gate.server";

// Our own checks of the engine pool on piscina (docs/decisions/0006-single-runs.md): the fair
// queue's order, a lower priority for the workers, and results equal to the in-process runs.

/** A queued task as piscina hands it to its task queue: the lane and owner under its symbol. */
const queued = (name: string, lane: "interactive" | "job", owner: string) => {
  const place = { lane, owner };
  return { name, [Symbol.for("Piscina.queueOptions")]: place } as unknown as Parameters<FairTaskQueue["push"]>[0];
};
const names = (q: FairTaskQueue) => {
  const out: string[] = [];
  for (let t = q.shift(); t; t = q.shift()) out.push((t as unknown as { name: string }).name);
  return out;
};

describe("the fair queue under piscina", () => {
  it("serves someone waiting for a page first, then lets owners take turns", () => {
    const q = new FairTaskQueue();
    for (let i = 1; i <= 3; i++) q.push(queued(`a${i}`, "job", "user:1"));
    q.push(queued("b1", "job", "user:2"));
    q.push(queued("save", "interactive", "user:3"));
    q.push(queued("b2", "job", "user:2"));
    expect(q.size).toBe(6);
    expect(q.waiting("interactive")).toBe(1);
    expect(names(q)).toEqual(["save", "a1", "b1", "a2", "b2", "a3"]);
    expect(q.size).toBe(0);
  });

  it("still gives a waiting job a turn while one person keeps the interactive lane full", () => {
    // One person reloading pages that run the model: a new interactive task whenever one is taken.
    const q = new FairTaskQueue();
    q.push(queued("sweep", "job", "user:2"));
    let i = 0;
    q.push(queued(`page${i++}`, "interactive", "user:1"));
    const taken: string[] = [];
    for (let turn = 0; turn < 20; turn++) {
      q.push(queued(`page${i++}`, "interactive", "user:1"));
      taken.push((q.shift() as unknown as { name: string }).name);
    }
    // Pages still go first, but the sweep is not held back for ever (our own bound: a few turns).
    expect(taken[0]).toBe("page0");
    expect(taken.indexOf("sweep")).toBeGreaterThan(0);
    expect(taken.indexOf("sweep")).toBeLessThanOrEqual(5);
  });

  it("takes out a task that was aborted while it waited", () => {
    const q = new FairTaskQueue();
    const a = queued("a", "job", "user:1");
    q.push(a);
    q.push(queued("b", "job", "user:1"));
    q.remove(a);
    expect(names(q)).toEqual(["b"]);
  });
});

describe("the engine pool on worker threads", () => {
  let pool: EnginePool | undefined;
  afterEach(async () => {
    await pool?.close();
    pool = undefined;
  });

  it("runs a task on a worker at a lower priority and gives what an in-process run gives", async () => {
    pool = createEnginePool({ workerUrl: sourceWorkerUrl(), size: 1 });
    const inline = createEnginePool({ workerUrl: null });
    expect(pool.mode).toBe("threads");
    const task = {
      kind: "simulate",
      scenario: ScenarioSchema.parse({ run: { lengthDays: 30 } }),
      limits: REQUEST_RUN_LIMITS,
    } as const;
    const [threaded, local] = await Promise.all([
      pool.run(task, { lane: "interactive", owner: "user:1" }),
      inline.run(task),
    ]);
    expect(threaded.kind).toBe("simulate");
    if (threaded.kind !== "simulate" || local.kind !== "simulate") throw new Error("unexpected answer");
    expect(threaded.result!.keyFigures).toEqual(local.result!.keyFigures);
    // Linux keeps a nice value per thread (field 19 of /proc/<pid>/task/<tid>/stat): the
    // worker's is 10, below the request thread's priority (proc(5); a higher nice is a lower priority).
    if (process.platform === "linux") {
      const niceOf = (statFile: string) => {
        const stat = readFileSync(statFile, "utf8");
        return Number(stat.slice(stat.lastIndexOf(")") + 2).split(" ")[16]);
      };
      const main = niceOf("/proc/self/stat");
      const threads = readdirSync("/proc/self/task").map((tid) => niceOf(`/proc/self/task/${tid}/stat`));
      expect(main).toBeLessThan(10);
      expect(threads).toContain(10);
    }
  }, 30_000);

  it("refuses work once closed", async () => {
    pool = createEnginePool({ workerUrl: sourceWorkerUrl(), size: 1 });
    await pool.close();
    const task = {
      kind: "simulate",
      scenario: ScenarioSchema.parse({ run: { lengthDays: 5 } }),
      limits: REQUEST_RUN_LIMITS,
    } as const;
    await expect(pool.run(task)).rejects.toThrow(/closed/);
    pool = undefined;
  }, 30_000);
});
