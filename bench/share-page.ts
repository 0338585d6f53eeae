/**
 * The public share page against the built server on loopback (issue #5): a forum thread sends
 * many anonymous visitors to one link. Measures the full HTML answer, the router's .data answer,
 * and the revalidation a returning browser makes (If-None-Match → 304), which must not render
 * the page or touch the engine. Run alone: `npx tsx bench/share-page.ts` (after `npm run build`),
 * or with every bench: `npm run bench`.
 *
 * Targets (the seeded demo link, a 180-day run, 20 connections): HTML p95 ≤ 500 ms on a small
 * shared machine, and a revalidation at least 10 times cheaper than a full answer (a ratio,
 * so it holds whatever else the machine is doing).
 */
import process from "node:process";
import { startBuiltServer } from "../tests/support/built-server";
import { describe, load } from "./support/http";

const TARGETS = { htmlP95: 500, revalidateSpeedup: 10 };
/** The seeded demo link (app/db/seed.server.ts, local only). */
const DEMO_LINK = "/s/tidewell-demo-theo-as-kept-now";

export async function run() {
  const server = await startBuiltServer({ env: { SEED_IF_EMPTY: "1" } });
  const lines = ["share page, anonymous visitors (built server, loopback)"];
  try {
    const url = `${server.baseURL}${DEMO_LINK}`;
    const first = await fetch(url);
    const etag = first.headers.get("etag");
    if (first.status !== 200 || !etag) throw new Error(`the demo link answered ${first.status} without an ETag`);
    const bytes = (await first.arrayBuffer()).byteLength;

    await load({ url, connections: 4, duration: 2 });
    const html = await load({ url, connections: 20, duration: 10 });
    const data = await load({ url: `${url}.data`, connections: 20, duration: 10 });
    const revalidate = await load({
      url,
      headers: { "If-None-Match": etag },
      connections: 20,
      duration: 10,
      expectStatus: [304],
    });
    const clean = (r: typeof html) => !r.errors && !r.non2xx;
    const speedup = revalidate.rps / html.rps;
    lines.push(`  page size ${(bytes / 1024).toFixed(0)} kB HTML (uncompressed)`);
    lines.push(
      `  HTML, 20 connections  ${describe(html)}  target p95 ≤ ${TARGETS.htmlP95} ms ${html.p95 <= TARGETS.htmlP95 && clean(html) ? "ok" : "MISSED"}`,
    );
    lines.push(`  .data, 20 connections  ${describe(data)}`);
    lines.push(`  revalidation (304), 20 connections  ${describe(revalidate)}`);
    lines.push(
      `  revalidation vs full answer: ${speedup.toFixed(1)}× the requests per second  target ≥ ${TARGETS.revalidateSpeedup}× ${speedup >= TARGETS.revalidateSpeedup && clean(revalidate) ? "ok" : "MISSED"}`,
    );
  } finally {
    await server.stop();
  }
  process.stdout.write(lines.join("\n") + "\n");
}

if (process.argv[1] && /bench[\\/]share-page\.ts$/.test(process.argv[1])) await run();
