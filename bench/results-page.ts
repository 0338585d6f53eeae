/**
 * Results page and run action against the built server on loopback (issue #4), plus the
 * results page's client JavaScript size from the build. Run alone: `npx tsx bench/results-page.ts`
 * (after `npm run build`), or with every bench: `npm run bench`.
 *
 * Targets: results loader p95 ≤ 50 ms at 20 connections (one-year stored run); run action
 * p95 ≤ 150 ms; results page client JS ≤ 200 kB gzip.
 */
import fs from "node:fs";
import path from "node:path";
import process from "node:process";
import zlib from "node:zlib";
import { signInOverHttp, startBuiltServer } from "../tests/support/built-server";
import { describe, load } from "./support/http";

const TARGETS = { loaderP95: 50, actionP95: 150, clientKb: 200 };

/** The form the setup page posts for a one-year scenario with weekly changes and two plant groups. */
function oneYearForm(name: string): URLSearchParams {
  return new URLSearchParams({
    intent: "save",
    name,
    "water.volumeL": "120",
    "water.temperatureC": "25",
    "water.pH": "7.2",
    "water.khDkh": "5",
    "fish.feedGPerDay": "1",
    "maintenance.waterChangeIntervalDays": "7",
    "maintenance.waterChangeFraction": "25",
    "filter.cleaningIntervalDays": "30",
    "plants.0.id": "stems",
    "plants.0.name": "Stem plants",
    "plants.0.growthForm": "stem",
    "plants.1.id": "float",
    "plants.1.name": "Floating plants",
    "plants.1.growthForm": "floating",
    "run.lengthDays": "365",
    "run.outputIntervalDays": "1",
  });
}

/** gzip size of everything the browser loads for the results route (entry, root, route chunks, CSS). */
export function resultsClientBytes(buildDir: string): { files: number; raw: number; gzip: number } {
  const assets = path.join(buildDir, "client/assets");
  const manifestFile = fs.readdirSync(assets).find((f) => /^manifest-.*\.js$/.test(f));
  if (!manifestFile) throw new Error("no React Router manifest in the build");
  const text = fs.readFileSync(path.join(assets, manifestFile), "utf8");
  const manifest = JSON.parse(text.slice(text.indexOf("{"), text.lastIndexOf("}") + 1)) as {
    entry: { module: string; imports: string[]; css?: string[] };
    routes: Record<string, { module: string; imports?: string[]; css?: string[] }>;
  };
  const wanted = new Set<string>([manifest.entry.module, ...manifest.entry.imports, ...(manifest.entry.css ?? [])]);
  for (const id of ["root", "routes/scenarios/results"]) {
    const r = manifest.routes[id];
    if (!r) throw new Error(`route ${id} missing from the manifest`);
    [r.module, ...(r.imports ?? []), ...(r.css ?? [])].forEach((f) => wanted.add(f));
  }
  let raw = 0;
  let gzip = 0;
  for (const f of wanted) {
    const body = fs.readFileSync(path.join(buildDir, "client", f));
    raw += body.length;
    gzip += zlib.gzipSync(body, { level: 9 }).length;
  }
  return { files: wanted.size, raw, gzip };
}

export async function run() {
  const buildDir = process.env.FERNWATER_BUILD_DIR ?? "build";
  const server = await startBuiltServer({ env: { SEED_IF_EMPTY: "1" } });
  const lines = ["results page and run action (built server, loopback)"];
  try {
    const cookie = await signInOverHttp(server.baseURL, "jonah@tidewell.example", "tidewell-demo-2026");
    const headers = { Cookie: cookie, Origin: server.baseURL };
    const tanks = (await (await fetch(`${server.baseURL}/api/tanks`, { headers })).json()) as {
      tanks: { id: number }[];
    };
    const tankId = tanks.tanks[0].id;

    const saved = await fetch(`${server.baseURL}/tanks/${tankId}/scenarios/new`, {
      method: "POST",
      redirect: "manual",
      headers: { ...headers, "Content-Type": "application/x-www-form-urlencoded" },
      body: oneYearForm("Bench year"),
    });
    const resultsPath = saved.headers.get("location");
    if (saved.status !== 302 || !resultsPath) throw new Error(`saving the bench scenario answered ${saved.status}`);

    // Warm-up, then the loader's data request (what client navigation fetches) and the full document.
    await load({ url: `${server.baseURL}${resultsPath}.data`, headers, connections: 4, duration: 2 });
    const data = await load({ url: `${server.baseURL}${resultsPath}.data`, headers, connections: 20, duration: 10 });
    const doc = await load({ url: `${server.baseURL}${resultsPath}`, headers, connections: 20, duration: 10 });
    lines.push(
      `  results loader (.data), 20 connections  ${describe(data)}  target p95 ≤ ${TARGETS.loaderP95} ms ${data.p95 <= TARGETS.loaderP95 && !data.errors && !data.non2xx ? "ok" : "MISSED"}`,
    );
    lines.push(`  results document (HTML), 20 connections  ${describe(doc)}`);

    // The run action: each request validates, runs one model year and stores scenario + run.
    for (const connections of [1, 5]) {
      let n = 0;
      const action = await load({
        url: `${server.baseURL}/tanks/${tankId}/scenarios/new`,
        method: "POST",
        headers: { ...headers, "Content-Type": "application/x-www-form-urlencoded" },
        connections,
        duration: 8,
        expectStatus: [302],
        setupClient: (client: { setBody: (b: string) => void }) =>
          client.setBody(oneYearForm(`Bench run ${++n}`).toString()),
      });
      lines.push(
        `  run action (save + one model year), ${connections} connection${connections > 1 ? "s" : ""}  ${describe(action)}  target p95 ≤ ${TARGETS.actionP95} ms ${action.p95 <= TARGETS.actionP95 && !action.errors && !action.non2xx ? "ok" : "MISSED"}`,
      );
    }
  } finally {
    await server.stop();
  }
  const size = resultsClientBytes(buildDir);
  lines.push(
    `  results page client JS+CSS  ${size.files} files, ${(size.raw / 1024).toFixed(0)} kB raw, ${(size.gzip / 1024).toFixed(1)} kB gzip  target ≤ ${TARGETS.clientKb} kB ${size.gzip / 1024 <= TARGETS.clientKb ? "ok" : "MISSED"}`,
  );
  process.stdout.write(lines.join("\n") + "\n");
}

if (process.argv[1] && /bench[\\/]results-page\.ts$/.test(process.argv[1])) await run();
