/**
 * The render cache (issue 15, item 5) may only hand back what a new render would give, and
 * every response must still carry its own CSP nonce (issue 12, item 1).
 */
import { describe, expect, it } from "vitest";
import { cachedPage, keepPage, NONCE_STAND_IN, renderKey, urlSeenBefore } from "~/http/render-cache.server";

const page = (nonce: string) =>
  Buffer.from(
    `<html><script nonce="${nonce}">a()</script><p>Nitrate 12 mg/L — day 30</p><script nonce="${nonce}">b()</script></html>`,
  );

describe("render cache keys", () => {
  it("differ when the URL, the status or any loader data differs", () => {
    const data = { root: { user: { id: 1, units: "NO3" } }, page: { series: "AAEC", name: "Reef" } };
    const key = renderKey("http://x/tanks/1/scenarios/2", 200, data);
    expect(key).not.toBeNull();
    expect(renderKey("http://x/tanks/1/scenarios/2", 200, structuredClone(data))).toBe(key);
    expect(renderKey("http://x/tanks/1/scenarios/2?view=1", 200, data)).not.toBe(key);
    expect(renderKey("http://x/tanks/1/scenarios/2", 404, data)).not.toBe(key);
    expect(
      renderKey("http://x/tanks/1/scenarios/2", 200, { ...data, root: { user: { id: 2, units: "NO3" } } }),
    ).not.toBe(key);
    expect(
      renderKey("http://x/tanks/1/scenarios/2", 200, { ...data, root: { user: { id: 1, units: "NO3-N" } } }),
    ).not.toBe(key);
  });

  it("are refused for data JSON cannot show whole (Map, Set, promises, BigInt)", () => {
    expect(renderKey("http://x/", 200, { a: new Map([[1, 2]]) })).toBeNull();
    expect(renderKey("http://x/", 200, { a: new Set([1]) })).toBeNull();
    expect(renderKey("http://x/", 200, { a: Promise.resolve(1) })).toBeNull();
    expect(renderKey("http://x/", 200, { a: 1n })).toBeNull();
  });
});

describe("kept pages", () => {
  it("are kept only when their URL comes a second time", () => {
    const url = `http://x/once-${Math.random()}`;
    expect(urlSeenBefore(url)).toBe(false);
    expect(urlSeenBefore(url)).toBe(true);
    expect(urlSeenBefore(`${url}?view=2`)).toBe(false);
  });

  it("carry each response's own nonce in every place the render put one", () => {
    const key = renderKey("http://x/kept", 200, { n: Math.random() })!;
    expect(cachedPage(key, "n1")).toBeUndefined();
    const first = keepPage(key, page(NONCE_STAND_IN), "nonceOne").toString();
    expect(first).toBe(page("nonceOne").toString());
    const second = cachedPage(key, "nonceTwo")!.toString();
    expect(second).toBe(page("nonceTwo").toString());
    expect(second).not.toContain(NONCE_STAND_IN);
    expect(second).not.toContain("nonceOne");
  });

  it("keep text outside ASCII byte for byte", () => {
    const key = renderKey("http://x/utf8", 200, { n: Math.random() })!;
    const html = Buffer.from(`<p nonce="${NONCE_STAND_IN}">NO₃ — 25 mg/L · 20 °C</p>`);
    keepPage(key, html, "a");
    expect(cachedPage(key, "zz")!.toString()).toBe(`<p nonce="zz">NO₃ — 25 mg/L · 20 °C</p>`);
  });
});
