import { describe, expect, it } from "vitest";
import { signInOverHttp } from "../support/built-server";
import { baseURL, DEMO } from "./support/browser";

// Against the real built server (no browser needed): the headers every answer carries and the
// cross-site check on state-changing requests. OWASP Secure Headers Project and OWASP CSRF
// Prevention Cheat Sheet.
describe("HTTP protections of the built server", () => {
  it("sends the security headers, with a fresh CSP nonce on each page", async () => {
    const first = await fetch(`${baseURL()}/`);
    const second = await fetch(`${baseURL()}/`);
    expect(first.headers.get("x-content-type-options")).toBe("nosniff");
    expect(first.headers.get("referrer-policy")).toBe("strict-origin-when-cross-origin");
    expect(first.headers.get("x-powered-by")).toBeNull();
    const csp = first.headers.get("content-security-policy")!;
    expect(csp).toContain("frame-ancestors 'none'");
    const nonce = /'nonce-([^']+)'/.exec(csp)![1];
    expect(nonce.length).toBeGreaterThanOrEqual(16);
    expect(/'nonce-([^']+)'/.exec(second.headers.get("content-security-policy")!)![1]).not.toBe(nonce);
    // React Router's inline scripts carry the nonce, so the page still runs under the policy.
    const html = await first.text();
    const inline = [...html.matchAll(/<script(?![^>]*\bsrc=)([^>]*)>/g)].map((m) => m[1]);
    expect(inline.length).toBeGreaterThan(0);
    for (const attrs of inline) expect(attrs).toContain(`nonce="${nonce}"`);
  });

  it("refuses a state-changing request from another site, and accepts our own", async () => {
    const cookie = await signInOverHttp(baseURL(), DEMO.jonah, DEMO.password);
    const body = new URLSearchParams({ name: "Made from afar" });
    const forged = await fetch(`${baseURL()}/tanks`, {
      method: "POST",
      redirect: "manual",
      headers: { Cookie: cookie, Origin: "https://evil.example", "Content-Type": "application/x-www-form-urlencoded" },
      body,
    });
    expect(forged.status).toBe(403);
    const fetchMetadata = await fetch(`${baseURL()}/api/preview`, {
      method: "POST",
      headers: { Cookie: cookie, "Sec-Fetch-Site": "cross-site", "Content-Type": "application/json" },
      body: JSON.stringify({ settings: {} }),
    });
    expect(fetchMetadata.status).toBe(403);
    expect((await fetchMetadata.json()).error).toMatch(/another site/);
    const tanks = (await (await fetch(`${baseURL()}/api/tanks`, { headers: { Cookie: cookie } })).json()) as {
      tanks: { name: string }[];
    };
    expect(tanks.tanks.map((t) => t.name)).not.toContain("Made from afar");

    const ownSite = await fetch(`${baseURL()}/tanks`, {
      method: "POST",
      redirect: "manual",
      headers: { Cookie: cookie, Origin: baseURL(), "Content-Type": "application/x-www-form-urlencoded" },
      body: new URLSearchParams({ name: "Made here" }),
    });
    expect(ownSite.status).toBe(302);
  });

  it("sets the session cookie HttpOnly and SameSite=Lax", async () => {
    const res = await fetch(`${baseURL()}/sign-in`, {
      method: "POST",
      redirect: "manual",
      headers: { "Content-Type": "application/x-www-form-urlencoded", Origin: baseURL() },
      body: new URLSearchParams({ email: DEMO.theo, password: DEMO.password }),
    });
    const setCookie = res.headers.get("set-cookie")!;
    expect(setCookie).toMatch(/HttpOnly/i);
    expect(setCookie).toMatch(/SameSite=Lax/i);
  });
});

describe("bodies the server refuses before reading", () => {
  it("answers 413 to a 5 MB body and 400 to invalid UTF-8 or broken JSON, and stays up", async () => {
    const cookie = await signInOverHttp(baseURL(), DEMO.jonah, DEMO.password);
    const big = await fetch(`${baseURL()}/api/preview`, {
      method: "POST",
      headers: { Cookie: cookie, "Content-Type": "application/json" },
      body: JSON.stringify({ settings: { name: "x".repeat(5 * 1024 * 1024) } }),
    });
    expect(big.status).toBe(413);
    const bigForm = await fetch(`${baseURL()}/tanks`, {
      method: "POST",
      headers: { Cookie: cookie, "Content-Type": "application/x-www-form-urlencoded" },
      body: new URLSearchParams({ name: "x".repeat(5 * 1024 * 1024) }),
    });
    expect(bigForm.status).toBe(413);
    const badUtf8 = await fetch(`${baseURL()}/api/preview`, {
      method: "POST",
      headers: { Cookie: cookie, "Content-Type": "application/json" },
      body: new Uint8Array([0x7b, 0x22, 0x61, 0xff, 0xfe, 0x22, 0x3a, 0x31, 0x7d]),
    });
    expect(badUtf8.status).toBe(400);
    expect((await badUtf8.json()).error).toMatch(/UTF-8/);
    const broken = await fetch(`${baseURL()}/api/preview`, {
      method: "POST",
      headers: { Cookie: cookie, "Content-Type": "application/json" },
      body: '{"settings": {"water": ',
    });
    expect(broken.status).toBe(400);
    const badMultipart = await fetch(`${baseURL()}/tanks/1/readings/upload`, {
      method: "POST",
      headers: { Cookie: cookie, "Content-Type": "multipart/form-data; boundary=nope" },
      body: '--wrong\r\nContent-Disposition: form-data; name="file"\r\n\r\nhalf',
    });
    expect(badMultipart.status).toBeLessThan(500);
    expect((await fetch(`${baseURL()}/api/health`)).status).toBe(200);
  });
});
