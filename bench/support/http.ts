/**
 * HTTP benchmark helpers: autocannon against the built server on loopback, with our own
 * per-request latencies so we can quote p95 (autocannon's summary has p90 and p97.5 only).
 */
import autocannon from "autocannon";

export type LoadResult = {
  requests: number;
  durationS: number;
  rps: number;
  p50: number;
  p95: number;
  p99: number;
  max: number;
  errors: number;
  non2xx: number;
  statusCounts: Record<string, number>;
};

function percentile(sorted: number[], p: number): number {
  if (sorted.length === 0) return NaN;
  const i = Math.min(sorted.length - 1, Math.max(0, Math.ceil((p / 100) * sorted.length) - 1));
  return sorted[i];
}

export async function load(options: autocannon.Options & { expectStatus?: number[] }): Promise<LoadResult> {
  const times: number[] = [];
  const statusCounts: Record<string, number> = {};
  const result = await new Promise<autocannon.Result>((resolve, reject) => {
    const instance = autocannon({ ...options }, (error, done) => (error ? reject(error) : resolve(done)));
    instance.on("response", (_client, statusCode, _bytes, responseTime) => {
      times.push(responseTime);
      statusCounts[statusCode] = (statusCounts[statusCode] ?? 0) + 1;
    });
  });
  times.sort((a, b) => a - b);
  const ok = new Set(options.expectStatus ?? [200]);
  const unexpected = Object.entries(statusCounts)
    .filter(([code]) => !ok.has(Number(code)))
    .reduce((n, [, c]) => n + c, 0);
  return {
    requests: times.length,
    durationS: result.duration,
    rps: times.length / result.duration,
    p50: percentile(times, 50),
    p95: percentile(times, 95),
    p99: percentile(times, 99),
    max: times.at(-1) ?? NaN,
    errors: result.errors + result.timeouts,
    non2xx: unexpected,
    statusCounts,
  };
}

export function describe(r: LoadResult): string {
  const codes = Object.entries(r.statusCounts)
    .map(([c, n]) => `${c}×${n}`)
    .join(" ");
  return `${r.requests} requests in ${r.durationS.toFixed(1)} s (${r.rps.toFixed(0)}/s), p50 ${r.p50.toFixed(1)} ms, p95 ${r.p95.toFixed(1)} ms, p99 ${r.p99.toFixed(1)} ms, max ${r.max.toFixed(0)} ms, errors ${r.errors}, unexpected statuses ${r.non2xx} [${codes}]`;
}
