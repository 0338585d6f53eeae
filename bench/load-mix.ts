/**
 * A realistic mix against the built server on loopback (issue #7): 50 connections for 30 s,
 * cycling through 100 keepers who browse their tanks,
 * opening results (page and client-side navigation data), nudging a what-if slider (a preview
 * runs the engine) and now and then saving a scenario (runs the engine and writes).
 * Run alone: `npx tsx bench/load-mix.ts` (after `npm run build`), or with `npm run bench`.
 * Target: zero errors, p95 ≤ 200 ms over the mix.
 */
import bcrypt from "bcryptjs";
import Database from "better-sqlite3";
import process from "node:process";
import { signInOverHttp, startBuiltServer } from "../tests/support/built-server";
import { describe, load } from "./support/http";

// Enough keepers that each saves and previews at a pace a person could (the server limits one
// person to 30 saves and 60 previews a minute): ~15 model requests a second spread over 100.
const KEEPERS = 100;
const CONNECTIONS = 50;
const DURATION_S = Number(process.env.LOAD_SECONDS ?? 30);
const TARGET_P95 = 200;

type Keeper = { cookie: string; tankId: number; scenarioId: number };

const PASSWORD = "steady water change";
let passwordHash: string | undefined;

async function makeKeeper(base: string, databaseFile: string, n: number): Promise<Keeper> {
  const email = `load-keeper-${n}@example.org`;
  // Accounts are written straight into the throwaway database (sign-up mails a confirmation
  // link and allows 40 an hour per address); one bcrypt hash serves them all.
  passwordHash ??= await bcrypt.hash(PASSWORD, 11);
  const db = new Database(databaseFile);
  try {
    db.prepare("insert into users (email, name, password_hash, email_verified_at) values (?, ?, ?, ?)").run(
      email,
      `Load keeper ${n}`,
      passwordHash,
      Date.now(),
    );
  } finally {
    db.close();
  }
  const cookie = await signInOverHttp(base, email, PASSWORD);
  const headers = { Cookie: cookie, Origin: base };
  const tank = await fetch(`${base}/tanks`, {
    method: "POST",
    redirect: "manual",
    headers: { ...headers, "Content-Type": "application/x-www-form-urlencoded" },
    body: new URLSearchParams({ name: `Load tank ${n}` }),
  });
  const tankId = Number(tank.headers.get("location")!.split("/").pop());
  const scenario = await fetch(`${base}/api/tanks/${tankId}/scenarios`, {
    method: "POST",
    headers: { ...headers, "Content-Type": "application/json" },
    body: JSON.stringify({ name: "Baseline", settings: { run: { lengthDays: 180 } } }),
  });
  const scenarioId = ((await scenario.json()) as { scenario: { id: number } }).scenario.id;
  return { cookie, tankId, scenarioId };
}

/** One browsing cycle of a keeper: 20 requests, of which one preview and one save run the engine. */
function cycle(k: Keeper, base: string) {
  const h = { Cookie: k.cookie, Origin: base };
  const results = `/tanks/${k.tankId}/scenarios/${k.scenarioId}`;
  const read = (path: string) => ({ method: "GET" as const, path, headers: h });
  return [
    read("/tanks"),
    read(`/tanks/${k.tankId}`),
    read(`${results}`),
    read(`${results}.data`),
    read(`/tanks/${k.tankId}.data`),
    read(`${results}.data`),
    {
      method: "POST" as const,
      path: "/api/preview?units=display",
      headers: { ...h, "Content-Type": "application/json" },
      body: JSON.stringify({ scenarioId: k.scenarioId, whatIf: { feedGPerDay: 0.5 + Math.random() } }),
    },
    read(`/tanks.data`),
    read(`${results}.data`),
    read(`/tanks/${k.tankId}/compare`),
    read(`/api/tanks/${k.tankId}/scenarios`),
    read(`${results}.data`),
    read("/account"),
    read(`/tanks/${k.tankId}.data`),
    read(`${results}.data`),
    {
      method: "POST" as const,
      path: `/api/tanks/${k.tankId}/scenarios`,
      headers: { ...h, "Content-Type": "application/json" },
      body: JSON.stringify({ name: "Load save", settings: { fish: { feedGPerDay: 0.8 }, run: { lengthDays: 90 } } }),
    },
    read(`/tanks/${k.tankId}`),
    read(`${results}.data`),
    read("/tanks.data"),
    read(`${results}.data`),
  ];
}

export async function run() {
  // The same mix against one app process and against two (WEB_CONCURRENCY, node:cluster), issue 15.
  for (const processes of [1, 2]) await runWith(processes);
}

async function runWith(processes: number) {
  const server = await startBuiltServer({ env: { WEB_CONCURRENCY: String(processes) } });
  const lines = [
    `load mix: ${CONNECTIONS} connections, ${KEEPERS} keepers, ${DURATION_S} s, ${processes} app process${processes > 1 ? "es" : ""} (built server, loopback)`,
  ];
  try {
    const keepers: Keeper[] = [];
    for (let n = 0; n < KEEPERS; n++) keepers.push(await makeKeeper(server.baseURL, server.databaseFile, n));
    let next = 0;
    const result = await load({
      url: server.baseURL,
      connections: CONNECTIONS,
      duration: DURATION_S,
      expectStatus: [200, 201],
      requests: cycle(keepers[0], server.baseURL),
      // Each connection is one keeper's browser tab: its own cookie and its own tank.
      setupClient: (client) => {
        (client as unknown as { setRequests: (r: unknown[]) => void }).setRequests(
          cycle(keepers[next++ % KEEPERS], server.baseURL),
        );
      },
    });
    const ok = result.errors === 0 && result.non2xx === 0 && result.p95 <= TARGET_P95;
    lines.push(`  mix  ${describe(result)}  target p95 ≤ ${TARGET_P95} ms, no errors ${ok ? "ok" : "MISSED"}`);
    const slow = server
      .log()
      .split("\n")
      .filter((l) => l.includes("slow request"));
    if (slow.length)
      lines.push(
        `  requests over 1 s: ${slow.length}, e.g. ${slow
          .slice(0, 3)
          .map((l) => l.replace("[fernwater] slow request: ", ""))
          .join("; ")}`,
      );
  } finally {
    await server.stop();
  }
  process.stdout.write(lines.join("\n") + "\n");
}

if (process.argv[1] && /bench[\\/]load-mix\.ts$/.test(process.argv[1])) await run();
