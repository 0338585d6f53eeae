/**
 * The bar for "one person's heavy work does not hold up anyone else" (issues 10 and 15): while
 * the work runs, another person's tank list answers within 300 ms 9 times in 10 and never takes
 * a second. The machine is shared with other work, so one slow answer in ten is forgiven; the
 * margin still fails by far when the work blocks the request thread.
 */
import { expect } from "vitest";

export const PAGE_LIMIT_MS = 300;
const NEVER_MS = 1000;

/** Asks for the tank list as the person with `cookie`, and says how long the answer took, in ms. */
export function tankListTimer(baseURL: string, cookie: string): () => Promise<number> {
  return async () => {
    const t0 = performance.now();
    const res = await fetch(`${baseURL}/tanks`, { headers: { Cookie: cookie } });
    await res.text();
    expect(res.status).toBe(200);
    return performance.now() - t0;
  };
}

/** Times `page` again and again, `pauseMs` apart, while `busy()` says the work still runs. */
export async function timeWhile(busy: () => boolean, page: () => Promise<number>, pauseMs: number) {
  const pageMs: number[] = [];
  while (busy()) {
    pageMs.push(await page());
    await new Promise((r) => setTimeout(r, pauseMs));
  }
  return pageMs;
}

/** The work took longer than the page may (so the check has teeth), and the page kept to the bar. */
export function expectNotHeldUp(workMs: number[], pageMs: number[]): void {
  expect(Math.max(...workMs)).toBeGreaterThan(PAGE_LIMIT_MS);
  expect(Math.max(...pageMs)).toBeLessThan(NEVER_MS);
  const within = pageMs.filter((ms) => ms < PAGE_LIMIT_MS).length;
  expect(
    within / pageMs.length,
    `${within} of ${pageMs.length} answers within ${PAGE_LIMIT_MS} ms`,
  ).toBeGreaterThanOrEqual(0.9);
  expect(pageMs.length).toBeGreaterThanOrEqual(3);
}
