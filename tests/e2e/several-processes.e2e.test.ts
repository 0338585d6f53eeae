/**
 * Two real app processes on one port (WEB_CONCURRENCY=2, node:cluster): every request below
 * opens a new connection, so the cluster hands them to both processes. Limits, jobs and their
 * progress must hold across them, and a job whose process is killed must be run again by another.
 */
import http from "node:http";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { signInOverHttp, startBuiltServer, type BuiltServer } from "../support/built-server";

let server: BuiltServer;
const PASSWORD = "tidewell-demo-2026"; // the demo club's password (README)

beforeAll(async () => {
  server = await startBuiltServer({ env: { WEB_CONCURRENCY: "2" } });
}, 60_000);
afterAll(() => server?.stop());

type Answer = { status: number; instance: string; body: string };

/** One request on a connection of its own (no keep-alive), so either process may answer. */
function request(
  method: string,
  path: string,
  options: { cookie?: string; body?: string; form?: boolean } = {},
): Promise<Answer> {
  const url = new URL(path, server.baseURL);
  return new Promise((resolve, reject) => {
    const req = http.request(
      url,
      {
        method,
        agent: false,
        headers: {
          Origin: server.baseURL,
          ...(options.cookie ? { Cookie: options.cookie } : {}),
          ...(options.body
            ? {
                "Content-Type": options.form ? "application/x-www-form-urlencoded" : "application/json",
                "Content-Length": Buffer.byteLength(options.body),
              }
            : {}),
        },
      },
      (res) => {
        let body = "";
        res.setEncoding("utf8");
        res.on("data", (d) => (body += d));
        res.on("end", () =>
          resolve({ status: res.statusCode!, instance: String(res.headers["x-fernwater-instance"]), body }),
        );
      },
    );
    req.on("error", reject);
    req.end(options.body);
  });
}

async function firstScenarioId(cookie: string): Promise<number> {
  const tanks = JSON.parse((await request("GET", "/api/tanks", { cookie })).body).tanks as { id: number }[];
  const scenarios = JSON.parse((await request("GET", `/api/tanks/${tanks[0].id}/scenarios`, { cookie })).body)
    .scenarios as { id: number }[];
  return scenarios[0].id;
}

const SWEEP = JSON.stringify({ setting: "fish.feedGPerDay", from: 0.2, to: 2, points: 50, outcome: "nitrateEnd" });

