/**
 * What a results page costs the server when no kept rendering can answer it (issue 15, item
 * 5), beside another version of Fernwater when asked: CPU per page from /proc, one app
 * process each, 10 connections, gzip, the two servers loaded in turns (so both see the same
 * machine), median of the rounds.
 *
 * - first views: each request another URL (?view=N, which the page ignores and the render
 *   cache keys on), for a run already converted for the viewer's units;
 * - a run's first views: each request another scenario (300 copies of the demo's first
 *   scenario and its stored run, written straight into the database), so the run is also read
 *   from the database and converted, as after a restart.
 *
 * Alone: `npx tsx bench/results-first-views.ts` after `npm run build`; `BEFORE=<dir>` also
 * loads another checkout (built, with its node_modules), e.g. a `git worktree` of the commit
 * the issue was filed against. Part of `npm run bench` (this version only).
 */
import process from "node:process";
import Database from "better-sqlite3";
import { signInOverHttp, startBuiltServer, type BuiltServer } from "../tests/support/built-server";
import { cpuMs } from "./support/cpu";
import { load } from "./support/http";

const COPIES = 300;
const ROUNDS = Number(process.env.ROUNDS ?? 7);

type Subject = { label: string; server: BuiltServer; headers: Record<string, string>; scenarioPaths: string[] };

async function startSubject(label: string, cwd?: string): Promise<Subject> {
  const server = await startBuiltServer({ cwd, env: { SEED_IF_EMPTY: "1" } });
  const cookie = await signInOverHttp(server.baseURL, "jonah@tidewell.example", "tidewell-demo-2026");
  const headers = { Cookie: cookie, Origin: server.baseURL, "Accept-Encoding": "gzip" };
  const get = async <T>(p: string) => (await (await fetch(server.baseURL + p, { headers })).json()) as T;
  const tankId = (await get<{ tanks: { id: number }[] }>("/api/tanks")).tanks[0].id;
  const scenarioId = (await get<{ scenarios: { id: number }[] }>(`/api/tanks/${tankId}/scenarios`)).scenarios[0].id;
  const firstPath = `/tanks/${tankId}/scenarios/${scenarioId}`;
  if (!(await fetch(server.baseURL + firstPath, { headers })).ok) throw new Error(`${label}: results page failed`);
  return {
    label,
    server,
    headers,
    scenarioPaths: [firstPath, ...copyScenario(server.databaseFile, scenarioId, tankId)],
  };
}

/** Copies a scenario and its stored run COPIES times (column for column, so any version's schema fits). */
function copyScenario(databaseFile: string, scenarioId: number, tankId: number): string[] {
  const db = new Database(databaseFile);
  db.pragma("busy_timeout = 5000");
  try {
    const scenario = db.prepare("select * from scenarios where id = ?").get(scenarioId) as Record<string, unknown>;
    const run = db.prepare("select * from runs where scenario_id = ? order by id desc limit 1").get(scenarioId) as
      Record<string, unknown> | undefined;
    if (!run) throw new Error("the demo scenario has no stored run");
    const insert = (table: string, row: Record<string, unknown>) => {
      const columns = Object.keys(row).filter((c) => c !== "id");
      const sql = `insert into ${table} (${columns.join(", ")}) values (${columns.map(() => "?").join(", ")})`;
      return Number(db.prepare(sql).run(...columns.map((c) => row[c])).lastInsertRowid);
    };
    return db.transaction(() =>
      Array.from({ length: COPIES }, (_, i) => {
        const id = insert("scenarios", { ...scenario, name: `Copy ${i + 1}` });
        insert("runs", { ...run, scenario_id: id });
        return `/tanks/${tankId}/scenarios/${id}`;
      }),
    )();
  } finally {
    db.close();
  }
}

let view = 0;

/** CPU per page for 3 s of views; `paths` gives the page of the n-th request. */
async function cpuPerPage(subject: Subject, paths: (n: number) => string): Promise<number> {
  const pid = subject.server.child.pid!;
  const before = cpuMs(pid);
  let n = 0;
  const result = await load({
    url: subject.server.baseURL + paths(0),
    headers: subject.headers,
    connections: 10,
    duration: 3,
    requests: [{ setupRequest: (request) => ({ ...request, path: `${paths(n++)}?view=${view++}` }) }],
  });
  if (result.errors || result.non2xx) throw new Error(`${subject.label}: ${JSON.stringify(result.statusCounts)}`);
  return (cpuMs(pid) - before) / result.requests;
}

const median = (values: number[]) => [...values].sort((a, b) => a - b)[Math.floor(values.length / 2)];

export async function run() {
  const subjects: Subject[] = [];
  try {
    subjects.push(await startSubject("this version"));
    if (process.env.BEFORE) subjects.push(await startSubject(`BEFORE (${process.env.BEFORE})`, process.env.BEFORE));
    const kinds = {
      "first views": (s: Subject) => () => s.scenarioPaths[0],
      "a run's first views": (s: Subject) => (n: number) => s.scenarioPaths[1 + (n % COPIES)],
    };
    const lines = ["results page first views (CPU per page, 1 app process, 10 connections, gzip; median of rounds)"];
    for (const [kind, pathsOf] of Object.entries(kinds)) {
      const figures = subjects.map(() => [] as number[]);
      // Round 0 warms both up and is not counted; the order alternates so neither always goes first.
      for (let round = 0; round <= ROUNDS; round++) {
        const order = round % 2 ? [...subjects.keys()].reverse() : [...subjects.keys()];
        for (const i of order) {
          const ms = await cpuPerPage(subjects[i], pathsOf(subjects[i]));
          if (round > 0) figures[i].push(ms);
        }
      }
      subjects.forEach((s, i) =>
        lines.push(
          `  ${kind.padEnd(20)} ${s.label.padEnd(14)} ${median(figures[i]).toFixed(2)} ms  (rounds: ${figures[i].map((x) => x.toFixed(2)).join(" ")})`,
        ),
      );
    }
    process.stdout.write(lines.join("\n") + "\n");
  } finally {
    for (const s of subjects) await s.server.stop();
  }
}

if (process.argv[1] && /bench[\\/]results-first-views\.ts$/.test(process.argv[1])) await run();
