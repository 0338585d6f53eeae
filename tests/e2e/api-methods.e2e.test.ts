import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { signInOverHttp, startBuiltServer, type BuiltServer } from "../support/built-server";
import { DEMO } from "./support/browser";

// Every /api route answers every method, and a bad body, with the documented JSON
// `{ status, error }` (docs/api.md) and never logs a stack: a wrong method used to reach React
// Router's "did not provide an action" error, logged with its stack, as a JSON 405 without our shape.
const METHODS = ["GET", "HEAD", "POST", "PUT", "PATCH", "DELETE", "OPTIONS"] as const;
const BODIES = [undefined, "{}", "not json at all", '{"settings": {"water": {"volumeL": "NaN"}}, "extra": [1, 2, 3]}'];

let server: BuiltServer;
let cookie: string;
let paths: string[];
beforeAll(async () => {
  server = await startBuiltServer();
  cookie = await signInOverHttp(server.baseURL, DEMO.jonah, DEMO.password);
  const tanks = (await (await fetch(`${server.baseURL}/api/tanks`, { headers: { Cookie: cookie } })).json()) as {
    tanks: { id: number }[];
  };
  const tankId = tanks.tanks[0].id;
  const scenarios = (await (
    await fetch(`${server.baseURL}/api/tanks/${tankId}/scenarios`, { headers: { Cookie: cookie } })
  ).json()) as { scenarios: { id: number }[] };
  const scenarioId = scenarios.scenarios[0].id;
  const run = (await (
    await fetch(`${server.baseURL}/api/scenarios/${scenarioId}/run`, { headers: { Cookie: cookie } })
  ).json()) as { run: { id: number } };
  paths = [
    "/api/health",
    "/api/tanks",
    `/api/tanks/${tankId}/scenarios`,
    `/api/tanks/${tankId}/readings`,
    `/api/scenarios/${scenarioId}`,
    `/api/scenarios/${scenarioId}/run`,
    `/api/scenarios/${scenarioId}/sweeps`,
    `/api/scenarios/${scenarioId}/calibrations`,
    `/api/scenarios/${scenarioId}/targets`,
    `/api/runs/${run.run.id}`,
    "/api/preview",
    "/api/jobs/no-such-job",
    "/api/no/such/route",
  ];
}, 60_000);
afterAll(() => server?.stop());

describe("the API answers wrong methods and bad bodies in its own shape", () => {
  it("every route, every method, with and without a session: JSON { status, error } below 500, and no stack in the log", async () => {
    let requests = 0;
    for (const path of paths) {
      for (const method of METHODS) {
        for (const who of [cookie, undefined]) {
          for (const body of method === "GET" || method === "HEAD" ? [undefined] : BODIES) {
            const headers: Record<string, string> = { Origin: server.baseURL };
            if (who) headers.Cookie = who;
            if (body !== undefined) headers["Content-Type"] = "application/json";
            const res = await fetch(server.baseURL + path, { method, headers, body });
            requests++;
            const where = `${method} ${path} ${who ? "signed in" : "anonymous"} body=${body ?? "none"}`;
            expect(res.status, where).toBeLessThan(500);
            expect(res.headers.get("content-type") ?? "", where).toMatch(/application\/json|text\/csv/);
            if (method === "HEAD") continue;
            const text = await res.text();
            if (res.status >= 400) {
              const json = JSON.parse(text) as { status: number; error: string };
              expect(json.status, where).toBe(res.status);
              expect(typeof json.error, where).toBe("string");
            }
          }
        }
      }
    }
    // Let the last log lines arrive.
    await new Promise((r) => setTimeout(r, 300));
    expect(server.log(), "a stack was logged").not.toMatch(/\n\s+at .+\(.+:\d+:\d+\)/);
    expect(server.log()).not.toMatch(/did not provide an `(action|loader)`/);
    expect(requests).toBeGreaterThan(500);
  }, 120_000);
});