describe("two app processes on one port", () => {
  it("both answer, and /api/health names the one that did", async () => {
    const seen = new Set<string>();
    // The server counts as up once one process answers; the second may still be starting on a
    // busy machine, so ask for a while (a CI run once saw only the first in its first 150 ms).
    const deadline = Date.now() + 20_000;
    while (seen.size < 2 && Date.now() < deadline) {
      const answer = await request("GET", "/api/health");
      expect(answer.status).toBe(200);
      const instance = JSON.parse(answer.body).instance as string;
      expect(instance).toBe(answer.instance);
      seen.add(instance);
      if (seen.size < 2) await new Promise((r) => setTimeout(r, 25));
    }
    expect(seen.size).toBe(2);
  });

  it("a job started on one process is polled and cancelled through the other, and one job per person holds across both", async () => {
    const cookie = await signInOverHttp(server.baseURL, "jonah@tidewell.example", PASSWORD);
    const scenarioId = await firstScenarioId(cookie);
    const started = await request("POST", `/api/scenarios/${scenarioId}/sweeps`, { cookie, body: SWEEP });
    expect(started.status).toBe(202);
    const id = JSON.parse(started.body).job.id as string;

    // A second start, through whichever process, is refused while the first runs.
    const again = await Promise.all(
      [1, 2, 3, 4].map(() => request("POST", `/api/scenarios/${scenarioId}/sweeps`, { cookie, body: SWEEP })),
    );
    expect(again.map((a) => a.status)).toEqual([429, 429, 429, 429]);

    const polledBy = new Set<string>();
    for (let i = 0; i < 40 && polledBy.size < 2; i++) {
      const poll = await request("GET", `/api/jobs/${id}`, { cookie });
      expect(poll.status).toBe(200);
      polledBy.add(poll.instance);
    }
    expect(polledBy.size).toBe(2);

    // Cancel through the process that did not start it.
    let cancelled: Answer;
    do cancelled = await request("DELETE", `/api/jobs/${id}`, { cookie });
    while (cancelled.instance === started.instance);
    expect(cancelled.status).toBe(200);
    let job: { status: string; done: number } = JSON.parse(cancelled.body).job;
    for (let i = 0; i < 100 && job.status === "running"; i++) {
      await new Promise((r) => setTimeout(r, 100));
      job = JSON.parse((await request("GET", `/api/jobs/${id}`, { cookie })).body).job;
    }
    expect(job.status).toBe("cancelled");
    expect(job.done).toBeLessThan(50);
  }, 60_000);

  it("runs a job again on another process when the process running it is killed, and replaces the process", async () => {
    const cookie = await signInOverHttp(server.baseURL, "ines@tidewell.example", PASSWORD);
    const scenarioId = await firstScenarioId(cookie);
    const started = await request("POST", `/api/scenarios/${scenarioId}/sweeps`, { cookie, body: SWEEP });
    expect(started.status).toBe(202);
    const id = JSON.parse(started.body).job.id as string;
    process.kill(Number(started.instance.split(":").pop()), "SIGKILL");

    // Lost after 15 s of silence, taken up within a heartbeat (2 s) by a live process, run again.
    let job: { status: string; error: string | null; note: string | null; done: number } = {
      status: "running",
      error: null,
      note: null,
      done: 0,
    };
    const notes = new Set<string | null>();
    const deadline = Date.now() + 50_000;
    while (Date.now() < deadline && (job.status === "running" || job.status === "waiting")) {
      await new Promise((r) => setTimeout(r, 500));
      const poll = await request("GET", `/api/jobs/${id}`, { cookie }).catch(() => null);
      if (poll?.status === 200) job = JSON.parse(poll.body).job;
      notes.add(job.note);
    }
    // Not "running" forever, and not failed: finished by another process, saying it was restarted.
    expect(job.error).toBeNull();
    expect(job).toMatchObject({ status: "done", done: 50, note: "Restarted from the start after a server stopped." });
    expect([...notes].some((n) => n !== null && /another will restart it/.test(n))).toBe(true);
    // The cluster replaced the killed process: two answer again, and a new job may start.
    const seen = new Set<string>();
    for (let i = 0; i < 40 && seen.size < 2; i++) seen.add((await request("GET", "/api/health")).instance);
    expect(seen.size).toBe(2);
    expect((await request("POST", `/api/scenarios/${scenarioId}/sweeps`, { cookie, body: SWEEP })).status).toBe(202);
  }, 90_000);

  it("saves from three people at once on both processes without a database error", async () => {
    const people = await Promise.all(
      ["jonah@tidewell.example", "ines@tidewell.example", "teacher@tidewell.example"].map((email) =>
        signInOverHttp(server.baseURL, email, PASSWORD),
      ),
    );
    const targets = await Promise.all(
      people.map(async (cookie) => {
        const tanks = JSON.parse((await request("GET", "/api/tanks", { cookie })).body).tanks as { id: number }[];
        return { cookie, tankId: tanks[0].id };
      }),
    );
    const statuses: number[] = [];
    const seen = new Set<string>();
    for (let round = 0; round < 4; round++) {
      const answers = await Promise.all(
        targets.flatMap(({ cookie, tankId }) =>
          [0, 1].map((i) =>
            request("POST", `/api/tanks/${tankId}/scenarios`, {
              cookie,
              body: JSON.stringify({ name: `Two processes ${round}.${i}`, settings: { run: { lengthDays: 30 } } }),
            }),
          ),
        ),
      );
      answers.forEach((a) => (statuses.push(a.status), seen.add(a.instance)));
    }
    expect(seen.size).toBe(2);
    // Read-then-write transactions from two processes: each waits for the lock, none fails with SQLITE_BUSY.
    expect(statuses.filter((s) => s >= 500)).toEqual([]);
    expect(statuses.filter((s) => s === 201).length).toBeGreaterThanOrEqual(20);
  }, 60_000);

  it("counts a burst of wrong sign-ins against one limit across both processes", async () => {
    const body = new URLSearchParams({ email: "teacher@tidewell.example", password: "not-the-password" }).toString();
    const answers = await Promise.all(
      Array.from({ length: 30 }, () => request("POST", "/sign-in", { body, form: true })),
    );
    expect(new Set(answers.map((a) => a.instance)).size).toBe(2);
    // rate-limiter-flexible's SQLite store, one row per key: 5 a minute in all, not 5 per process.
    expect(answers.filter((a) => a.status !== 429).length).toBeLessThanOrEqual(5);
    expect(answers.filter((a) => a.status === 429).length).toBeGreaterThanOrEqual(25);
  });
});
