/**
 * Where the results page's server-rendered HTML spends its CPU (issue 15): runs the built
 * server under V8's CPU profiler, loads the results document (gzip, as browsers ask) for a few
 * seconds at 20 connections (repeat views of one page, then first views of fresh URLs), and
 * sorts the profile's samples into React's render, loader data
 * serialisation (React Router's turbo-stream), gzip, and the rest. Alone:
 * `npx tsx bench/results-ssr-profile.ts` after `npm run build`; also part of `npm run bench`.
 */
import fs from "node:fs";
import os from "node:os";
import path from "node:path";
import process from "node:process";
import { signInOverHttp, startBuiltServer } from "../tests/support/built-server";
import { cpuMs } from "./support/cpu";
import { describe, load } from "./support/http";

type Node = { id: number; callFrame: { functionName: string; url: string }; children?: number[] };
type Profile = { nodes: Node[]; samples: number[]; timeDeltas: number[] };

function bucketOf(frame: Node["callFrame"]): string {
  const { url, functionName } = frame;
  if (functionName === "(idle)") return "idle";
  if (/react-dom/.test(url)) return "React render";
  if (/turbo-stream|single-fetch/.test(url) || /^(flatten|encode|stringify|serialize)/i.test(functionName))
    return "loader data serialisation";
  if (/zlib|compression/.test(url) || /^(zlib|Zlib|deflate|gzip)/i.test(functionName)) return "gzip";
  if (functionName === "(garbage collector)") return "garbage collection";
  if (functionName === "(program)") return "V8/native (program)";
  if (/react-router/.test(url)) return "React Router (other)";
  if (/build\/server/.test(url)) return "our server code";
  return "other (node, express, http)";
}

/** The functions with the most self time, for a closer look. */
function topFunctions(profile: Profile, n: number): [string, number][] {
  const byId = new Map(profile.nodes.map((node) => [node.id, node]));
  const out = new Map<string, number>();
  profile.samples.forEach((id, i) => {
    const { functionName, url } = byId.get(id)!.callFrame;
    if (functionName === "(idle)") return;
    const key = `${functionName || "(anonymous)"} ${url.split("/").slice(-2).join("/")}`;
    out.set(key, (out.get(key) ?? 0) + (profile.timeDeltas[i] ?? 0) / 1000);
  });
  return [...out].sort((a, b) => b[1] - a[1]).slice(0, n);
}

/** Self time per bucket in ms, from the samples. */
function breakdown(profile: Profile): Map<string, number> {
  const byId = new Map(profile.nodes.map((n) => [n.id, n]));
  const out = new Map<string, number>();
  profile.samples.forEach((id, i) => {
    const bucket = bucketOf(byId.get(id)!.callFrame);
    out.set(bucket, (out.get(bucket) ?? 0) + (profile.timeDeltas[i] ?? 0) / 1000);
  });
  return out;
}

export async function run() {
  const profileDir = fs.mkdtempSync(path.join(os.tmpdir(), "fernwater-prof-"));
  const previous = process.env.SERVER_CPU_PROFILE_DIR;
  process.env.SERVER_CPU_PROFILE_DIR = profileDir;
  const server = await startBuiltServer({ env: { SEED_IF_EMPTY: "1" } });
  if (previous === undefined) delete process.env.SERVER_CPU_PROFILE_DIR;
  else process.env.SERVER_CPU_PROFILE_DIR = previous;
  const lines = ["results page SSR profile (built server, 20 connections, gzip)"];
  try {
    const cookie = await signInOverHttp(server.baseURL, "jonah@tidewell.example", "tidewell-demo-2026");
    const headers = { Cookie: cookie, Origin: server.baseURL };
    const tanks = (await (await fetch(`${server.baseURL}/api/tanks`, { headers })).json()) as {
      tanks: { id: number }[];
    };
    const scenarios = (await (
      await fetch(`${server.baseURL}/api/tanks/${tanks.tanks[0].id}/scenarios`, { headers })
    ).json()) as {
      scenarios: { id: number }[];
    };
    const resultsPath = `/tanks/${tanks.tanks[0].id}/scenarios/${scenarios.scenarios[0].id}`;
    await load({
      url: `${server.baseURL}${resultsPath}`,
      headers: { ...headers, "Accept-Encoding": "gzip" },
      connections: 4,
      duration: 2,
    });
    // Repeat views (the same page for the same data: reloads, a share link's many visitors)
    // may reuse a kept rendering (app/http/render-cache.server.ts); first views are rendered
    // afresh — each request asks for another URL (?view=N), which the page ignores but the
    // cache keys on.
    const pid = server.child.pid!;
    let cpuBefore = cpuMs(pid);
    const repeat = await load({
      url: `${server.baseURL}${resultsPath}`,
      headers: { ...headers, "Accept-Encoding": "gzip" },
      connections: 20,
      duration: 8,
    });
    lines.push(`  repeat views (HTML, gzip)  ${describe(repeat)}`);
    lines.push(`  server CPU per page, repeat views: ${((cpuMs(pid) - cpuBefore) / repeat.requests).toFixed(2)} ms`);
    let view = 0;
    cpuBefore = cpuMs(pid);
    const first = await load({
      url: `${server.baseURL}${resultsPath}`,
      headers: { ...headers, "Accept-Encoding": "gzip" },
      connections: 20,
      duration: 8,
      requests: [{ setupRequest: (request) => ({ ...request, path: `${resultsPath}?view=${view++}` }) }],
    });
    lines.push(`  first views (HTML, gzip)   ${describe(first)}`);
    lines.push(`  server CPU per page, first views: ${((cpuMs(pid) - cpuBefore) / first.requests).toFixed(2)} ms`);
  } finally {
    await server.stop();
  }
  const file = fs.readdirSync(profileDir).find((f) => f.endsWith(".cpuprofile"));
  if (!file) throw new Error("the server wrote no CPU profile");
  const profile = JSON.parse(fs.readFileSync(path.join(profileDir, file), "utf8")) as Profile;
  const buckets = breakdown(profile);
  const busy = [...buckets].filter(([b]) => b !== "idle").reduce((s, [, ms]) => s + ms, 0);
  lines.push(`  where the CPU goes (the whole profile, start-up and sign-in included):`);
  for (const [bucket, ms] of [...buckets].filter(([b]) => b !== "idle").sort((a, b) => b[1] - a[1])) {
    lines.push(`    ${bucket.padEnd(28)} ${((100 * ms) / busy).toFixed(1).padStart(5)} %`);
  }
  if (process.env.BENCH_VERBOSE) {
    for (const [name, ms] of topFunctions(profile, 25))
      lines.push(`      ${((100 * ms) / busy).toFixed(1).padStart(5)} %  ${name}`);
  }
  fs.rmSync(profileDir, { recursive: true, force: true });
  process.stdout.write(lines.join("\n") + "\n");
}

if (process.argv[1] && /bench[\\/]results-ssr-profile\.ts$/.test(process.argv[1])) await run();
